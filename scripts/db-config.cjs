// Connection settings for sequelize-cli (migrations and seeders). The app itself uses lib/db.ts.
// DATABASE_URL is required here; scripts/start.mjs and the test setup set it for the embedded
// PostgreSQL server.
const url = process.env.DATABASE_URL;
if (!url) {
  throw new Error('DATABASE_URL is not set (npm start and npm test set it for the embedded database)');
}
const common = {
  url,
  dialect: 'postgres',
  logging: false,
  migrationStorageTableName: 'sequelize_meta',
  seederStorage: 'sequelize',
  seederStorageTableName: 'sequelize_data',
};
module.exports = { development: common, test: common, production: common };
