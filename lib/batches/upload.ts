import 'server-only';
import { HttpError } from '@/lib/http';
import { MAX_UPLOAD_BYTES, sniffKind, type StoredKind } from '@/lib/storage';

/** An uploaded file, checked: its kind comes from its first bytes, never from its name or header. */
export interface CheckedUpload {
  bytes: Uint8Array;
  kind: StoredKind;
  /** The name the browser gave, cleaned for display only (storage uses a server-made name). */
  name: string;
  /** The other (text) fields of the form. */
  fields: Record<string, string>;
}

const MB = Math.round(MAX_UPLOAD_BYTES / (1024 * 1024));
const KIND_NAMES: Record<StoredKind, string> = { pdf: 'PDF', jpeg: 'JPEG', png: 'PNG' };

/**
 * Reads a multipart/form-data upload with one file in `field` and checks it: size (413 when the
 * body or file is over MAX_UPLOAD_BYTES, judged from Content-Length before reading when it is
 * given), non-empty, and a type recognised from its content among `allowed` (422 otherwise).
 * Call it after authorization.
 */
export async function readUpload(req: Request, allowed: readonly StoredKind[], field = 'file'): Promise<CheckedUpload> {
  const tooBig = () => new HttpError(413, `The file is larger than ${MB} MB.`, { [field]: [`Files can be at most ${MB} MB.`] });
  const declared = Number(req.headers.get('content-length') ?? 'NaN');
  // Multipart framing adds a little; anything beyond the limit plus 64 KiB cannot hold an allowed file.
  if (Number.isFinite(declared) && declared > MAX_UPLOAD_BYTES + 64 * 1024) throw tooBig();
  if (!(req.headers.get('content-type') ?? '').toLowerCase().startsWith('multipart/form-data')) {
    throw new HttpError(422, 'Some fields need attention.', { [field]: ['Send the file as a multipart/form-data upload.'] });
  }
  let form: FormData;
  try {
    form = await req.formData();
  } catch {
    throw new HttpError(400, 'The upload could not be read.', { [field]: ['The upload could not be read; try again.'] });
  }
  const entry = form.get(field);
  if (!entry || typeof entry === 'string') throw new HttpError(422, 'Some fields need attention.', { [field]: ['Choose a file to upload.'] });
  if (entry.size > MAX_UPLOAD_BYTES) throw tooBig();
  if (entry.size === 0) throw new HttpError(422, 'Some fields need attention.', { [field]: ['The file is empty.'] });
  const bytes = new Uint8Array(await entry.arrayBuffer());
  const kind = sniffKind(bytes);
  if (!kind || !allowed.includes(kind)) {
    const want = allowed.map((k) => KIND_NAMES[k]).join(', ').replace(/, ([^,]*)$/, ' or $1');
    throw new HttpError(422, 'Some fields need attention.', { [field]: [`This file is not a ${want} (checked from its content, not its name).`] });
  }
  const fields: Record<string, string> = {};
  form.forEach((v, k) => {
    if (typeof v === 'string' && k !== field) fields[k] = v;
  });
  const name = (entry.name || 'upload').replace(/[\u0000-\u001f\u007f/\\]/g, '_').slice(0, 200);
  return { bytes, kind, name, fields };
}

/** A download response for a stored file: attachment, the right type, no sniffing, private. */
export function fileResponse(bytes: Buffer, kind: StoredKind, filename: string): Response {
  const mime = kind === 'pdf' ? 'application/pdf' : kind === 'jpeg' ? 'image/jpeg' : 'image/png';
  const safe = filename.replace(/[^A-Za-z0-9._-]/g, '_').slice(0, 120) || 'file';
  return new Response(new Uint8Array(bytes), {
    headers: {
      'content-type': mime,
      'content-disposition': `attachment; filename="${safe}"`,
      'x-content-type-options': 'nosniff',
      'cache-control': 'private, no-store',
    },
  });
}
