import 'server-only';
import type { z } from 'zod';
import type { batchFileSchema } from '@/lib/api/dto/batch';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { notFound, invalidFields } from '@/lib/http';
import { deleteFile, openFile, putFile, type StoredFile, type StoredKind } from '@/lib/storage';
import { inTransaction } from '@/lib/db';
import { BatchFile } from '@/models';
import { loadBatch } from './stored';
import type { CheckedUpload } from '@/lib/storage/upload';

/** Kinds a batch accepts (checked from content): photos as JPEG/PNG, lab reports also as PDF. */
export const BATCH_FILE_KINDS: readonly StoredKind[] = ['pdf', 'jpeg', 'png'];

/**
 * Attaches a photo, lab report or disposal receipt (a batch review's outcome) to a batch. The bytes are stored under a server-made name; the
 * browser's file name is kept for display only. Documents may be added to any batch, including
 * released ones (lab reports often arrive after the fuel is in the tank).
 * @param actor brewer or admin
 * @param batchId batch id (another co-op's → 404)
 * @param upload checked upload; its `purpose` field must be 'photo', 'lab-report' or 'receipt'
 */
export async function addBatchFile(
  actor: Actor,
  batchId: number,
  upload: CheckedUpload,
): Promise<z.infer<typeof batchFileSchema>> {
  const purpose = upload.fields.purpose ?? 'lab-report';
  if (purpose !== 'photo' && purpose !== 'lab-report' && purpose !== 'receipt') {
    throw invalidFields({ purpose: ['Choose photo, lab report or receipt.'] });
  }
  await loadBatch(actor.coop.id, batchId);
  const key = await putFile(actor.coop.id, upload.kind, upload.bytes);
  try {
    return await inTransaction(async (t) => {
      await loadBatch(actor.coop.id, batchId, t, true);
      const file = await BatchFile.create(
        {
          coopId: actor.coop.id,
          batchId,
          purpose,
          fileKind: upload.kind,
          storageKey: key,
          originalName: upload.name,
          sizeBytes: upload.bytes.length,
          uploadedByUserId: actor.user.id,
        },
        { transaction: t },
      );
      const dto: z.infer<typeof batchFileSchema> = {
        id: file.id,
        purpose,
        kind: upload.kind,
        name: upload.name,
        sizeBytes: upload.bytes.length,
        createdAt: file.createdAt.toISOString(),
      };
      await audit(
        {
          coopId: actor.coop.id,
          actorUserId: actor.user.id,
          action: 'batch.file',
          entityType: 'batch',
          entityId: batchId,
          after: dto,
        },
        t,
      );
      return dto;
    });
  } catch (e) {
    await deleteFile(actor.coop.id, key);
    throw e;
  }
}

/** A batch file, opened for streaming; it must belong to that batch of the actor's co-op (404 otherwise). */
export async function getBatchFile(
  actor: Actor,
  batchId: number,
  fileId: number,
): Promise<{ file: StoredFile; kind: StoredKind; name: string }> {
  if (!Number.isSafeInteger(fileId) || fileId <= 0 || !Number.isSafeInteger(batchId) || batchId <= 0)
    throw notFound('File not found.');
  const row = await BatchFile.findOne({
    attributes: ['storageKey', 'fileKind', 'originalName'],
    where: { id: fileId, batchId, coopId: actor.coop.id },
    raw: true,
  });
  if (!row) throw notFound('File not found.');
  return { file: await openFile(actor.coop.id, row.storageKey), kind: row.fileKind, name: row.originalName };
}
