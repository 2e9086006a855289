'use strict';

/** The planner's yield history (`plannerHistory` in lib/brewing/queries.ts): a co-op's most recent
 *  batches with fuel out, newest release first. Without an index in that order every request read
 *  and sorted all of the co-op's batches (2,000 in the benchmark co-op: ≈ 1.5–3 ms of PostgreSQL
 *  CPU per planner request); with it, the first ten rows of an index scan. The order is the
 *  query's own (`released_at DESC` puts NULLs first, as the sort did), so answers do not change.
 *  @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      await queryInterface.sequelize.query(
        `CREATE INDEX batches_yield_history ON batches (coop_id, released_at DESC, id DESC)
           WHERE released_liters IS NOT NULL`,
        { transaction },
      );
    });
  },
  async down(queryInterface) {
    await queryInterface.sequelize.query('DROP INDEX batches_yield_history');
  },
};
