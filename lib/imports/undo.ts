import 'server-only';
import type { Transaction } from 'sequelize';
import type { z } from 'zod';
import type { importUndoneSchema } from '@/lib/api/dto/imports';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { conflict, notFound } from '@/lib/http';
import type { ImportKindName } from '@/lib/validation/imports';
import { Import } from '@/models';

/** Removes what an import wrote (its rows' entity ids), or refuses (409) once something builds on it. */
export type UndoRows = (actor: Actor, entityIds: number[], t: Transaction) => Promise<void>;

/**
 * Undoes an import as a whole, in one transaction: the import row is locked, the kind's own undo
 * removes everything it wrote (or refuses with 409 when a month was billed or a draw made on it),
 * and the import is marked undone (the same file may then be imported again). Audited.
 */
export async function undoImport(
  actor: Actor,
  kind: ImportKindName,
  id: number,
  undoRows: UndoRows | undefined,
): Promise<z.infer<typeof importUndoneSchema>> {
  return inTransaction(async (t) => {
    const row = await Import.findOne({
      attributes: ['id', 'status', 'rows', 'fileName'],
      where: { id, coopId: actor.coop.id, kind },
      lock: t.LOCK.UPDATE,
      transaction: t,
    });
    if (!row) throw notFound('That import is not in this co-op.');
    if (row.status === 'undone') throw conflict('This import was already undone.');
    if (!undoRows)
      throw conflict(
        'Invitations cannot be undone as a whole: the e-mails are out. Revoke the ones you do not want from the Members page.',
      );
    const ids = row.rows.flatMap((r) => (r.entityId === null ? [] : [r.entityId]));
    await undoRows(actor, ids, t);
    await row.update({ status: 'undone', undoneAt: new Date(), undoneByUserId: actor.user.id }, { transaction: t });
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action: 'import.undo',
        entityType: 'import',
        entityId: id,
        before: { status: 'done', kind, fileName: row.fileName, records: ids.length },
        after: { status: 'undone' },
      },
      t,
    );
    return { undone: true as const, id };
  });
}
