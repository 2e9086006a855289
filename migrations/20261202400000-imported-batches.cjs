'use strict';

/** Past batches imported in summary (moving in from spreadsheets): a batch in status `imported`
 *  carries only what the co-op's records kept — date, oil in, fuel out, costs, the quality verdict
 *  and notes as recorded then. It has no recipe, no steps, no tank and no ledger rows (its fuel is
 *  long gone, or counted by the opening tank stock), so the recipe columns may be NULL for it and
 *  only for it; `released_at` is the batch's date (so reports by period count it) and `tank_id`
 *  stays NULL (the released-complete rule keeps it from passing as a release).
 *  `imports.kind` gains 'past-batches'.
 *  @type {import('sequelize-cli').Migration} */
const RECIPE = [
  'titration_trials_ml',
  'titrant',
  'titration_avg_ml',
  'catalyst',
  'base_g_per_l',
  'purity_pct',
  'titrant_from',
  'catalyst_rule',
  'methanol_mode',
  'computed_catalyst_grams',
  'computed_methanol_liters',
];
const STATUSES = "'planned','reacting','settling','draining','washing','drying','testing','released','rejected'";
const METHANOL_MODE =
  "(methanol_mode = 'percent' AND methanol_pct IS NOT NULL) OR (methanol_mode = 'molar-ratio' AND molar_ratio IS NOT NULL)";
const KINDS = "'invitations','opening-balances','opening-tank','opening-supplies'";

module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`ALTER TABLE batches DROP CONSTRAINT batches_status_check`);
      await q(`ALTER TABLE batches ADD CONSTRAINT batches_status_check CHECK (status IN (${STATUSES},'imported'))`);
      for (const c of RECIPE) await q(`ALTER TABLE batches ALTER COLUMN ${c} DROP NOT NULL`);
      await q(`ALTER TABLE batches DROP CONSTRAINT batches_methanol_mode`);
      await q(
        `ALTER TABLE batches ADD CONSTRAINT batches_methanol_mode CHECK (status = 'imported' OR ${METHANOL_MODE})`,
      );
      await q(
        `ALTER TABLE batches ADD CONSTRAINT batches_recipe_unless_imported CHECK (status = 'imported' OR (${RECIPE.map((c) => `${c} IS NOT NULL`).join(' AND ')}))`,
      );
      await q(
        `ALTER TABLE batches ADD CONSTRAINT batches_imported_summary CHECK (status <> 'imported' OR (tank_id IS NULL AND released_liters IS NOT NULL AND released_at IS NOT NULL))`,
      );
      await q(`ALTER TABLE imports DROP CONSTRAINT imports_kind_check`);
      await q(`ALTER TABLE imports ADD CONSTRAINT imports_kind_check CHECK (kind IN (${KINDS},'past-batches'))`);
    });
  },
  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`DELETE FROM batches WHERE status = 'imported'`);
      await q(`DELETE FROM imports WHERE kind = 'past-batches'`);
      await q(`ALTER TABLE imports DROP CONSTRAINT imports_kind_check`);
      await q(`ALTER TABLE imports ADD CONSTRAINT imports_kind_check CHECK (kind IN (${KINDS}))`);
      await q(`ALTER TABLE batches DROP CONSTRAINT batches_imported_summary`);
      await q(`ALTER TABLE batches DROP CONSTRAINT batches_recipe_unless_imported`);
      for (const c of RECIPE) await q(`ALTER TABLE batches ALTER COLUMN ${c} SET NOT NULL`);
      await q(`ALTER TABLE batches DROP CONSTRAINT batches_methanol_mode`);
      await q(`ALTER TABLE batches ADD CONSTRAINT batches_methanol_mode CHECK (${METHANOL_MODE})`);
      await q(`ALTER TABLE batches DROP CONSTRAINT batches_status_check`);
      await q(`ALTER TABLE batches ADD CONSTRAINT batches_status_check CHECK (status IN (${STATUSES}))`);
    });
  },
};
