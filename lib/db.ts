import 'server-only';
import pg from 'pg';
import { Sequelize } from 'sequelize';

// PostgreSQL BIGINT (int8) and NUMERIC arrive as strings; we parse them on purpose where used.

declare global {
  // eslint-disable-next-line no-var
  var __tallyvatSequelize: Sequelize | undefined;
}

function create(): Sequelize {
  // Without DATABASE_URL (e.g. while `next build` collects routes) the instance points nowhere
  // and every query fails; /api/health then reports the database as down.
  const url = process.env.DATABASE_URL ?? 'postgres://unset@127.0.0.1:1/unset';
  return new Sequelize(url, {
    dialect: 'postgres',
    dialectModule: pg,
    logging: false,
    pool: { max: Number(process.env.DB_POOL_MAX ?? 10), min: 0, idle: 10_000, acquire: 30_000 },
    define: { underscored: true },
  });
}

/** The one Sequelize instance of this process (cached on globalThis so dev reloads reuse it). */
export const sequelize: Sequelize = globalThis.__tallyvatSequelize ?? (globalThis.__tallyvatSequelize = create());
