// Finding 11: a PNG could be stored with the display name `poly.html`, and a file beginning with
// `%PDF-` followed by HTML was accepted. Now the name takes the sniffed type's extension, files
// carrying markup or script are refused, and downloads are sandboxed attachments.
import { beforeAll, describe, expect, it } from 'vitest';
import { binary, countRows, makeCoopWithRoles } from '../support/api';
import { insertBatch } from '../support/batches';

let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
let batchId: number;
const files = () => `/api/coops/${ctx.coop.slug}/batches/${batchId}/files`;
const PNG = Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), Buffer.alloc(64)]);

beforeAll(async () => {
  ctx = await makeCoopWithRoles();
  batchId = await insertBatch(ctx.coop.id, { number: 1 });
});

describe('uploads', () => {
  it('a PNG sent as poly.html is stored and served as poly.png, sandboxed, as an attachment', async () => {
    const up = await ctx.agents.brewer
      .post(files())
      .field('purpose', 'photo')
      .attach('file', PNG, { filename: 'poly.html', contentType: 'text/html' })
      .expect(201);
    expect(up.body).toMatchObject({ kind: 'png', name: 'poly.png' });
    const got = await ctx.agents.brewer.get(`${files()}/${up.body.id}`).buffer(true).parse(binary).expect(200);
    expect(got.headers['content-type']).toBe('image/png');
    expect(got.headers['content-disposition']).toBe('attachment; filename="poly.png"');
    expect(got.headers['x-content-type-options']).toBe('nosniff');
    expect(got.headers['content-security-policy']).toMatch(/\bsandbox\b/);
    expect(got.headers['content-security-policy']).toMatch(/default-src 'none'/);
  });

  it('names keep a matching extension and gain one otherwise', async () => {
    for (const [filename, name] of [
      ['scan.PNG', 'scan.PNG'],
      ['noext', 'noext.png'],
      ['a.png.exe', 'a.png.png'],
      ['.htaccess', '.htaccess.png'],
    ] as const) {
      const up = await ctx.agents.brewer
        .post(files())
        .field('purpose', 'photo')
        .attach('file', PNG, { filename, contentType: 'image/png' })
        .expect(201);
      expect(up.body.name, filename).toBe(name);
    }
  });

  it('a %PDF- file carrying HTML or script is refused with 422 naming the file; nothing stored', async () => {
    const before = await countRows('batch_files', 'coop_id = $1', [ctx.coop.id]);
    const polyglots = [
      '%PDF-1.4\n<html><body><script>alert(document.cookie)</script></body></html>',
      '%PDF-1.7\n1 0 obj<</Type/Catalog/OpenAction<</S/JavaScript/JS(app.alert(1))>>>>endobj\n%%EOF',
      '%PDF-1.4\n<!DOCTYPE html><svg onload=alert(1)>',
      '%PDF-1.4\n1 0 obj<</S/Launch/F(cmd.exe)>>endobj',
    ];
    for (const text of polyglots) {
      const res = await ctx.agents.brewer
        .post(files())
        .field('purpose', 'lab-report')
        .attach('file', Buffer.from(text), { filename: 'report.pdf', contentType: 'application/pdf' });
      expect(res.status, text).toBe(422);
      expect(res.body.fields.file[0]).toMatch(/web page or script/);
    }
    const png = await ctx.agents.brewer
      .post(files())
      .field('purpose', 'photo')
      .attach('file', Buffer.concat([PNG, Buffer.from('<script>alert(1)</script>')]), {
        filename: 'x.png',
        contentType: 'image/png',
      });
    expect(png.status).toBe(422);
    expect(await countRows('batch_files', 'coop_id = $1', [ctx.coop.id])).toBe(before);
  });

  it('a JSON body on an upload route is 415', async () => {
    const res = await ctx.agents.brewer.post(files()).send({ file: 'x' });
    expect(res.status).toBe(415);
  });
});
