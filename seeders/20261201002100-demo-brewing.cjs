'use strict';
// Demo brewing data for Prairie Lantern (invented suppliers, restaurants and laboratory): chemical and oil
// lots, four released batches (with their chemical consumption, costs, tank movements and quality records), one
// batch under way and one planned. Idempotent: does nothing when the co-op already has batches.
//
// Seeders run under sequelize-cli as CommonJS and cannot import the TypeScript modules, so the
// few figures are worked out here with the same rules as lib/chemistry (catalyst = base ÷ purity
// + titration, per litre), lib/costing (FIFO, a lot's slices priced from its cumulative
// consumption, rounded half up) and lib/units (US gallon = 3.785411784 L).

const LITERS_PER_GALLON = 3.785411784; // NIST SP 811 (exact)
const SLUG = 'prairie-lantern';

const CHEMICALS = [
  {
    kind: 'methanol',
    supplier: 'Meridian Chemical Supply',
    received: '2026-07-10',
    unit: 'L',
    qty: 208.198,
    cost: 34900,
    notes: '55 gal drum',
  },
  {
    kind: 'KOH',
    supplier: 'Three Rivers Lab Supply',
    received: '2026-07-15',
    unit: 'g',
    qty: 22680,
    cost: 11800,
    purity: 90,
    notes: '50 lb bag of flake',
  },
  {
    kind: 'methanol',
    supplier: 'Meridian Chemical Supply',
    received: '2026-10-02',
    unit: 'L',
    qty: 208.198,
    cost: 37200,
    notes: '55 gal drum',
  },
  {
    kind: 'KOH',
    supplier: 'Three Rivers Lab Supply',
    received: '2026-10-05',
    unit: 'g',
    qty: 11340,
    cost: 6450,
    purity: 90,
    notes: '25 lb bag of flake',
  },
  {
    kind: 'other',
    description: 'Isopropyl alcohol (titration)',
    supplier: 'Corner Hardware Co',
    received: '2026-07-12',
    unit: 'L',
    qty: 4,
    cost: 1800,
  },
];

const OIL = [
  {
    from: 'Blue Heron Noodle House',
    on: '2026-08-03',
    liters: 160,
    cost: 0,
    titration: 3.2,
    water: 'A little water settled out',
    solids: 'Fine crumbs, filtered',
  },
  {
    from: 'Cedar Street Fry Shack',
    on: '2026-08-20',
    liters: 190,
    cost: 1500,
    titration: 4.5,
    water: 'Dry',
    solids: 'Heavy batter bits',
  },
  {
    from: 'Marigold Tandoor Kitchen',
    on: '2026-09-12',
    liters: 170,
    cost: 0,
    titration: 2.8,
    water: 'Dry',
    solids: 'Light',
  },
  {
    from: 'Old Depot Diner',
    on: '2026-10-08',
    liters: 180,
    cost: 0,
    titration: 5.6,
    water: 'Some emulsion at the bottom',
    solids: 'Light',
  },
  {
    from: 'Lucky Lantern Dumplings',
    on: '2026-10-25',
    liters: 200,
    cost: 0,
    titration: 3.9,
    water: 'Dry',
    solids: 'Light',
  },
  {
    from: 'Harvest Moon Taqueria',
    on: '2026-11-10',
    liters: 160,
    cost: 0,
    titration: null,
    water: 'Not checked yet',
    solids: 'Light',
  },
];

// Quality records, a realistic mix (ASTM D6751, the co-op's standard; grade No. 2-B, S15): batches 1 and 3 with a full
// laboratory report from an invented laboratory ("Meets ASTM D6751"), batch 2 screened with home tests only, and batch 4
// with a laboratory result outside a limit, released with the written reason the release dialog asks for. Soap tests
// (0.01 N HCl on a 50 g sample, as potassium oleate) stay under the 41 ppm Na + K equivalent (lib/quality/screening.ts).
const LAB = 'Tamarack Ridge Fuel Laboratory'; // invented
/** Every required property of ASTM D6751 No. 2-B S15, from a laboratory, with the method each row names (lib/quality/limits.ts). */
const fullLab = (date, v) => {
  const rows = {
    acidNumber: ['ASTM D664', v.acid],
    freeGlycerin: ['ASTM D6584', v.free],
    totalGlycerin: ['ASTM D6584', v.total],
    waterAndSediment: ['ASTM D2709', 0.01],
    flashPoint: ['ASTM D93', v.flash],
    methanol: ['EN 14110', 0.05],
    kinematicViscosity40C: ['ASTM D445', v.visc],
    sulfur: ['ASTM D5453', v.sulfur],
    cloudPoint: ['ASTM D2500', v.cloud],
    oxidationStability: ['EN 15751', v.oxidation],
    sulfatedAsh: ['ASTM D874', 0.005],
    copperStripCorrosion: ['ASTM D130', 1],
    cetaneNumber: ['ASTM D613', v.cetane],
    carbonResidue: ['ASTM D4530', 0.02],
    sodiumPotassium: ['EN 14538', v.naK],
    calciumMagnesium: ['EN 14538', 0.8],
    phosphorus: ['ASTM D4951', 0.0002],
    distillationT90: ['ASTM D1160', 348],
    coldSoakFiltration: ['ASTM D7501', v.coldSoak],
  };
  return Object.fromEntries(
    Object.entries(rows).map(([k, [method, value]]) => [k, { value, method, laboratory: LAB, date }]),
  );
};
const home = (value, method, date) => ({ value, method, laboratory: 'home test', date });

// Recipe of the co-op (seeded in 20261201000100): KOH, base 4.91 g/L pure, 90 % flake, methanol 20 %.
const BATCHES = [
  {
    oil: 0,
    liters: 150,
    trials: [3.1, 3.2, 3.3],
    date: '2026-08-09',
    released: '2026-08-14',
    out: 142.5,
    kw: 1.5,
    hours: 3,
    tariff: 13.9,
    other: 400,
    temps: [53.9, 55.0, 55.6],
    settle: 14,
    glycerin: 27,
    cycles: 3,
    water: 160,
    drying: 'bubble',
    quick: {
      test327: { result: 'clear' },
      soap: { hclMl: 0.4, sampleGrams: 50 },
      washTest: 'clean-split',
      water: 'clear',
    },
    lab: fullLab('2026-08-13', {
      acid: 0.28,
      free: 0.008,
      total: 0.16,
      flash: 152,
      visc: 4.4,
      sulfur: 6,
      cloud: 3,
      oxidation: 5.2,
      cetane: 53,
      naK: 1.9,
      coldSoak: 140,
    }),
    verdict: 'pass',
  },
  {
    oil: 1,
    liters: 180,
    trials: [4.4, 4.6, 4.5],
    date: '2026-08-27',
    released: '2026-09-02',
    out: 170,
    kw: 1.5,
    hours: 3.5,
    tariff: 13.9,
    other: 650,
    temps: [54.4, 56.1, 60.6, 55.0],
    settle: 20,
    glycerin: 33,
    cycles: 4,
    water: 210,
    drying: 'heat',
    quick: {
      test327: { result: 'clear' },
      soap: { hclMl: 0.5, sampleGrams: 50 },
      washTest: 'clean-split',
      water: 'clear',
    },
    lab: { acidNumber: home(0.35, 'titration, 0.01 N KOH to phenolphthalein', '2026-09-01') },
    verdict: 'incomplete',
    reason: 'Home tests all good; a laboratory sample goes with the next batch',
  },
  {
    oil: 2,
    liters: 160,
    trials: [2.7, 2.9, 2.8],
    date: '2026-09-18',
    released: '2026-09-23',
    out: 152,
    kw: 1.5,
    hours: 3,
    tariff: 14.2,
    other: 300,
    temps: [55.0, 55.6, 56.1],
    settle: 16,
    glycerin: 28,
    cycles: 3,
    water: 150,
    drying: 'bubble',
    quick: {
      test327: { result: 'clear' },
      soap: { hclMl: 0.3, sampleGrams: 50 },
      washTest: 'clean-split',
      water: 'clear',
    },
    lab: fullLab('2026-09-22', {
      acid: 0.31,
      free: 0.011,
      total: 0.19,
      flash: 141,
      visc: 4.6,
      sulfur: 8,
      cloud: 4,
      oxidation: 4.1,
      cetane: 51,
      naK: 2.6,
      coldSoak: 185,
    }),
    verdict: 'pass',
  },
  {
    oil: 3,
    liters: 170,
    trials: [5.5, 5.7, 5.6],
    date: '2026-10-14',
    released: '2026-10-20',
    out: 159,
    kw: 1.5,
    hours: 4,
    tariff: 14.2,
    other: 500,
    temps: [52.8, 54.4, 55.0],
    settle: 22,
    glycerin: 32,
    cycles: 5,
    water: 240,
    drying: 'heat',
    quick: {
      test327: { result: 'clear' },
      soap: { hclMl: 0.6, sampleGrams: 50 },
      washTest: 'clean-split',
      water: 'clear',
    },
    // Oxidation stability 2.4 h is below ASTM D6751's 3 h minimum: "Fails: Oxidation stability (110 °C)".
    lab: fullLab('2026-10-19', {
      acid: 0.41,
      free: 0.015,
      total: 0.21,
      flash: 138,
      visc: 4.8,
      sulfur: 9,
      cloud: 5,
      oxidation: 2.4,
      cetane: 50,
      naK: 3.4,
      coldSoak: 210,
    }),
    verdict: 'fail',
    reason:
      'Antioxidant added on the laboratory’s advice; the tank is to be drawn down first, within the month, and a retest is booked',
  },
];
const IN_PROGRESS = {
  oil: 4,
  liters: 170,
  trials: [3.8, 4.0, 3.9],
  date: '2026-11-20',
  status: 'washing',
  temps: [54.4, 55.6],
  settle: 18,
  glycerin: 30,
  cycles: 2,
  water: 110,
};
const PLANNED = { oil: 5, liters: 150, trials: [4.1, 4.0, 4.2], date: '2026-12-06' };

const BASE_G_PER_L = 4.91;
const PURITY = 90;
const METHANOL_PCT = 20;

const avg = (xs) => xs.reduce((a, b) => a + b, 0) / xs.length;
/** Same rule as lib/chemistry catalystGrams, titrant made from the same catalyst: base ÷ purity + titration. */
const catalystGrams = (liters, trials) => (BASE_G_PER_L / (PURITY / 100) + avg(trials)) * liters;
const methanolLiters = (liters) => (liters * METHANOL_PCT) / 100;
/** Same levels as lib/chemistry temperatureCheck (°C). */
const tempLevel = (c) =>
  c >= 64.7 ? 'danger' : c > (140 - 32) / 1.8 ? 'warning' : c < (120 - 32) / 1.8 ? 'cold' : 'ok';
const roundHalfUp = (x) => Math.floor(x + 0.5); // amounts here are positive
const r3 = (x) => Math.round(x * 1000) / 1000;

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = async (sql, replacements = {}) =>
        (await queryInterface.sequelize.query(sql, { transaction, replacements }))[0];
      const [coop] = await q(`SELECT id FROM coops WHERE slug = :slug`, { slug: SLUG });
      if (!coop) return;
      const coopId = coop.id;
      const [{ n }] = await q(`SELECT count(*)::int AS n FROM batches WHERE coop_id = :coopId`, { coopId });
      if (n > 0) return;
      const [brewer] = await q(`SELECT id FROM users WHERE lower(email) = 'juniper.brewer@example.org'`);
      const userId = brewer ? brewer.id : null;

      // The tank: the first existing one (preferring "North tank"), else a new "North tank".
      let [tank] = await q(
        `SELECT id, on_hand_liters, value_cents FROM tanks WHERE coop_id = :coopId AND active ORDER BY (name = 'North tank') DESC, id LIMIT 1`,
        { coopId },
      );
      if (!tank) {
        [tank] = await q(
          `INSERT INTO tanks (coop_id, name, capacity_liters) VALUES (:coopId, 'North tank', 1500) RETURNING id, on_hand_liters, value_cents`,
          { coopId },
        );
      }
      let onHand = Number(tank.on_hand_liters);
      let value = Number(tank.value_cents);

      const chem = [];
      for (const c of CHEMICALS) {
        const [row] = await q(
          `INSERT INTO chemical_lots (coop_id, kind, description, supplier, received_on, quantity_unit, quantity, remaining_quantity, total_cost_cents, purity_pct, notes, created_by_user_id)
           VALUES (:coopId, :kind, :description, :supplier, :received, :unit, :qty, :qty, :cost, :purity, :notes, :userId) RETURNING id`,
          {
            coopId,
            kind: c.kind,
            description: c.description ?? null,
            supplier: c.supplier,
            received: c.received,
            unit: c.unit,
            qty: c.qty.toFixed(3),
            cost: c.cost,
            purity: c.purity ?? null,
            notes: c.notes ?? null,
            userId,
          },
        );
        chem.push({ ...c, id: row.id, remaining: c.qty });
      }
      const oil = [];
      for (const o of OIL) {
        const [row] = await q(
          `INSERT INTO oil_lots (coop_id, collected_from, collected_on, volume_liters, cost_cents, water_notes, solids_notes, titration_ml, titrant, created_by_user_id)
           VALUES (:coopId, :from, :on, :liters, :cost, :water, :solids, :titration, :titrant, :userId) RETURNING id`,
          {
            coopId,
            from: o.from,
            on: o.on,
            liters: o.liters.toFixed(3),
            cost: o.cost,
            water: o.water,
            solids: o.solids,
            titration: o.titration,
            titrant: o.titration === null ? null : 'KOH',
            userId,
          },
        );
        oil.push({ ...o, id: row.id });
      }

      /** FIFO over the seeded lots of a kind (oldest first); returns the slices with their cost. */
      const consume = (kind, need) => {
        const slices = [];
        let left = r3(need);
        for (const lot of chem.filter((c) => c.kind === kind).sort((a, b) => a.received.localeCompare(b.received))) {
          if (left <= 0) break;
          if (lot.remaining <= 0) continue;
          const take = r3(Math.min(lot.remaining, left));
          const before = r3(lot.qty - lot.remaining);
          const after = r3(before + take);
          const valueAt = (x) => (x >= lot.qty ? lot.cost : roundHalfUp((lot.cost * x) / lot.qty));
          slices.push({ lotId: lot.id, qty: take, cost: valueAt(after) - valueAt(before) });
          lot.remaining = r3(lot.remaining - take);
          left = r3(left - take);
        }
        return slices;
      };

      let number = 0;
      const insertBatch = async (b, extra) => {
        number += 1;
        const titration = avg(b.trials);
        const [row] = await q(
          `INSERT INTO batches (coop_id, number, status, batch_date, status_changed_at, oil_liters, titration_trials_ml, titration_source, titrant, titration_avg_ml,
             catalyst, base_g_per_l, purity_pct, titrant_from, catalyst_rule, methanol_mode, methanol_pct, computed_catalyst_grams, computed_methanol_liters,
             created_by_user_id, created_at)
           VALUES (:coopId, :number, 'planned', :date, :date, :liters, :trials, 'trials', 'KOH', :titration, 'KOH', :base, :purity, 'same-catalyst',
             'base-over-purity-plus-titration', 'percent', :pct, :grams, :methanol, :userId, :date)
           RETURNING id`,
          {
            coopId,
            number,
            date: b.date,
            liters: b.liters.toFixed(3),
            trials: JSON.stringify(b.trials),
            titration: titration.toFixed(4),
            base: BASE_G_PER_L.toFixed(3),
            purity: PURITY.toFixed(2),
            pct: METHANOL_PCT.toFixed(2),
            grams: catalystGrams(b.liters, b.trials).toFixed(3),
            methanol: methanolLiters(b.liters).toFixed(3),
            userId,
          },
        );
        await q(
          `INSERT INTO batch_oil_lots (coop_id, batch_id, oil_lot_id, liters) VALUES (:coopId, :batchId, :lotId, :liters)`,
          {
            coopId,
            batchId: row.id,
            lotId: oil[b.oil].id,
            liters: b.liters.toFixed(3),
          },
        );
        for (const [i, c] of (b.temps ?? []).entries()) {
          await q(
            `INSERT INTO batch_temperatures (coop_id, batch_id, measured_at, temp_c, level, created_by_user_id)
                   VALUES (:coopId, :batchId, (:date::date + time '10:00' + make_interval(mins => :mins)), :c, :level, :userId)`,
            { coopId, batchId: row.id, date: b.date, mins: 20 * i, c: c.toFixed(2), level: tempLevel(c), userId },
          );
        }
        if (extra) await extra(row.id);
        return row.id;
      };

      for (const b of BATCHES) {
        await insertBatch(b, async (batchId) => {
          const grams = r3(catalystGrams(b.liters, b.trials));
          const methanol = r3(methanolLiters(b.liters));
          const slices = [
            ...consume('methanol', methanol).map((s) => ({ ...s, kind: 'methanol' })),
            ...consume('KOH', grams).map((s) => ({ ...s, kind: 'KOH' })),
          ];
          for (const s of slices) {
            await q(
              `INSERT INTO chemical_consumptions (coop_id, batch_id, chemical_lot_id, quantity, cost_cents, created_at) VALUES (:coopId, :batchId, :lotId, :qty, :cost, :at)`,
              { coopId, batchId, lotId: s.lotId, qty: s.qty.toFixed(3), cost: s.cost, at: b.released },
            );
          }
          const methanolCents = slices.filter((s) => s.kind === 'methanol').reduce((a, s) => a + s.cost, 0);
          const catalystCents = slices.filter((s) => s.kind === 'KOH').reduce((a, s) => a + s.cost, 0);
          const energyCents = roundHalfUp(b.kw * b.hours * b.tariff);
          const lot = oil[b.oil];
          const feedstockCents = roundHalfUp((lot.cost * b.liters) / lot.liters);
          const total = methanolCents + catalystCents + energyCents + feedstockCents + b.other;
          const perGallon = roundHalfUp(total / (b.out / LITERS_PER_GALLON));
          const lab = b.lab ?? {};
          // The release reason, kept on the batch record as the release dialog keeps it (lib/brewing/release.ts).
          const verdictText =
            b.verdict === 'fail'
              ? 'Fails: Oxidation stability (110 °C)'
              : 'Screened — 0 of 19 required properties tested, none failing';
          const notes = b.reason ? `Released with quality “${verdictText}”: ${b.reason}` : null;
          const allQuick = ['test327', 'soap', 'washTest', 'water'].every((k) => b.quick[k] !== undefined);
          onHand = r3(onHand + b.out);
          value += total;
          await q(
            `UPDATE batches SET status = 'released', status_changed_at = :released, released_at = :released, tank_id = :tankId, released_liters = :out,
               actual_catalyst_grams = :grams, actual_methanol_liters = :methanol, mixing_minutes = 60, settling_hours = :settle, glycerin_liters = :glycerin,
               wash_cycles = :cycles, wash_water_liters = :water, drying_method = :drying, quick_tests = :quick, lab_results = :lab, notes = :notes,
               quality_verdict = :qv, screening_verdict = :sv, heater_kw = :kw, heater_hours = :hours, tariff_cents_per_kwh = :tariff,
               other_cents = :other, other_notes = 'Filter bags and wash water', cost_methanol_cents = :mc, cost_catalyst_cents = :cc,
               cost_energy_cents = :ec, cost_feedstock_cents = :fc, cost_other_cents = :other, total_cost_cents = :total, cost_per_gallon_cents = :pg
             WHERE id = :batchId AND coop_id = :coopId`,
            {
              batchId,
              coopId,
              released: b.released,
              tankId: tank.id,
              out: b.out.toFixed(3),
              grams: grams.toFixed(3),
              methanol: methanol.toFixed(3),
              settle: b.settle,
              glycerin: b.glycerin.toFixed(3),
              cycles: b.cycles,
              water: b.water.toFixed(3),
              drying: b.drying,
              quick: JSON.stringify(b.quick),
              lab: JSON.stringify(lab),
              notes,
              qv: b.verdict,
              sv: allQuick ? 'looks-good' : 'incomplete',
              kw: b.kw.toFixed(3),
              hours: b.hours.toFixed(2),
              tariff: b.tariff.toFixed(4),
              other: b.other,
              mc: methanolCents,
              cc: catalystCents,
              ec: energyCents,
              fc: feedstockCents,
              total,
              pg: perGallon,
            },
          );
          const [moved] = await q(
            `INSERT INTO tank_movements (coop_id, tank_id, kind, quantity_liters, value_cents, on_hand_after_liters, value_after_cents, batch_id, created_by_user_id, occurred_at)
             VALUES (:coopId, :tankId, 'release', :out, :total, :onHand, :value, :batchId, :userId, :released) RETURNING id`,
            {
              coopId,
              tankId: tank.id,
              out: b.out.toFixed(3),
              total,
              onHand: onHand.toFixed(3),
              value,
              batchId,
              userId,
              released: b.released,
            },
          );
          // Lineage: the release is a new layer of its batch (checked against on hand at commit).
          await q(
            `INSERT INTO tank_layers (coop_id, tank_id, batch_id, quantity_liters) VALUES (:coopId, :tankId, :batchId, :out)`,
            { coopId, tankId: tank.id, batchId, out: b.out.toFixed(3) },
          );
          await q(
            `INSERT INTO movement_batch_shares (coop_id, movement_id, tank_id, batch_id, quantity_liters) VALUES (:coopId, :m, :tankId, :batchId, :out)`,
            {
              coopId,
              m: moved.id,
              tankId: tank.id,
              batchId,
              out: b.out.toFixed(3),
            },
          );
        });
      }
      for (const lot of chem) {
        await q(`UPDATE chemical_lots SET remaining_quantity = :remaining WHERE id = :id AND coop_id = :coopId`, {
          remaining: lot.remaining.toFixed(3),
          id: lot.id,
          coopId,
        });
      }
      await q(
        `UPDATE tanks SET on_hand_liters = :onHand, value_cents = :value, updated_at = now() WHERE id = :tankId AND coop_id = :coopId`,
        {
          onHand: onHand.toFixed(3),
          value,
          tankId: tank.id,
          coopId,
        },
      );

      const ip = IN_PROGRESS;
      await insertBatch(ip, async (batchId) => {
        await q(
          `UPDATE batches SET status = :status, status_changed_at = :date::date + 2, actual_catalyst_grams = :grams, actual_methanol_liters = :methanol,
             mixing_minutes = 60, settling_hours = :settle, glycerin_liters = :glycerin, wash_cycles = :cycles, wash_water_liters = :water
           WHERE id = :batchId AND coop_id = :coopId`,
          {
            status: ip.status,
            date: ip.date,
            grams: Math.round(catalystGrams(ip.liters, ip.trials)).toFixed(3),
            methanol: methanolLiters(ip.liters).toFixed(3),
            settle: ip.settle,
            glycerin: ip.glycerin.toFixed(3),
            cycles: ip.cycles,
            water: ip.water.toFixed(3),
            batchId,
            coopId,
          },
        );
      });
      await insertBatch(PLANNED, async (batchId) => {
        await q(
          `UPDATE batches SET notes = 'Waiting for the new oil to settle' WHERE id = :batchId AND coop_id = :coopId`,
          { batchId, coopId },
        );
      });
    });
  },

  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = async (sql, replacements = {}) =>
        (await queryInterface.sequelize.query(sql, { transaction, replacements }))[0];
      const [coop] = await q(`SELECT id FROM coops WHERE slug = :slug`, { slug: SLUG });
      if (!coop) return;
      const coopId = coop.id;
      await q(`DELETE FROM movement_batch_shares WHERE coop_id = :coopId`, { coopId });
      await q(`DELETE FROM tank_layers WHERE coop_id = :coopId`, { coopId });
      await q(`DELETE FROM tank_movements WHERE coop_id = :coopId AND batch_id IS NOT NULL`, { coopId });
      await q(
        `UPDATE tanks t SET on_hand_liters = COALESCE(m.q, 0), value_cents = COALESCE(m.v, 0)
               FROM (SELECT t2.id, sum(tm.quantity_liters) AS q, sum(tm.value_cents) AS v FROM tanks t2 LEFT JOIN tank_movements tm ON tm.tank_id = t2.id
                     WHERE t2.coop_id = :coopId GROUP BY t2.id) m WHERE t.id = m.id`,
        { coopId },
      );
      // What is left has no recorded lineage any more: one unattributed layer per tank.
      await q(
        `INSERT INTO tank_layers (coop_id, tank_id, batch_id, quantity_liters) SELECT coop_id, id, NULL, on_hand_liters FROM tanks WHERE coop_id = :coopId AND on_hand_liters > 0`,
        { coopId },
      );
      for (const table of [
        'chemical_consumptions',
        'batch_temperatures',
        'batch_oil_lots',
        'batch_files',
        'batches',
        'chemical_lots',
        'oil_lots',
      ]) {
        await q(`DELETE FROM ${table} WHERE coop_id = :coopId`, { coopId });
      }
      await q(
        `DELETE FROM tanks t WHERE t.coop_id = :coopId AND t.name = 'North tank'
                 AND NOT EXISTS (SELECT 1 FROM tank_movements m WHERE m.tank_id = t.id)
                 AND NOT EXISTS (SELECT 1 FROM reservations r WHERE r.tank_id = t.id)
                 AND NOT EXISTS (SELECT 1 FROM draws d WHERE d.tank_id = t.id)`,
        { coopId },
      );
    });
  },
};
