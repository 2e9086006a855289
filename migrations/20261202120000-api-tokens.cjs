'use strict';

/** Personal access tokens for integrations: scoped to one co-op, read-only or read-write, acting
 *  with their creator's current role there. The table keeps the token's SHA-256 (never the token),
 *  a short prefix to recognise it, when it was last used (at most once an hour) and when it was
 *  revoked. Audit events record the token a change was made with.
 *  @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`
        CREATE TABLE api_tokens (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          created_by_user_id INTEGER NOT NULL REFERENCES users(id),
          name VARCHAR(80) NOT NULL,
          access VARCHAR(5) NOT NULL CHECK (access IN ('read', 'write')),
          token_hash CHAR(64) NOT NULL UNIQUE,
          prefix VARCHAR(16) NOT NULL,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          last_used_at TIMESTAMPTZ,
          revoked_at TIMESTAMPTZ
        )`);
      await q(`CREATE INDEX api_tokens_coop_id ON api_tokens (coop_id, created_at)`);
      await q(`ALTER TABLE audit_events ADD COLUMN api_token_id INTEGER REFERENCES api_tokens(id)`);
    });
  },
  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q('ALTER TABLE audit_events DROP COLUMN api_token_id');
      await q('DROP TABLE api_tokens');
    });
  },
};
