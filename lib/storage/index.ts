import 'server-only';
import crypto from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';

/**
 * The one place files are kept: a folder outside the web root (STORAGE_DIR), files under
 * server-made names, grouped by co-op. Swap this module for object storage to run several
 * app instances without a shared disk.
 */
const root = () => path.resolve(process.env.STORAGE_DIR ?? '.data/uploads');

export const MAX_UPLOAD_BYTES = 10 * 1024 * 1024;

export type StoredKind = 'pdf' | 'jpeg' | 'png';
const MIME: Record<StoredKind, string> = { pdf: 'application/pdf', jpeg: 'image/jpeg', png: 'image/png' };

/** Recognises PDF, JPEG and PNG from their first bytes (what the file claims does not count). */
export function sniffKind(bytes: Uint8Array): StoredKind | null {
  if (bytes.length >= 5 && Buffer.from(bytes.subarray(0, 5)).toString('latin1') === '%PDF-') return 'pdf';
  if (bytes.length >= 3 && bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) return 'jpeg';
  if (bytes.length >= 8 && Buffer.from(bytes.subarray(0, 8)).equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]))) return 'png';
  return null;
}

export function mimeOf(kind: StoredKind): string {
  return MIME[kind];
}

/** Saves bytes for a co-op; returns the storage key (never a user-supplied name). */
export async function putFile(coopId: number, kind: StoredKind, bytes: Uint8Array): Promise<string> {
  const key = `${coopId}/${crypto.randomUUID()}.${kind === 'jpeg' ? 'jpg' : kind}`;
  const file = path.join(root(), key);
  await fs.mkdir(path.dirname(file), { recursive: true });
  await fs.writeFile(file, bytes, { flag: 'wx' });
  return key;
}

/** Reads a stored file; the key must belong to the co-op asking. */
export async function getFile(coopId: number, key: string): Promise<Buffer> {
  if (!new RegExp(`^${coopId}/[0-9a-f-]{36}\\.(pdf|jpg|png)$`).test(key)) throw new Error('bad storage key');
  return fs.readFile(path.join(root(), key));
}

export async function deleteFile(coopId: number, key: string): Promise<void> {
  if (!new RegExp(`^${coopId}/[0-9a-f-]{36}\\.(pdf|jpg|png)$`).test(key)) return;
  await fs.rm(path.join(root(), key), { force: true });
}
