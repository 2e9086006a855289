// With no bucket configured, file storage answers 503 with a code an operator can search for
// (never a 500), and readiness can tell "not configured" from "down".
import { afterEach, describe, expect, it } from 'vitest';
import { HttpError } from '@/lib/http';
import { storageConfig } from '@/lib/storage/s3';

describe('storage configuration', () => {
  const saved = process.env.S3_BUCKET;
  afterEach(() => {
    if (saved === undefined) delete process.env.S3_BUCKET;
    else process.env.S3_BUCKET = saved;
  });

  it('no S3_BUCKET: a 503 HttpError coded storage-not-configured', () => {
    process.env.S3_BUCKET = '  ';
    let thrown: unknown;
    try {
      storageConfig();
    } catch (e) {
      thrown = e;
    }
    expect(thrown).toBeInstanceOf(HttpError);
    expect((thrown as HttpError).status).toBe(503);
    expect((thrown as HttpError).extra).toMatchObject({ code: 'storage-not-configured' });
  });

  it('a bucket: the client and the prefix made into a folder', () => {
    process.env.S3_BUCKET = 'files';
    process.env.S3_KEY_PREFIX = '/tallyvat';
    const c = storageConfig();
    expect(c.bucket).toBe('files');
    expect(c.prefix).toBe('tallyvat/');
    delete process.env.S3_KEY_PREFIX;
  });
});
