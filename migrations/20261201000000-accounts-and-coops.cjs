'use strict';

/** Co-ops (tenants), users, memberships with roles, invitations, one-time tokens, sign-in
 *  attempts and the audit log. Every co-op-owned table carries coop_id NOT NULL + FK + index.
 *  @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`
        CREATE TABLE coops (
          id SERIAL PRIMARY KEY,
          name VARCHAR(120) NOT NULL,
          slug VARCHAR(60) NOT NULL UNIQUE CHECK (slug ~ '^[a-z0-9][a-z0-9-]{1,58}[a-z0-9]$'),
          units VARCHAR(10) NOT NULL DEFAULT 'us' CHECK (units IN ('us','metric')),
          currency CHAR(3) NOT NULL DEFAULT 'USD',
          timezone VARCHAR(60) NOT NULL DEFAULT 'America/Chicago',
          settings JSONB NOT NULL DEFAULT '{}'::jsonb,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now()
        )`);
      await q(`
        CREATE TABLE users (
          id SERIAL PRIMARY KEY,
          email VARCHAR(254) NOT NULL,
          name VARCHAR(120) NOT NULL,
          password_hash VARCHAR(100),
          session_version INTEGER NOT NULL DEFAULT 0,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now()
        )`);
      await q(`CREATE UNIQUE INDEX users_email_lower_key ON users (lower(email))`);
      await q(`
        CREATE TABLE memberships (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          user_id INTEGER NOT NULL REFERENCES users(id) ON DELETE CASCADE,
          role VARCHAR(20) NOT NULL CHECK (role IN ('admin','treasurer','brewer','member')),
          status VARCHAR(20) NOT NULL DEFAULT 'active' CHECK (status IN ('active','suspended')),
          joined_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          UNIQUE (coop_id, user_id)
        )`);
      await q(`CREATE INDEX memberships_user_id ON memberships (user_id)`);
      await q(`
        CREATE TABLE invitations (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          email VARCHAR(254) NOT NULL,
          role VARCHAR(20) NOT NULL CHECK (role IN ('admin','treasurer','brewer','member')),
          token_hash CHAR(64) NOT NULL UNIQUE,
          status VARCHAR(20) NOT NULL DEFAULT 'pending' CHECK (status IN ('pending','accepted','revoked')),
          delivery VARCHAR(20) NOT NULL DEFAULT 'not-sent' CHECK (delivery IN ('sent','not-sent')),
          invited_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          expires_at TIMESTAMPTZ NOT NULL,
          accepted_at TIMESTAMPTZ,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now()
        )`);
      await q(`CREATE INDEX invitations_coop_id ON invitations (coop_id)`);
      await q(
        `CREATE UNIQUE INDEX invitations_one_pending_per_email ON invitations (coop_id, lower(email)) WHERE status = 'pending'`,
      );
      await q(`
        CREATE TABLE auth_tokens (
          id SERIAL PRIMARY KEY,
          user_id INTEGER NOT NULL REFERENCES users(id) ON DELETE CASCADE,
          kind VARCHAR(20) NOT NULL CHECK (kind IN ('password-reset','email-change')),
          token_hash CHAR(64) NOT NULL UNIQUE,
          new_email VARCHAR(254),
          expires_at TIMESTAMPTZ NOT NULL,
          used_at TIMESTAMPTZ,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now()
        )`);
      await q(`CREATE INDEX auth_tokens_user_id ON auth_tokens (user_id)`);
      await q(`
        CREATE TABLE sign_in_attempts (
          id BIGSERIAL PRIMARY KEY,
          email VARCHAR(254) NOT NULL,
          address VARCHAR(64) NOT NULL,
          succeeded BOOLEAN NOT NULL,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now()
        )`);
      await q(`CREATE INDEX sign_in_attempts_email ON sign_in_attempts (lower(email), created_at)`);
      await q(`CREATE INDEX sign_in_attempts_address ON sign_in_attempts (address, created_at)`);
      await q(`
        CREATE TABLE audit_events (
          id BIGSERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          actor_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          action VARCHAR(60) NOT NULL,
          entity_type VARCHAR(40) NOT NULL,
          entity_id VARCHAR(40),
          before JSONB,
          after JSONB,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now()
        )`);
      await q(`CREATE INDEX audit_events_coop_created ON audit_events (coop_id, created_at DESC)`);
    });
  },

  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      for (const t of [
        'audit_events',
        'sign_in_attempts',
        'auth_tokens',
        'invitations',
        'memberships',
        'users',
        'coops',
      ]) {
        await queryInterface.sequelize.query(`DROP TABLE ${t}`, { transaction });
      }
    });
  },
};
