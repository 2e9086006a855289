'use strict';
// Demo data: an invented scenario. Every co-op, person and restaurant here is made up.
const bcrypt = require('bcryptjs');

const DEMO_PASSWORD = 'tallyvat-demo-2026';

const COOPS = [
  {
    name: 'Prairie Lantern Fuel Co-op',
    slug: 'prairie-lantern',
    units: 'us',
    currency: 'USD',
    timezone: 'America/Chicago',
    settings: {
      selfServeDraws: false,
      monthlyDuesCents: 1500,
      recipe: { catalyst: 'KOH', baseGramsPerLiter: 4.91, purityPct: 90, methanolPct: 20 },
    },
  },
  {
    name: 'Harbourside Oil Circle',
    slug: 'harbourside',
    units: 'metric',
    currency: 'USD',
    timezone: 'America/Halifax',
    settings: {
      selfServeDraws: true,
      monthlyDuesCents: 1000,
      recipe: { catalyst: 'NaOH', baseGramsPerLiter: 3.5, purityPct: 98, methanolPct: 20 },
    },
  },
];

const PEOPLE = [
  { email: 'marisol.admin@example.org', name: 'Marisol Fenwick', coop: 'prairie-lantern', role: 'admin' },
  { email: 'tobias.treasurer@example.org', name: 'Tobias Wren', coop: 'prairie-lantern', role: 'treasurer' },
  { email: 'juniper.brewer@example.org', name: 'Juniper Okafor', coop: 'prairie-lantern', role: 'brewer' },
  { email: 'dale.member@example.org', name: 'Dale Pemberton', coop: 'prairie-lantern', role: 'member' },
  { email: 'ines.admin@example.org', name: 'Ines Varga', coop: 'harbourside', role: 'admin' },
];

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    const hash = await bcrypt.hash(DEMO_PASSWORD, 10);
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql, replacements) => queryInterface.sequelize.query(sql, { transaction, replacements });
      for (const c of COOPS) {
        await q(
          `INSERT INTO coops (name, slug, units, currency, timezone, settings) VALUES (:name, :slug, :units, :currency, :timezone, :settings)
           ON CONFLICT (slug) DO NOTHING`,
          { ...c, settings: JSON.stringify(c.settings) },
        );
      }
      for (const p of PEOPLE) {
        await q(
          `INSERT INTO users (email, name, password_hash) VALUES (:email, :name, :hash)
           ON CONFLICT ((lower(email))) DO NOTHING`,
          { ...p, hash },
        );
        await q(
          `INSERT INTO memberships (coop_id, user_id, role)
           SELECT c.id, u.id, :role FROM coops c, users u WHERE c.slug = :coop AND lower(u.email) = lower(:email)
           ON CONFLICT (coop_id, user_id) DO NOTHING`,
          p,
        );
      }
    });
  },

  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      await queryInterface.sequelize.query(`DELETE FROM users WHERE lower(email) IN (:emails)`, {
        transaction,
        replacements: { emails: PEOPLE.map((p) => p.email) },
      });
      await queryInterface.sequelize.query(`DELETE FROM coops WHERE slug IN (:slugs)`, {
        transaction,
        replacements: { slugs: COOPS.map((c) => c.slug) },
      });
    });
  },
};
