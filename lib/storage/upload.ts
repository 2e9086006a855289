import 'server-only';
import { checkHostileText, HttpError, invalidFields } from '@/lib/http';
import { DOWNLOAD_CSP } from '@/lib/security/headers';
import { MAX_UPLOAD_BYTES, mimeOf, sniffKind, type StoredFile, type StoredKind } from '@/lib/storage';

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
/** The extensions a display name may carry for each kind; the first is added when it has none of them. */
const KIND_EXTENSIONS: Record<StoredKind, readonly string[]> = { pdf: ['pdf'], jpeg: ['jpg', 'jpeg'], png: ['png'] };

/**
 * Markup and script a browser or PDF reader could run, found in files that claim to be documents
 * or images (polyglots such as `%PDF-` followed by an HTML page). Scanned in the raw bytes.
 */
const HTML_MARKERS =
  /<\s*(?:!doctype|html|head|body|script|iframe|object|embed|svg|meta|base|form|img[^>]*\bon\w+\s*=)|javascript:/i;
/** PDF actions that run code or other programs when the file is opened. */
const PDF_SCRIPT_MARKERS = /\/(?:JavaScript|JS|Launch|RichMedia|XFA)\b/;

/** Whether a file holds markup or script that has no place in an uploaded document or image. */
export function hasActiveContent(bytes: Uint8Array, kind: StoredKind): boolean {
  const text = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('latin1');
  return HTML_MARKERS.test(text) || (kind === 'pdf' && PDF_SCRIPT_MARKERS.test(text));
}

/**
 * The name shown for a stored file: the browser's name, cleaned, with the extension of the type
 * recognised from the content — a PNG sent as `poly.html` is shown as `poly.png`, so a download
 * never carries a name that a browser or desktop would open as something else.
 */
export function displayName(raw: string, kind: StoredKind): string {
  const cleaned = raw
    .replace(/[\u0000-\u001f\u007f/\\]/g, '_')
    .trim()
    .replace(/[. ]+$/, '');
  const dot = cleaned.lastIndexOf('.');
  const ext = dot > 0 ? cleaned.slice(dot + 1).toLowerCase() : '';
  const allowed = KIND_EXTENSIONS[kind];
  if (allowed.includes(ext)) return cleaned.slice(0, 200);
  const stem = (dot > 0 ? cleaned.slice(0, dot) : cleaned).slice(0, 190) || 'upload';
  return `${stem}.${allowed[0]}`;
}

/**
 * Reads a multipart/form-data upload with one file in `field` and checks it: size (413 when the
 * body or file is over MAX_UPLOAD_BYTES, judged from Content-Length before reading when it is
 * given), non-empty, and a type recognised from its content among `allowed` (422 otherwise).
 * Call it after authorization.
 */
export async function readUpload(req: Request, allowed: readonly StoredKind[], field = 'file'): Promise<CheckedUpload> {
  const tooBig = () =>
    new HttpError(413, `The file is larger than ${MB} MB.`, { [field]: [`Files can be at most ${MB} MB.`] });
  const declared = Number(req.headers.get('content-length') ?? 'NaN');
  // Multipart framing adds a little; anything beyond the limit plus 64 KiB cannot hold an allowed file.
  if (Number.isFinite(declared) && declared > MAX_UPLOAD_BYTES + 64 * 1024) throw tooBig();
  if (!(req.headers.get('content-type') ?? '').toLowerCase().startsWith('multipart/form-data')) {
    throw new HttpError(415, 'Send the file as a multipart/form-data upload.', {
      [field]: ['Send the file as a multipart/form-data upload.'],
    });
  }
  let form: FormData;
  try {
    form = await req.formData();
  } catch {
    throw new HttpError(400, 'The upload could not be read.', {
      [field]: ['The upload could not be read; try again.'],
    });
  }
  const entry = form.get(field);
  if (!entry || typeof entry === 'string') throw invalidFields({ [field]: ['Choose a file to upload.'] });
  if (entry.size > MAX_UPLOAD_BYTES) throw tooBig();
  if (entry.size === 0) throw invalidFields({ [field]: ['The file is empty.'] });
  const bytes = new Uint8Array(await entry.arrayBuffer());
  const kind = sniffKind(bytes);
  if (!kind || !allowed.includes(kind)) {
    const want = allowed
      .map((k) => KIND_NAMES[k])
      .join(', ')
      .replace(/, ([^,]*)$/, ' or $1');
    throw invalidFields({
      [field]: [`This file is not a ${want} (checked from its content, not its name).`],
    });
  }
  if (hasActiveContent(bytes, kind)) {
    throw invalidFields({
      [field]: [
        `This ${KIND_NAMES[kind]} contains web page or script content, which is not accepted. Save or print it as a plain ${KIND_NAMES[kind]} and upload that.`,
      ],
    });
  }
  const fields: Record<string, string> = Object.create(null);
  form.forEach((v, k) => {
    if (typeof v === 'string' && k !== field) fields[k] = v;
  });
  checkHostileText(fields);
  return { bytes, kind, name: displayName(entry.name || 'upload', kind), fields };
}

/**
 * A download response for a stored file, streamed from storage: attachment, the right type, no
 * sniffing, private, and a sandboxing Content-Security-Policy, so even a file opened in the
 * browser can run nothing.
 */
export function fileResponse(file: StoredFile, kind: StoredKind, filename: string): Response {
  const safe = displayName(filename, kind)
    .replace(/[^A-Za-z0-9._-]/g, '_')
    .slice(-120);
  return new Response(file.body, {
    headers: {
      'content-type': mimeOf(kind),
      ...(file.size > 0 ? { 'content-length': String(file.size) } : {}),
      'content-disposition': `attachment; filename="${safe}"`,
      'x-content-type-options': 'nosniff',
      'content-security-policy': DOWNLOAD_CSP,
      'cache-control': 'private, no-store',
    },
  });
}
