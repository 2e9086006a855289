import 'server-only';
import type { Transaction } from 'sequelize';
import type { z } from 'zod';
import type { earlierImportSchema, importDetailSchema, importRowSchema, importSchema } from '@/lib/api/dto/imports';
import type { Actor } from '@/lib/auth';
import { csvRows } from '@/lib/csv';
import { conflict, notFound } from '@/lib/http';
import type { ImportKindName } from '@/lib/validation/imports';
import { Import, Invitation } from '@/models';

/** A confirmed import as the history and the status screen show it: the API's Import. */
export type ImportDto = z.infer<typeof importSchema>;

/** The earlier import of the same file (same kind, same SHA-256) that still stands. */
export type EarlierImport = z.infer<typeof earlierImportSchema>;

const ATTRIBUTES = [
  'id',
  'kind',
  'fileName',
  'status',
  'rowsTotal',
  'rowsImported',
  'rowsSkipped',
  'createdAt',
  'undoneAt',
] as const;

const toDto = (r: Import & { createdBy?: { name: string } | null }): ImportDto => ({
  id: r.id,
  kind: r.kind,
  fileName: r.fileName,
  status: r.status,
  rowsTotal: r.rowsTotal,
  rowsImported: r.rowsImported,
  rowsSkipped: r.rowsSkipped,
  createdAt: r.createdAt.toISOString(),
  createdBy: r.createdBy?.name ?? null,
  undoneAt: r.undoneAt?.toISOString() ?? null,
});

/** The standing import of this very file, if any. */
export async function earlierImportOf(
  actor: Actor,
  kind: ImportKindName,
  fileHash: string,
  transaction?: Transaction,
): Promise<EarlierImport | null> {
  const row = await Import.findOne({
    attributes: ['id', 'createdAt'],
    where: { coopId: actor.coop.id, kind, fileHash, status: 'done' },
    include: [{ association: 'createdBy', attributes: ['name'] }],
    transaction,
  });
  return row
    ? {
        id: row.id,
        createdAt: row.createdAt.toISOString(),
        createdBy: (row as Import & { createdBy?: { name: string } }).createdBy?.name ?? null,
      }
    : null;
}

/** 409 when this file was imported before and that import stands (the unique index backs this up under a race). */
export async function assertNotImportedYet(
  actor: Actor,
  kind: ImportKindName,
  fileHash: string,
  transaction: Transaction,
): Promise<void> {
  const earlier = await earlierImportOf(actor, kind, fileHash, transaction);
  if (earlier) {
    throw conflict(
      `This file was already imported${earlier.createdBy ? ` by ${earlier.createdBy}` : ''}. Nothing was imported a second time.`,
      { importId: earlier.id },
    );
  }
}

/** The co-op's imports, newest first. */
export async function listImports(actor: Actor): Promise<ImportDto[]> {
  const rows = await Import.findAll({
    attributes: [...ATTRIBUTES],
    where: { coopId: actor.coop.id },
    include: [{ association: 'createdBy', attributes: ['name'] }],
    order: [
      ['createdAt', 'DESC'],
      ['id', 'DESC'],
    ],
    limit: 200,
  });
  return rows.map(toDto);
}

/** One row of an import with, for invitations, where its e-mail stands now. */
export type ImportRowDto = z.infer<typeof importRowSchema>;

/** An import with every row and, for invitations, the e-mails' progress: the API's ImportDetail. */
export type ImportDetail = z.infer<typeof importDetailSchema>;

/** An import with every row (id AND co-op AND kind in one query; anything else is a 404). */
export async function getImport(actor: Actor, kind: ImportKindName, id: number): Promise<ImportDetail> {
  const row = await Import.findOne({
    attributes: [...ATTRIBUTES, 'rows'],
    where: { id, coopId: actor.coop.id, kind },
    include: [{ association: 'createdBy', attributes: ['name'] }],
  });
  if (!row) throw notFound('That import is not in this co-op.');
  let byId = new Map<number, { delivery: string; status: string }>();
  let progress: ImportDetail['progress'] = null;
  if (kind === 'invitations') {
    const invitations = await Invitation.findAll({
      attributes: ['id', 'delivery', 'status'],
      where: { coopId: actor.coop.id, importId: id },
      raw: true,
    });
    byId = new Map(invitations.map((i) => [i.id, { delivery: i.delivery, status: i.status }]));
    progress = { queued: 0, sent: 0, notSent: 0 };
    for (const i of invitations) progress[i.delivery === 'not-sent' ? 'notSent' : (i.delivery as 'queued' | 'sent')]++;
  }
  return {
    import: toDto(row),
    rows: row.rows.map((r) => {
      const inv = r.entityId ? byId.get(r.entityId) : undefined;
      return { ...r, delivery: inv?.delivery ?? null, invitationStatus: inv?.status ?? null };
    }),
    progress,
  };
}

const DELIVERY_WORDS: Record<string, string> = {
  queued: 'Waiting to be sent',
  sent: 'Sent',
  'not-sent': 'Not sent (resend from Members)',
};

/** The import's result as CSV (the one CSV writer): every row of the file with its fate and, for invitations, its e-mail. */
export async function importResultCsv(
  actor: Actor,
  kind: ImportKindName,
  id: number,
  o: { fateLabel: (fate: string) => string; columns: readonly { key: string; heading: string }[] },
): Promise<{ fileName: string; body: string }> {
  const detail = await getImport(actor, kind, id);
  // The file's own column order (the stored rows are JSONB, which keeps no key order).
  const keys = o.columns.map((c) => c.key);
  const header = [
    'Row',
    ...o.columns.map((c) => c.heading),
    'Result',
    'Note',
    ...(kind === 'invitations' ? ['E-mail delivery', 'Invitation'] : []),
  ];
  const lines = detail.rows.map((r) => [
    r.line,
    ...keys.map((k) => r.values[k] ?? ''),
    o.fateLabel(r.fate),
    r.values.message ?? '',
    ...(kind === 'invitations'
      ? [r.delivery ? (DELIVERY_WORDS[r.delivery] ?? r.delivery) : '', r.invitationStatus ?? '']
      : []),
  ]);
  const base =
    detail.import.fileName
      .replace(/\.[A-Za-z0-9]{1,5}$/, '')
      .replace(/[^A-Za-z0-9._-]+/g, '-')
      .slice(0, 80) || 'import';
  return { fileName: `${base}-result.csv`, body: csvRows([header, ...lines]) };
}
