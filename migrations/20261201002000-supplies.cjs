'use strict';

/** Supplies: chemical lots (methanol, KOH, NaOH, other) with what is left of each, and oil lots
 *  collected from restaurants. Methanol is kept in litres, catalysts in grams (quantity_unit
 *  says which); money is integer cents. remaining_quantity = quantity − what batches consumed
 *  (chemical_consumptions, next migration); the CHECKs keep it between 0 and the lot's size.
 *  @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`
        CREATE TABLE chemical_lots (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          kind VARCHAR(10) NOT NULL CHECK (kind IN ('methanol','KOH','NaOH','other')),
          description VARCHAR(120),
          supplier VARCHAR(120) NOT NULL,
          received_on DATE NOT NULL,
          quantity_unit VARCHAR(2) NOT NULL CHECK (quantity_unit IN ('L','g')),
          quantity NUMERIC(14,3) NOT NULL CHECK (quantity > 0),
          remaining_quantity NUMERIC(14,3) NOT NULL CHECK (remaining_quantity >= 0),
          total_cost_cents BIGINT NOT NULL CHECK (total_cost_cents >= 0),
          purity_pct NUMERIC(5,2) CHECK (purity_pct > 0 AND purity_pct <= 100),
          sds_file_key VARCHAR(80),
          sds_file_name VARCHAR(200),
          notes TEXT,
          created_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          CONSTRAINT chemical_lots_remaining_within_quantity CHECK (remaining_quantity <= quantity),
          CONSTRAINT chemical_lots_unit_by_kind CHECK (
            (kind = 'methanol' AND quantity_unit = 'L') OR (kind IN ('KOH','NaOH') AND quantity_unit = 'g') OR kind = 'other'),
          CONSTRAINT chemical_lots_purity_for_catalysts CHECK ((kind IN ('KOH','NaOH')) = (purity_pct IS NOT NULL)),
          CONSTRAINT chemical_lots_other_described CHECK (kind <> 'other' OR description IS NOT NULL),
          UNIQUE (coop_id, id)
        )`);
      await q(`CREATE INDEX chemical_lots_coop_id ON chemical_lots (coop_id)`);
      // FIFO picks the oldest lots of a kind that still hold something.
      await q(
        `CREATE INDEX chemical_lots_fifo ON chemical_lots (coop_id, kind, received_on, id) WHERE remaining_quantity > 0`,
      );
      await q(`CREATE INDEX chemical_lots_received ON chemical_lots (coop_id, received_on DESC, id DESC)`);
      await q(`
        CREATE TABLE oil_lots (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          collected_from VARCHAR(120) NOT NULL,
          collected_on DATE NOT NULL,
          volume_liters NUMERIC(14,3) NOT NULL CHECK (volume_liters > 0),
          cost_cents BIGINT NOT NULL DEFAULT 0 CHECK (cost_cents >= 0),
          water_notes TEXT,
          solids_notes TEXT,
          titration_ml NUMERIC(6,2) CHECK (titration_ml >= 0),
          titrant VARCHAR(4) CHECK (titrant IN ('KOH','NaOH')),
          created_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          CONSTRAINT oil_lots_titrant_with_titration CHECK ((titration_ml IS NULL) = (titrant IS NULL)),
          UNIQUE (coop_id, id)
        )`);
      await q(`CREATE INDEX oil_lots_coop_collected ON oil_lots (coop_id, collected_on DESC, id DESC)`);
    });
  },

  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      for (const t of ['oil_lots', 'chemical_lots']) {
        await queryInterface.sequelize.query(`DROP TABLE ${t}`, { transaction });
      }
    });
  },
};
