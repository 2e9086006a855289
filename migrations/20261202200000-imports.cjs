'use strict';

/** Moving in from spreadsheets: one `imports` row per confirmed CSV import (who, when, file name,
 *  its SHA-256, row counts, each row's fate), refusing a second import of the same file while the
 *  first stands. Invitations carry the name from the file and the import they came from, and a
 *  `queued` delivery state: they are e-mailed by the job worker, not in the request.
 *  @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`
        CREATE TABLE imports (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          kind VARCHAR(30) NOT NULL CHECK (kind IN ('invitations','opening-balances','opening-tank','opening-supplies')),
          file_name VARCHAR(255) NOT NULL,
          file_hash CHAR(64) NOT NULL,
          status VARCHAR(10) NOT NULL DEFAULT 'done' CHECK (status IN ('done','undone')),
          rows_total INTEGER NOT NULL CHECK (rows_total >= 0),
          rows_imported INTEGER NOT NULL CHECK (rows_imported >= 0),
          rows_skipped INTEGER NOT NULL CHECK (rows_skipped >= 0),
          rows JSONB NOT NULL DEFAULT '[]'::jsonb,
          created_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          undone_at TIMESTAMPTZ,
          undone_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now()
        )`);
      await q(`CREATE INDEX imports_coop_id ON imports (coop_id, created_at DESC)`);
      await q(`CREATE UNIQUE INDEX imports_same_file ON imports (coop_id, kind, file_hash) WHERE status = 'done'`);
      await q(`ALTER TABLE invitations DROP CONSTRAINT invitations_delivery_check`);
      await q(
        `ALTER TABLE invitations ADD CONSTRAINT invitations_delivery_check CHECK (delivery IN ('queued','sent','not-sent'))`,
      );
      await q(
        `ALTER TABLE invitations ADD COLUMN name VARCHAR(120), ADD COLUMN import_id INTEGER REFERENCES imports(id) ON DELETE SET NULL`,
      );
      await q(`CREATE INDEX invitations_import_id ON invitations (import_id) WHERE import_id IS NOT NULL`);
      // Opening tank stock is one ledger row of its own kind (and its undoing, a negative one).
      await q(`ALTER TABLE tank_movements DROP CONSTRAINT tank_movements_kind_check`);
      await q(
        `ALTER TABLE tank_movements ADD CONSTRAINT tank_movements_kind_check CHECK (kind IN ('release','draw','draw-reversal','dip-adjustment','transfer-in','transfer-out','opening'))`,
      );
    });
  },
  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`DELETE FROM tank_movements WHERE kind = 'opening'`);
      await q(`ALTER TABLE tank_movements DROP CONSTRAINT tank_movements_kind_check`);
      await q(
        `ALTER TABLE tank_movements ADD CONSTRAINT tank_movements_kind_check CHECK (kind IN ('release','draw','draw-reversal','dip-adjustment','transfer-in','transfer-out'))`,
      );
      await q(`ALTER TABLE invitations DROP COLUMN import_id, DROP COLUMN name`);
      await q(`UPDATE invitations SET delivery = 'not-sent' WHERE delivery = 'queued'`);
      await q(`ALTER TABLE invitations DROP CONSTRAINT invitations_delivery_check`);
      await q(
        `ALTER TABLE invitations ADD CONSTRAINT invitations_delivery_check CHECK (delivery IN ('sent','not-sent'))`,
      );
      await q('DROP TABLE imports');
    });
  },
};
