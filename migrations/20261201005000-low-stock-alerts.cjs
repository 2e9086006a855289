'use strict';

/** Low-stock alert state per co-op and chemical: 'low' once the brewers have been told that the
 *  available stock won't cover the next planned batch, back to 'ok' when it does again. The
 *  guarded flip to 'low' (…WHERE state <> 'low' RETURNING) makes concurrent requests send once.
 *  @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`
        CREATE TABLE low_stock_alerts (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          chemical VARCHAR(10) NOT NULL CHECK (chemical IN ('methanol','KOH','NaOH')),
          state VARCHAR(3) NOT NULL DEFAULT 'ok' CHECK (state IN ('low','ok')),
          changed_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          last_sent_at TIMESTAMPTZ,
          UNIQUE (coop_id, chemical)
        )`);
      await q(`CREATE INDEX low_stock_alerts_coop_id ON low_stock_alerts (coop_id)`);
    });
  },
  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      await queryInterface.sequelize.query('DROP TABLE low_stock_alerts', { transaction });
    });
  },
};
