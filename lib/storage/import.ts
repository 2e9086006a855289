import 'server-only';
import fs from 'node:fs/promises';
import path from 'node:path';
import { HeadObjectCommand, PutObjectCommand } from '@aws-sdk/client-s3';
import { Op } from 'sequelize';
import { BatchFile, ChemicalLot } from '@/models';
import { mimeOf, objectKey, type StoredKind } from './index';
import { storageConfig } from './s3';

const KEY = /^(\d+)\/[0-9a-f-]{36}\.(pdf|jpg|png)$/;
const KINDS: Record<string, StoredKind> = { pdf: 'pdf', jpg: 'jpeg', png: 'png' };

export interface ImportReport {
  copied: number;
  alreadyThere: number;
  /** Files in the folder that are not storage keys (left alone). */
  ignored: string[];
  /** Keys the database refers to that are in neither the folder nor the bucket. */
  missing: string[];
}

/**
 * Moves the files of a local upload folder (the former STORAGE_DIR: `<coopId>/<uuid>.<ext>`) into
 * the bucket under the same keys, so the database needs no change. Safe to run again: an object
 * already there with the same size is skipped. Then checks that every key the database refers to
 * (batch files, safety data sheets) is in the bucket. The folder itself is left for the operator.
 */
export async function importLocalFolder(dir: string, log: (m: string) => void = console.log): Promise<ImportReport> {
  const { client, bucket } = storageConfig();
  const report: ImportReport = { copied: 0, alreadyThere: 0, ignored: [], missing: [] };
  const exists = async (key: string): Promise<number | null> => {
    try {
      return Number(
        (await client.send(new HeadObjectCommand({ Bucket: bucket, Key: objectKey(key) }))).ContentLength ?? 0,
      );
    } catch (e) {
      if ((e as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode === 404) return null;
      throw e;
    }
  };
  const coops = await fs.readdir(dir, { withFileTypes: true }).catch(() => []);
  for (const c of coops) {
    if (!c.isDirectory()) {
      report.ignored.push(c.name);
      continue;
    }
    for (const name of await fs.readdir(path.join(dir, c.name))) {
      const key = `${c.name}/${name}`;
      const m = KEY.exec(key);
      if (!m) {
        report.ignored.push(key);
        continue;
      }
      const bytes = await fs.readFile(path.join(dir, key));
      if ((await exists(key)) === bytes.length) {
        report.alreadyThere++;
        continue;
      }
      await client.send(
        new PutObjectCommand({
          Bucket: bucket,
          Key: objectKey(key),
          Body: bytes,
          ContentLength: bytes.length,
          ContentType: mimeOf(KINDS[m[2]!]!),
        }),
      );
      report.copied++;
    }
  }
  const referenced = [
    ...(await BatchFile.findAll({ attributes: ['storageKey'], raw: true })).map((r) => r.storageKey),
    ...(
      await ChemicalLot.findAll({ attributes: ['sdsFileKey'], where: { sdsFileKey: { [Op.ne]: null } }, raw: true })
    ).map((r) => r.sdsFileKey!),
  ];
  for (const key of referenced) if ((await exists(key)) === null) report.missing.push(key);
  log(
    `storage import: ${report.copied} copied, ${report.alreadyThere} already there, ${report.ignored.length} ignored, ${report.missing.length} of ${referenced.length} referenced keys missing`,
  );
  return report;
}
