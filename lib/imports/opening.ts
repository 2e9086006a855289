import 'server-only';
import type { Transaction } from 'sequelize';
import type { z } from 'zod';
import type { openingImportPreviewSchema, openingImportResultSchema, openingRowSchema } from '@/lib/api/dto/imports';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { HttpError } from '@/lib/http';
import type { ImportFileInput, ImportKindName } from '@/lib/validation/imports';
import { Import } from '@/models';
import type { ImportRowRecord } from '@/models/Import';
import { csvFileHash, readCsv, type CsvColumn, type CsvRow } from './csv-read';
import { assertNotImportedYet, earlierImportOf } from './history';

// Opening records (balances, tank stock, supplies, past batches) share one shape: every row is
// checked field by field; the preview lists each row with its errors; the import is all or
// nothing — one transaction, refused whole (422, naming rows and fields) while any row is wrong.

/** One row as checked: its values as read, its problems (none = ready), and what it will become. */
export type OpeningRow = z.infer<typeof openingRowSchema>;

export type FieldProblem = OpeningRow['errors'][number];

/** Every row checked, nothing written: the API's OpeningImportPreview. */
export type OpeningPreview = z.infer<typeof openingImportPreviewSchema>;

/** A row that passed its checks, with what the importer needs to write it. */
export interface Checked<P> extends OpeningRow {
  plan: P | null;
}

/** One kind of opening record: its columns, its checks (against the co-op as it is), and its writes. */
export interface OpeningKind<K extends string, P> {
  kind: ImportKindName;
  columns: readonly CsvColumn<K>[];
  /** Checks every row (reads only; inside the confirm's transaction when given). */
  check(actor: Actor, rows: CsvRow<K>[], t?: Transaction): Promise<Checked<P>[]>;
  /** Writes the rows (all valid) inside the transaction; returns the id each row became. */
  apply(actor: Actor, rows: Checked<P>[], t: Transaction, importId: number): Promise<(number | null)[]>;
}

function parse<K extends string>(spec: OpeningKind<K, unknown>, input: ImportFileInput) {
  const read = readCsv(input.csv, spec.columns);
  if (!read.ok) throw new HttpError(422, read.error, { csv: [read.error] });
  return read;
}

const strip = <P>({ plan: _plan, ...row }: Checked<P>): OpeningRow => row;

/** The preview: every row checked, nothing written. */
export async function previewOpening<K extends string, P>(
  actor: Actor,
  spec: OpeningKind<K, P>,
  input: ImportFileInput,
): Promise<OpeningPreview> {
  const read = parse(spec, input);
  const fileHash = csvFileHash(input.csv);
  const checked = await spec.check(actor, read.rows);
  const errors = checked.filter((r) => r.errors.length > 0).length;
  return {
    fileName: input.fileName,
    fileHash,
    rows: checked.map(strip),
    counts: { ready: checked.length - errors, errors },
    ignoredHeadings: read.ignoredHeadings,
    earlierImport: await earlierImportOf(actor, spec.kind, fileHash),
  };
}

/**
 * The import: one transaction checks every row again against the co-op as it is now and, only if
 * every row is right, writes them all and records the import (audited). Any wrong row → 422 with
 * the rows and their fields, and nothing written; the same file a second time → 409.
 */
export async function confirmOpening<K extends string, P>(
  actor: Actor,
  spec: OpeningKind<K, P>,
  input: ImportFileInput,
): Promise<z.infer<typeof openingImportResultSchema>> {
  const read = parse(spec, input);
  const fileHash = csvFileHash(input.csv);
  return inTransaction(async (t) => {
    await assertNotImportedYet(actor, spec.kind, fileHash, t);
    const checked = await spec.check(actor, read.rows, t);
    const bad = checked.filter((r) => r.errors.length > 0);
    if (bad.length > 0) {
      const fields: Record<string, string[]> = {};
      for (const r of bad) for (const e of r.errors) (fields[`row ${r.line}: ${e.field}`] ??= []).push(e.message);
      throw new HttpError(
        422,
        `${bad.length} row${bad.length === 1 ? ' needs' : 's need'} attention; nothing was imported.`,
        fields,
        { rows: bad.map(strip) },
      );
    }
    const record = await Import.create(
      {
        coopId: actor.coop.id,
        kind: spec.kind,
        fileName: input.fileName,
        fileHash,
        rowsTotal: checked.length,
        rowsImported: checked.length,
        rowsSkipped: 0,
        createdByUserId: actor.user.id,
        undoneByUserId: null,
      },
      { transaction: t },
    );
    const ids = await spec.apply(actor, checked, t, record.id);
    const rows: ImportRowRecord[] = checked.map((r, i) => ({
      line: r.line,
      fate: 'imported',
      values: { ...r.values, message: r.note },
      entityId: ids[i] ?? null,
    }));
    await record.update({ rows }, { transaction: t });
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action: 'import.create',
        entityType: 'import',
        entityId: record.id,
        before: null,
        after: {
          kind: spec.kind,
          fileName: input.fileName,
          fileHash,
          rowsTotal: checked.length,
          rowsImported: checked.length,
          rowsSkipped: 0,
        },
      },
      t,
    );
    return { importId: record.id, imported: checked.length };
  });
}

/** Collects a row's problems and values while its fields are read. */
export function rowChecker(line: number, values: Record<string, string>) {
  const errors: FieldProblem[] = [];
  return {
    errors,
    /** Reads a field with a value reader; records the problem and returns null when it fails. */
    take<T>(field: string, r: { ok: true; value: T } | { ok: false; error: string }): T | null {
      if (r.ok) return r.value;
      errors.push({ field, message: r.error });
      return null;
    },
    fail(field: string, message: string) {
      errors.push({ field, message });
    },
    done<P>(note: string, plan: P | null): Checked<P> {
      return { line, values, errors, note: errors.length ? '' : note, plan: errors.length ? null : plan };
    },
  };
}
