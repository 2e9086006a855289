// The models are the schema in code: after the migrations have run (the integration global
// setup migrates the test database), every model attribute must be a column of its table with a
// compatible type (and NOT NULL where the model says allowNull: false), and every column of every
// table must belong to some model. Renaming a column in a migration without the model fails here.
import type { ModelStatic, Model } from 'sequelize';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { sql } from '../support/api';

/** Tables sequelize-cli keeps for itself (migrations and seeders run), not the app's data. */
const CLI_TABLES = new Set(['sequelize_meta', 'sequelize_data', 'SequelizeMeta', 'SequelizeData']);

/**
 * Which PostgreSQL `information_schema.columns.data_type` each Sequelize type may map to. Strings
 * are one family (a TEXT attribute on a varchar column reads and writes the same); numbers are
 * not, on purpose: BIGINT and NUMERIC arrive as strings, INTEGER as a number, so a model that
 * says INTEGER for a bigint column hands the code the wrong type.
 */
const STRINGS = ['character varying', 'character', 'text'];
const COMPATIBLE: Record<string, string[]> = {
  INTEGER: ['integer'],
  SMALLINT: ['smallint'],
  BIGINT: ['bigint'],
  DECIMAL: ['numeric'],
  FLOAT: ['real', 'double precision'],
  REAL: ['real'],
  DOUBLE: ['double precision'],
  STRING: STRINGS,
  CHAR: STRINGS,
  TEXT: STRINGS,
  CITEXT: ['USER-DEFINED'],
  // An ENUM attribute may sit on a PostgreSQL enum type or on a string column with a CHECK.
  ENUM: ['USER-DEFINED', ...STRINGS],
  BOOLEAN: ['boolean'],
  DATE: ['timestamp with time zone'],
  DATEONLY: ['date'],
  TIME: ['time without time zone'],
  UUID: ['uuid'],
  JSON: ['json'],
  JSONB: ['jsonb'],
  BLOB: ['bytea'],
  INET: ['inet'],
  ARRAY: ['ARRAY'],
};
/** PostgreSQL's element type name (udt_name of an array column without its leading `_`) for an ARRAY's element type. */
const ARRAY_ELEMENT: Record<string, string[]> = {
  INTEGER: ['int4'],
  BIGINT: ['int8'],
  STRING: ['varchar', 'text'],
  TEXT: ['text', 'varchar'],
  DECIMAL: ['numeric'],
};

interface Column {
  table_name: string;
  column_name: string;
  data_type: string;
  udt_name: string;
  is_nullable: 'YES' | 'NO';
}
type AttributeType = { key: string; type?: { key: string } };

let models: ModelStatic<Model>[] = [];
let close: () => Promise<void> = async () => {};
let columns: Column[] = [];
const columnsOf = (table: string) =>
  new Map(columns.filter((c) => c.table_name === table).map((c) => [c.column_name, c]));

beforeAll(async () => {
  // lib/db.ts reads DATABASE_URL when it is first imported: point it at the test database first.
  process.env.DATABASE_URL = inject('databaseUrl');
  const { sequelize } = await import('@/models');
  models = Object.values(sequelize.models);
  close = () => sequelize.close();
  columns = await sql<Column>(
    `SELECT c.table_name, c.column_name, c.data_type, c.udt_name, c.is_nullable
       FROM information_schema.columns c
       JOIN information_schema.tables t ON t.table_schema = c.table_schema AND t.table_name = c.table_name AND t.table_type = 'BASE TABLE'
      WHERE c.table_schema = 'public' ORDER BY c.table_name, c.ordinal_position`,
  );
});

afterAll(() => close());

describe('models agree with the migrated database', () => {
  it('loads every model and reads the columns', () => {
    expect(models.length).toBeGreaterThanOrEqual(30);
    expect(columns.length).toBeGreaterThan(100);
  });

  it("each model's table exists", () => {
    const tables = new Set(columns.map((c) => c.table_name));
    const missing = models
      .filter((m) => !tables.has(m.getTableName() as string))
      .map((m) => `${m.name} → ${String(m.getTableName())}`);
    expect(missing).toEqual([]);
  });

  it('every attribute is a column of its table with a compatible type and the nullability the model states', () => {
    const problems: string[] = [];
    for (const m of models) {
      const table = m.getTableName() as string;
      const cols = columnsOf(table);
      const seen = new Map<string, string>();
      for (const [name, attr] of Object.entries(m.getAttributes())) {
        const type = attr.type as unknown as AttributeType;
        if (type.key === 'VIRTUAL') continue;
        const field = attr.field ?? name;
        const where = `${m.name}.${name} (${table}.${field})`;
        // Two attributes on one column: e.g. one definition object shared between attributes (Sequelize writes `field` onto it).
        if (seen.has(field)) problems.push(`${where}: same column as ${m.name}.${seen.get(field)}`);
        seen.set(field, name);
        const col = cols.get(field);
        if (!col) {
          problems.push(`${where}: no such column`);
          continue;
        }
        const allowed = COMPATIBLE[type.key];
        if (!allowed) problems.push(`${where}: Sequelize type ${type.key} has no mapping in this test; add one`);
        else if (!allowed.includes(col.data_type))
          problems.push(`${where}: model says ${type.key}, column is ${col.data_type}`);
        else if (
          type.key === 'ARRAY' &&
          type.type &&
          !(ARRAY_ELEMENT[type.type.key] ?? []).includes(col.udt_name.replace(/^_/, ''))
        ) {
          problems.push(`${where}: model says ARRAY(${type.type.key}), column is ${col.udt_name.replace(/^_/, '')}[]`);
        }
        if (attr.allowNull === false && col.is_nullable === 'YES')
          problems.push(`${where}: model says allowNull: false, column is nullable`);
      }
    }
    expect(problems).toEqual([]);
  });

  it('every column of every table belongs to some model', () => {
    const modelled = new Set(
      models.flatMap((m) =>
        Object.entries(m.getAttributes()).map(([name, a]) => `${String(m.getTableName())}.${a.field ?? name}`),
      ),
    );
    const tables = new Set(columns.map((c) => c.table_name));
    const unmodelled = columns
      .filter((c) => !CLI_TABLES.has(c.table_name) && !modelled.has(`${c.table_name}.${c.column_name}`))
      .map((c) => `${c.table_name}.${c.column_name}`);
    expect(unmodelled).toEqual([]);
    const tablesWithoutModel = [...tables].filter(
      (t) => !CLI_TABLES.has(t) && !models.some((m) => m.getTableName() === t),
    );
    expect(tablesWithoutModel).toEqual([]);
  });
});
