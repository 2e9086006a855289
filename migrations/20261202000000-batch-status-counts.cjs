'use strict';

/**
 * How many batches each co-op has in each status, kept by triggers in the same transaction as
 * the batch change, so it is exact at every snapshot. The batch list reads its total from here
 * (a few rows) instead of counting the co-op's batches on every page.
 *  @type {import('sequelize-cli').Migration}
 */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`
        CREATE TABLE batch_status_counts (
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          status VARCHAR(20) NOT NULL,
          n INTEGER NOT NULL CHECK (n >= 0),
          PRIMARY KEY (coop_id, status)
        )`);
      await q(
        `INSERT INTO batch_status_counts (coop_id, status, n) SELECT coop_id, status, count(*) FROM batches GROUP BY coop_id, status`,
      );
      await q(`
        CREATE FUNCTION batch_status_counts_track() RETURNS trigger LANGUAGE plpgsql AS $$
        BEGIN
          IF TG_OP IN ('UPDATE', 'DELETE') THEN
            UPDATE batch_status_counts SET n = n - 1 WHERE coop_id = OLD.coop_id AND status = OLD.status;
          END IF;
          IF TG_OP IN ('INSERT', 'UPDATE') THEN
            INSERT INTO batch_status_counts (coop_id, status, n) VALUES (NEW.coop_id, NEW.status, 1)
            ON CONFLICT (coop_id, status) DO UPDATE SET n = batch_status_counts.n + 1;
          END IF;
          RETURN NULL;
        END $$`);
      await q(
        `CREATE TRIGGER batches_status_count_rows AFTER INSERT OR DELETE ON batches FOR EACH ROW EXECUTE FUNCTION batch_status_counts_track()`,
      );
      await q(`
        CREATE TRIGGER batches_status_count_moves AFTER UPDATE OF status, coop_id ON batches FOR EACH ROW
        WHEN (OLD.status IS DISTINCT FROM NEW.status OR OLD.coop_id IS DISTINCT FROM NEW.coop_id)
        EXECUTE FUNCTION batch_status_counts_track()`);
    });
  },
  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`DROP TRIGGER batches_status_count_moves ON batches`);
      await q(`DROP TRIGGER batches_status_count_rows ON batches`);
      await q(`DROP FUNCTION batch_status_counts_track()`);
      await q(`DROP TABLE batch_status_counts`);
    });
  },
};
