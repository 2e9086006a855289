'use strict';

/** The e-mail send ledger: one row per message the worker hands to SMTP (an invoice's n-th send,
 *  one plain e-mail job). The row is written "sending" (the in-flight claim, with the job that
 *  holds it) and committed before the message goes out, then "sent" right after the server's
 *  250. A row still "sending" after its job died is an ambiguous send: it is sent again with the
 *  same Message-ID, which the row keeps.
 *  @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`
        CREATE TABLE mail_sends (
          subject VARCHAR(80) NOT NULL,
          generation INTEGER NOT NULL CHECK (generation > 0),
          coop_id INTEGER REFERENCES coops(id) ON DELETE CASCADE,
          message_id VARCHAR(200) NOT NULL UNIQUE,
          state VARCHAR(10) NOT NULL CHECK (state IN ('sending', 'sent')),
          claimed_by VARCHAR(64) NOT NULL,
          tries INTEGER NOT NULL DEFAULT 1,
          claimed_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          sent_at TIMESTAMPTZ,
          PRIMARY KEY (subject, generation)
        )`);
      await q(`CREATE INDEX mail_sends_coop_id ON mail_sends (coop_id) WHERE coop_id IS NOT NULL`);
      await q(`CREATE INDEX mail_sends_in_flight ON mail_sends (claimed_at) WHERE state = 'sending'`);
    });
  },
  async down(queryInterface) {
    await queryInterface.sequelize.query('DROP TABLE mail_sends');
  },
};
