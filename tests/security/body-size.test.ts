// Finding 5: an unauthenticated 100 MB JSON body was read and parsed (+248 MB server memory)
// before the 422. Now JSON bodies stop at 256 kB with a 413: judged from Content-Length before
// reading, and counted while the stream arrives when there is none (chunked).
import http from 'node:http';
import { describe, expect, it } from 'vitest';
import { api, baseUrl } from '../support/api';

/** Sends `chunks` chunks of 64 kB with chunked transfer encoding; resolves with the status and how many chunks went out before the answer. */
function chunkedPost(path: string, chunks: number): Promise<{ status: number; sent: number }> {
  return new Promise((resolve, reject) => {
    const u = new URL(path, baseUrl());
    let sent = 0;
    let answered = false;
    const req = http.request(
      {
        host: u.hostname,
        port: u.port,
        path: u.pathname,
        method: 'POST',
        headers: { 'content-type': 'application/json', origin: baseUrl(), 'transfer-encoding': 'chunked' },
      },
      (res) => {
        answered = true;
        res.resume();
        resolve({ status: res.statusCode ?? 0, sent });
      },
    );
    req.on('error', (e) => (answered ? undefined : reject(e)));
    const chunk = Buffer.alloc(64 * 1024, 0x20);
    const pump = () => {
      while (!answered && sent < chunks) {
        sent++;
        if (sent === 1) req.write('{"email":"');
        if (!req.write(chunk)) return void req.once('drain', pump);
      }
      if (!answered) req.end('"}');
    };
    pump();
  });
}

describe('JSON body size', () => {
  it('a declared 100 MB body is refused with 413 before it is read', async () => {
    const started = Date.now();
    const res = await new Promise<number>((resolve, reject) => {
      const u = new URL('/api/password-reset', baseUrl());
      const req = http.request(
        {
          host: u.hostname,
          port: u.port,
          path: u.pathname,
          method: 'POST',
          headers: {
            'content-type': 'application/json',
            origin: baseUrl(),
            'content-length': String(100 * 1024 * 1024),
          },
        },
        (r) => {
          r.resume();
          resolve(r.statusCode ?? 0);
          req.destroy();
        },
      );
      req.on('error', () => {});
      req.write('{"email":"');
      setTimeout(() => reject(new Error('no answer')), 20_000).unref();
    });
    expect(res).toBe(413);
    expect(Date.now() - started).toBeLessThan(20_000);
  });

  it('a chunked body without a length is cut off at the limit with 413, not read to the end', async () => {
    const r = await chunkedPost('/api/password-reset', 1600); // 100 MB offered
    expect(r.status).toBe(413);
    expect(r.sent).toBeLessThan(1600);
  });

  it('a body just under the limit is read and judged (422), one just over is 413', async () => {
    const under = await api()
      .post('/api/password-reset')
      .set('content-type', 'application/json')
      .send(JSON.stringify({ email: 'x'.repeat(250 * 1024) }));
    expect(under.status).toBe(422);
    const over = await api()
      .post('/api/password-reset')
      .set('content-type', 'application/json')
      .send(JSON.stringify({ email: 'x'.repeat(257 * 1024) }));
    expect(over.status).toBe(413);
  });
});
