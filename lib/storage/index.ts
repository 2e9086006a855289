import 'server-only';
import crypto from 'node:crypto';
import { DeleteObjectCommand, GetObjectCommand, HeadBucketCommand, PutObjectCommand } from '@aws-sdk/client-s3';
import { HttpError, notFound } from '@/lib/http';
import { log } from '@/lib/log';
import { storageConfig } from './s3';

/**
 * The one place files are kept: an S3-compatible bucket (lib/storage/s3.ts), never a local disk,
 * so any instance can serve any file. Files are kept under server-made names grouped by co-op:
 * the database holds `<coopId>/<uuid>.<ext>`, the object key is `<S3_KEY_PREFIX>coops/<coopId>/<uuid>.<ext>`.
 * No storage URL ever leaves the server: downloads stream through the app, after its access checks.
 */

export const MAX_UPLOAD_BYTES = 10 * 1024 * 1024;

export type StoredKind = 'pdf' | 'jpeg' | 'png';
const MIME: Record<StoredKind, string> = { pdf: 'application/pdf', jpeg: 'image/jpeg', png: 'image/png' };

/** Recognises PDF, JPEG and PNG from their first bytes (what the file claims does not count). */
export function sniffKind(bytes: Uint8Array): StoredKind | null {
  if (bytes.length >= 5 && Buffer.from(bytes.subarray(0, 5)).toString('latin1') === '%PDF-') return 'pdf';
  if (bytes.length >= 3 && bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) return 'jpeg';
  if (
    bytes.length >= 8 &&
    Buffer.from(bytes.subarray(0, 8)).equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]))
  )
    return 'png';
  return null;
}

export function mimeOf(kind: StoredKind): string {
  return MIME[kind];
}

/** Whether `key` is a storage key of this co-op as putFile makes them. */
export function isCoopKey(coopId: number, key: string): boolean {
  return new RegExp(`^${coopId}/[0-9a-f-]{36}\\.(pdf|jpg|png)$`).test(key);
}

/** The object key in the bucket for a co-op's storage key (the per-co-op prefix). */
export function objectKey(key: string): string {
  return `${storageConfig().prefix}coops/${key}`;
}

/** The store could not be reached or refused us: logged for the operator, 503 for the person. */
const unavailable = (err: unknown, op: string) => {
  log.warn({ err, op }, 'storage.unavailable');
  return new HttpError(
    503,
    'File storage cannot be reached right now. Nothing was changed; please try again shortly.',
    undefined,
    { code: 'storage-unavailable', retryAfter: 5 },
  );
};

/** Saves bytes for a co-op; returns the storage key (never a user-supplied name). */
export async function putFile(coopId: number, kind: StoredKind, bytes: Uint8Array): Promise<string> {
  const key = `${coopId}/${crypto.randomUUID()}.${kind === 'jpeg' ? 'jpg' : kind}`;
  const { client, bucket } = storageConfig();
  try {
    await client.send(
      new PutObjectCommand({
        Bucket: bucket,
        Key: objectKey(key),
        Body: bytes,
        ContentLength: bytes.byteLength,
        ContentType: MIME[kind],
      }),
    );
  } catch (e) {
    throw unavailable(e, 'put');
  }
  return key;
}

/** A stored file as a stream and its size. */
export interface StoredFile {
  body: ReadableStream<Uint8Array>;
  size: number;
}

/**
 * Opens a stored file for streaming; the key must belong to the co-op asking (404 otherwise, and
 * when the object is missing); 503 when the store cannot be reached.
 */
export async function openFile(coopId: number, key: string): Promise<StoredFile> {
  if (!isCoopKey(coopId, key)) throw new Error('bad storage key');
  const { client, bucket } = storageConfig();
  let res;
  try {
    res = await client.send(new GetObjectCommand({ Bucket: bucket, Key: objectKey(key) }));
  } catch (e) {
    const status = (e as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;
    if (status === 404 || (e as Error).name === 'NoSuchKey') throw notFound('File not found.');
    throw unavailable(e, 'get');
  }
  if (!res.Body) throw unavailable(new Error('no body'), 'get');
  return { body: res.Body.transformToWebStream() as ReadableStream<Uint8Array>, size: Number(res.ContentLength ?? 0) };
}

/** Removes a stored file (a key of another co-op is ignored). Best effort: a failure is logged, never thrown. */
export async function deleteFile(coopId: number, key: string): Promise<void> {
  if (!isCoopKey(coopId, key)) return;
  try {
    const { client, bucket } = storageConfig();
    await client.send(new DeleteObjectCommand({ Bucket: bucket, Key: objectKey(key) }));
  } catch (err) {
    // An orphaned object costs a few bytes; the request that changed the rows has succeeded.
    log.warn({ err, key }, 'storage.delete-failed');
  }
}

/** Readiness: the bucket can be reached with our credentials. Throws otherwise. */
export async function checkStorage(): Promise<void> {
  const { client, bucket } = storageConfig();
  await client.send(new HeadBucketCommand({ Bucket: bucket }));
}
