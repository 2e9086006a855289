// Reads the object-storage fake the way an operator would, through the S3 API.
import { ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import { inject } from 'vitest';

let client: S3Client | null = null;
const env = () => JSON.parse(inject('storageEnv')) as Record<string, string>;

function s3(): S3Client {
  const e = env();
  client ??= new S3Client({
    endpoint: e.S3_ENDPOINT,
    region: e.S3_REGION,
    forcePathStyle: true,
    credentials: { accessKeyId: e.S3_ACCESS_KEY_ID!, secretAccessKey: e.S3_SECRET_ACCESS_KEY! },
  });
  return client;
}

/** The object keys stored for a co-op (`coops/<coopId>/…`). */
export async function storedKeys(coopId: number): Promise<string[]> {
  const res = await s3().send(new ListObjectsV2Command({ Bucket: env().S3_BUCKET, Prefix: `coops/${coopId}/` }));
  return (res.Contents ?? []).map((o) => o.Key!);
}
