'use strict';

/** Server-side sessions: the session cookie carries a random session id, the table keeps its
 *  SHA-256 (never the id itself), so signing out revokes a copied cookie too. Sign-in attempts
 *  from a device that signed in before carry that device's id: they are throttled per device,
 *  not per account (an attack from elsewhere cannot lock the owner out).
 *  @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`
        CREATE TABLE sessions (
          id BIGSERIAL PRIMARY KEY,
          token_hash CHAR(64) NOT NULL UNIQUE,
          user_id INTEGER NOT NULL REFERENCES users(id) ON DELETE CASCADE,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          last_seen_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          expires_at TIMESTAMPTZ NOT NULL,
          revoked_at TIMESTAMPTZ,
          user_agent VARCHAR(120) NOT NULL DEFAULT ''
        )`);
      await q(`CREATE INDEX sessions_user_id ON sessions (user_id) WHERE revoked_at IS NULL`);
      await q(`ALTER TABLE sign_in_attempts ADD COLUMN device_id VARCHAR(32)`);
      await q(
        `CREATE INDEX sign_in_attempts_device ON sign_in_attempts (device_id, created_at) WHERE device_id IS NOT NULL`,
      );
    });
  },
  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q('DROP INDEX sign_in_attempts_device');
      await q('ALTER TABLE sign_in_attempts DROP COLUMN device_id');
      await q('DROP TABLE sessions');
    });
  },
};
