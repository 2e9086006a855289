'use strict';

/** Indexes for the overview's and reports' time-series aggregates.
 *  @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      await queryInterface.sequelize.query(
        `CREATE INDEX tank_movements_tank_time ON tank_movements (tank_id, occurred_at DESC, id DESC)`,
        { transaction },
      );
      await queryInterface.sequelize.query(
        `CREATE INDEX tank_movements_coop_kind_time ON tank_movements (coop_id, kind, occurred_at) INCLUDE (quantity_liters)`,
        { transaction },
      );
      // Covering index: monthly and quarterly sums of draws read the index only.
      await queryInterface.sequelize.query(
        `CREATE INDEX draws_coop_time_cover ON draws (coop_id, occurred_at) INCLUDE (quantity_liters, declared_use, tax_cents, reverses_draw_id)`,
        { transaction },
      );
    });
  },
  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      await queryInterface.sequelize.query(`DROP INDEX draws_coop_time_cover`, { transaction });
      await queryInterface.sequelize.query(`DROP INDEX tank_movements_coop_kind_time`, { transaction });
      await queryInterface.sequelize.query(`DROP INDEX tank_movements_tank_time`, { transaction });
    });
  },
};
