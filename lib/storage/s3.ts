import 'server-only';
import { S3Client } from '@aws-sdk/client-s3';
import { HttpError } from '@/lib/http';
import { log } from '@/lib/log';

/**
 * Where files live: one bucket of an S3-compatible object store, configured from the
 * environment, so that every web instance and worker sees the same files.
 *
 * S3_BUCKET (required to store or read files), S3_ENDPOINT (omit for AWS itself; e.g.
 * `http://127.0.0.1:4568` for the local fake), S3_REGION (default `us-east-1`),
 * S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY (omit both to use the SDK's default credential
 * chain, e.g. an instance role), S3_FORCE_PATH_STYLE=1 (path-style URLs, which most
 * non-AWS stores and the fake need), S3_KEY_PREFIX (put everything under a folder such as
 * `tallyvat/`, for a bucket shared with other things).
 */
export interface StorageConfig {
  bucket: string;
  prefix: string;
  client: S3Client;
}

let current: { signature: string; config: StorageConfig } | null = null;
let notConfiguredLogged = false;

/**
 * No bucket configured: an operator's mistake, not the person's. Logged once per process (as an
 * error, for the operator), answered 503 with a code (the rest of the app keeps working).
 */
function notConfigured(): HttpError {
  if (!notConfiguredLogged) {
    notConfiguredLogged = true;
    log.error(
      { code: 'storage-not-configured' },
      'File storage is not configured: set S3_BUCKET (and S3_ENDPOINT for a store other than AWS).',
    );
  }
  return new HttpError(
    503,
    'File storage is not set up on this installation yet. Nothing was changed; please tell the administrator.',
    undefined,
    { code: 'storage-not-configured', retryAfter: 60 },
  );
}

/** The bucket, key prefix and client (one client per process: it only holds connections); 503 HttpError when no bucket is set. */
export function storageConfig(): StorageConfig {
  const env = process.env;
  const bucket = env.S3_BUCKET?.trim();
  if (!bucket) throw notConfigured();
  const signature = [
    bucket,
    env.S3_ENDPOINT,
    env.S3_REGION,
    env.S3_ACCESS_KEY_ID,
    env.S3_FORCE_PATH_STYLE,
    env.S3_KEY_PREFIX,
  ].join('\n');
  if (current?.signature === signature) return current.config;
  const rawPrefix = (env.S3_KEY_PREFIX ?? '').trim().replace(/^\/+/, '');
  const prefix = rawPrefix && !rawPrefix.endsWith('/') ? `${rawPrefix}/` : rawPrefix;
  const keyId = env.S3_ACCESS_KEY_ID?.trim();
  const client = new S3Client({
    region: env.S3_REGION?.trim() || 'us-east-1',
    ...(env.S3_ENDPOINT ? { endpoint: env.S3_ENDPOINT.trim() } : {}),
    forcePathStyle: ['1', 'true', 'yes'].includes((env.S3_FORCE_PATH_STYLE ?? '').toLowerCase()),
    ...(keyId ? { credentials: { accessKeyId: keyId, secretAccessKey: env.S3_SECRET_ACCESS_KEY ?? '' } } : {}),
    // Checksums only where S3 insists: several S3-compatible stores (and the fake) reject the
    // newer default trailing checksums on uploads.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
    maxAttempts: 3,
    // A store that does not answer must not hold a request (or a worker's job) for long.
    requestHandler: { connectionTimeout: 3_000, requestTimeout: 30_000, throwOnRequestTimeout: true },
  });
  current = { signature, config: { bucket, prefix, client } };
  return current.config;
}
