'use strict';

/** Indexes for the overview's and reports' time-series aggregates.
 *  @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      await queryInterface.sequelize.query(
        `CREATE INDEX tank_movements_tank_time ON tank_movements (tank_id, occurred_at DESC, id DESC)`, { transaction });
      await queryInterface.sequelize.query(
        `CREATE INDEX tank_movements_coop_kind_time ON tank_movements (coop_id, kind, occurred_at)`, { transaction });
    });
  },
  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      await queryInterface.sequelize.query(`DROP INDEX tank_movements_coop_kind_time`, { transaction });
      await queryInterface.sequelize.query(`DROP INDEX tank_movements_tank_time`, { transaction });
    });
  },
};
