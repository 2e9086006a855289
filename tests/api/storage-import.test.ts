// `npm run storage:import`: a former local upload folder moved into the bucket under the same
// keys (lib/storage/import.ts), served afterwards like any upload, safe to run again, and every
// key the database names that is in neither place reported (exit code 2).
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, inject, it } from 'vitest';
import { binary, makeCoopWithRoles, runScript, sql } from '../support/api';

/** The script as an operator runs it, against the storage fake; its output in one string. */
async function storageImport(dir: string) {
  const r = await runScript('storage-import', [dir], JSON.parse(inject('storageEnv')));
  return { code: r.code, out: r.stdout + r.stderr };
}

describe('npm run storage:import', () => {
  it('copies the folder into the bucket, serves it, skips it the second time, and names what is missing', async () => {
    const ctx = await makeCoopWithRoles();
    const api = `/api/coops/${ctx.coop.slug}`;
    const newLot = async () =>
      (
        await ctx.agents.brewer
          .post(`${api}/supplies/chemicals`)
          .send({
            kind: 'methanol',
            supplier: 'Hillside Chemicals',
            receivedOn: '2026-10-01',
            quantity: 20,
            unit: 'L',
            totalCost: '30.00',
          })
          .expect(201)
      ).body.id as number;
    // One lot whose sheet sits in the old folder, one whose sheet is nowhere.
    const [kept, lost] = [await newLot(), await newLot()];
    const keptKey = `${ctx.coop.id}/${crypto.randomUUID()}.pdf`;
    const lostKey = `${ctx.coop.id}/${crypto.randomUUID()}.pdf`;
    await sql('UPDATE chemical_lots SET sds_file_key = $1, sds_file_name = $2 WHERE id = $3', [
      keptKey,
      'sheet.pdf',
      kept,
    ]);
    await sql('UPDATE chemical_lots SET sds_file_key = $1, sds_file_name = $2 WHERE id = $3', [
      lostKey,
      'gone.pdf',
      lost,
    ]);
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tallyvat-uploads-'));
    const pdf = Buffer.from(`%PDF-1.4\n% sheet ${keptKey}\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n`);
    fs.mkdirSync(path.join(dir, String(ctx.coop.id)));
    fs.writeFileSync(path.join(dir, keptKey), pdf);
    fs.writeFileSync(path.join(dir, String(ctx.coop.id), 'notes.txt'), 'not an upload');

    const first = await storageImport(dir);
    expect(first.code).toBe(2);
    expect(first.out).toMatch(/storage import: 1 copied, 0 already there, 1 ignored/);
    expect(first.out).toContain(`missing: ${lostKey}`);
    expect(first.out).not.toContain(`missing: ${keptKey}`);
    const served = await ctx.agents.brewer
      .get(`${api}/supplies/chemicals/${kept}/sds`)
      .buffer(true)
      .parse(binary)
      .expect(200);
    expect(Buffer.compare(served.body as Buffer, pdf)).toBe(0);

    const again = await storageImport(dir);
    expect(again.out).toMatch(/storage import: 0 copied, 1 already there, 1 ignored/);
    expect(again.out).toContain(`missing: ${lostKey}`);
    fs.rmSync(dir, { recursive: true, force: true });
  });
});
