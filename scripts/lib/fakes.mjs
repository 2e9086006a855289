// Local stand-ins for the hosted services, started on loopback by `npm start` and by the tests:
//  - an SMTP catcher (smtp-server) with an inbox page and a JSON API to read what was sent;
//  - a payments fake (stripe-stateful-mock) that the official `stripe` SDK talks to;
//  - an object-storage fake (s3rver) that the AWS SDK's S3 client talks to.
import http from 'node:http';
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

/**
 * Starts the SMTP catcher on smtpPort and its inbox page on httpPort.
 * GET /           → an HTML list of caught messages, newest first
 * GET /api/messages → JSON [{ id, to, from, subject, text, html, date, attachments:[{filename, contentType, size}] }]
 * GET /api/messages/:id/attachments/:n → the attachment bytes
 * DELETE /api/messages → empties the inbox
 */
export async function startMailCatcher({ smtpPort, httpPort, log = console.log }) {
  const { SMTPServer } = require('smtp-server');
  const { simpleParser } = require('mailparser');
  const messages = [];
  let nextId = 1;

  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    size: 20 * 1024 * 1024,
    // Accepting stores the raw message only; it is parsed when first read. Parsing a message with a
    // PDF costs tens of milliseconds, which would make the catcher, not Tallyvat, the bottleneck.
    onData(stream, _session, callback) {
      const chunks = [];
      stream.on('data', (c) => chunks.push(c));
      stream.on('error', callback);
      stream.on('end', () => {
        messages.unshift({ id: nextId++, raw: Buffer.concat(chunks) });
        if (messages.length > 500) messages.length = 500;
        callback();
      });
    },
  });
  /** Parses one stored message in place (once, however many readers ask at the same time). */
  function parseOne(m) {
    m.parsing ??= simpleParser(m.raw)
      .catch(() => ({ subject: '(unreadable message)', attachments: [] }))
      .then((mail) => {
        Object.assign(m, {
          messageId: mail.messageId ?? '',
          date: (mail.date ?? new Date()).toISOString(),
          from: mail.from?.text ?? '',
          to: mail.to
            ? []
                .concat(mail.to)
                .map((a) => a.text)
                .join(', ')
            : '',
          subject: mail.subject ?? '',
          text: mail.text ?? '',
          html: typeof mail.html === 'string' ? mail.html : '',
          attachments: (mail.attachments ?? []).map((a) => ({
            filename: a.filename,
            contentType: a.contentType,
            size: a.size,
            content: a.content,
          })),
        });
        delete m.raw;
        delete m.parsing;
      });
    return m.parsing;
  }
  /** Every message parsed, newest first; messages that arrive while parsing are parsed too. */
  async function parsed() {
    while (messages.some((m) => m.raw)) await Promise.all(messages.filter((m) => m.raw).map(parseOne));
    return messages;
  }
  await new Promise((resolve, reject) => {
    smtp.once('error', reject);
    smtp.listen(smtpPort, '127.0.0.1', () => {
      smtp.off('error', reject);
      resolve();
    });
  });
  // A client that drops its connection (a worker killed mid-message, a pool closing) is that
  // connection's problem, not the catcher's: without a listener it would end the whole process.
  smtp.on('error', (err) => {
    if (err?.code !== 'ECONNRESET' && err?.code !== 'EPIPE') log(`[smtp] ${err?.message ?? err}`);
  });

  const esc = (s) => String(s).replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
  const web = http.createServer(async (req, res) => {
    await parsed();
    const url = new URL(req.url ?? '/', 'http://localhost');
    if (url.pathname === '/api/messages' && req.method === 'DELETE') {
      messages.length = 0;
      res.writeHead(204).end();
      return;
    }
    if (url.pathname === '/api/messages') {
      res.writeHead(200, { 'content-type': 'application/json' });
      res.end(
        JSON.stringify(
          messages.map(({ attachments, ...m }) => ({
            ...m,
            attachments: attachments.map(({ content: _content, ...a }) => a),
          })),
        ),
      );
      return;
    }
    const att = url.pathname.match(/^\/api\/messages\/(\d+)\/attachments\/(\d+)$/);
    if (att) {
      const m = messages.find((x) => x.id === Number(att[1]));
      const a = m?.attachments[Number(att[2])];
      if (!a) return void res.writeHead(404).end('not found');
      res.writeHead(200, {
        'content-type': a.contentType,
        'content-disposition': `attachment; filename="${a.filename}"`,
      });
      res.end(a.content);
      return;
    }
    res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' });
    res.end(`<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width">
<title>Tallyvat outbox (development)</title>
<style>body{font:15px/1.5 system-ui,sans-serif;max-width:860px;margin:2rem auto;padding:0 1rem;color:#1c1917}
article{border:1px solid #d6d3d1;border-radius:8px;padding:1rem;margin:1rem 0}pre{white-space:pre-wrap;background:#fafaf9;padding:.75rem}
h1{color:#244f3f}small{color:#57534e}</style></head><body>
<h1>Caught e-mail</h1><p>Every message Tallyvat sends in development lands here instead of a real mailbox. Newest first.</p>
${
  messages.length === 0
    ? '<p><em>No messages yet.</em></p>'
    : messages
        .map(
          (m) => `<article><h2>${esc(m.subject)}</h2>
<small>${esc(m.date)} · from ${esc(m.from)} · to ${esc(m.to)}</small><pre>${linkify(esc(m.text))}</pre>
${m.attachments.map((a, i) => `<p>📎 <a href="/api/messages/${m.id}/attachments/${i}">${esc(a.filename)}</a> (${a.size} bytes)</p>`).join('')}</article>`,
        )
        .join('')
}
</body></html>`);
  });
  await new Promise((resolve, reject) => {
    web.once('error', reject);
    web.listen(httpPort, '127.0.0.1', resolve);
  });
  log(`Mail catcher: SMTP on 127.0.0.1:${smtpPort}, inbox at http://127.0.0.1:${httpPort}/`);
  return {
    /** The messages, parsed (newest first; the newest 500). */
    messages: parsed,
    /** Every message received since start (the list above keeps only the newest 500). */
    received: () => nextId - 1,
    stop: () => Promise.all([new Promise((r) => smtp.close(r)), new Promise((r) => web.close(r))]),
  };
}

function linkify(s) {
  return s.replace(/https?:\/\/[^\s<]+/g, (u) => `<a href="${u}">${u}</a>`);
}

/**
 * Starts the payments fake on port. stripe-stateful-mock answers the Stripe API (customers,
 * charges, refunds; no payment intents or checkout); its last route is a catch-all 404, so our
 * own routes go on an outer express app in front of it. The outer app adds what Tallyvat needs:
 *
 *  - webhooks: after a successful charge (charge.succeeded), a declined one (charge.failed) or a
 *    refund (charge.refunded) it POSTs a signed event, like the real service, to webhookUrl
 *    (signature scheme of the SDK's generateTestHeaderString with webhookSecret), retrying a few
 *    times while the app is not up. Idempotent replays send no new event.
 *  - test controls under /__fake (loopback only, never part of the real API):
 *      POST /__fake/outage {down: true, mode: '503' | 'lose-response'} / {down: false}
 *           '503': every /v1 call answers 503 before reaching the mock (nothing happens);
 *           'lose-response': the call is processed (the card IS charged) but the connection is
 *           dropped before the answer, as when a network fails mid-request.
 *      POST /__fake/webhooks {hold: true|false}   hold events instead of delivering (false delivers the held ones)
 *      GET  /__fake/webhooks/held                  held events: [{id, type, payload, signature}]
 *      DELETE /__fake/webhooks/held                forget held events
 *      GET  /__fake/charges                        charges actually created: [{id, amount, status, metadata, idempotencyKey}]
 *      GET  /__fake/deliveries                     webhook deliveries: [{id, type, status}]
 */
export async function startPaymentsFake({ port, webhookUrl = null, webhookSecret = null, log = console.log }) {
  process.env.LOG_LEVEL ??= 'silent';
  const express = require('express');
  const { createExpressApp } = require('stripe-stateful-mock');
  const { charges: mockCharges } = require('stripe-stateful-mock/dist/api/charges');
  const StripeSdk = require('stripe');
  const Stripe = StripeSdk.default ?? StripeSdk;
  const signer = new Stripe('sk_test_fake_signer', { telemetry: false });
  const state = { outage: null, hold: false, held: [], deliveries: [], charges: [] };
  const rand = (n) =>
    Array.from({ length: n }, () => 'abcdefghijklmnopqrstuvwxyz0123456789'[Math.floor(Math.random() * 36)]).join('');

  async function deliver(ev) {
    const rec = { id: ev.id, type: ev.type, status: 'pending' };
    state.deliveries.push(rec);
    for (let i = 0; i < 6; i++) {
      try {
        const r = await fetch(webhookUrl, {
          method: 'POST',
          headers: { 'content-type': 'application/json', 'stripe-signature': ev.signature },
          body: ev.payload,
        });
        rec.status = r.status;
        if (r.status < 500) return;
      } catch {
        rec.status = 'unreachable';
      }
      await new Promise((res) => setTimeout(res, 250 * 2 ** i));
    }
  }

  function emit(type, object, idempotencyKey) {
    if (!webhookUrl || !webhookSecret) return;
    const event = {
      id: `evt_${rand(24)}`,
      object: 'event',
      api_version: Stripe.API_VERSION ?? null,
      created: Math.floor(Date.now() / 1000),
      data: { object: JSON.parse(JSON.stringify(object)) },
      livemode: false,
      pending_webhooks: 1,
      request: { id: `req_${rand(14)}`, idempotency_key: idempotencyKey ?? null },
      type,
    };
    const payload = JSON.stringify(event, null, 2);
    const ev = {
      id: event.id,
      type,
      payload,
      signature: signer.webhooks.generateTestHeaderString({ payload, secret: webhookSecret }),
    };
    if (state.hold) state.held.push(ev);
    else void deliver(ev);
  }

  function observe(req, status, body) {
    const key = req.header('idempotency-key') ?? null;
    if (req.method === 'POST' && req.path === '/v1/charges') {
      if (status === 200 && body?.object === 'charge') {
        state.charges.push({
          id: body.id,
          amount: body.amount,
          status: body.status,
          metadata: body.metadata,
          idempotencyKey: key,
        });
        emit('charge.succeeded', body, key);
      } else if (status === 402 && body?.error?.charge) {
        let charge;
        try {
          charge = mockCharges.retrieve('acct_default', body.error.charge, 'id');
        } catch {
          charge = {
            id: body.error.charge,
            object: 'charge',
            status: 'failed',
            paid: false,
            amount: Number(req.body?.amount),
            currency: req.body?.currency,
            metadata: req.body?.metadata ?? {},
          };
        }
        emit('charge.failed', charge, key);
      }
    } else if (req.method === 'POST' && req.path === '/v1/refunds' && status === 200 && body?.object === 'refund') {
      try {
        emit('charge.refunded', mockCharges.retrieve('acct_default', body.charge, 'charge'), key);
      } catch {
        /* charge unknown: nothing to tell */
      }
    }
  }

  const outer = express();
  outer.get('/__health', (_req, res) => res.json({ status: 'ok' }));
  outer.use('/__fake', express.json());
  outer.post('/__fake/outage', (req, res) => {
    state.outage = req.body?.down ? (req.body.mode === 'lose-response' ? 'lose-response' : '503') : null;
    res.json({ outage: state.outage });
  });
  outer.post('/__fake/webhooks', (req, res) => {
    state.hold = Boolean(req.body?.hold);
    if (!state.hold) for (const ev of state.held.splice(0)) void deliver(ev);
    res.json({ hold: state.hold });
  });
  outer.get('/__fake/webhooks/held', (_req, res) => res.json(state.held));
  outer.delete('/__fake/webhooks/held', (_req, res) => {
    state.held.length = 0;
    res.status(204).end();
  });
  outer.get('/__fake/charges', (_req, res) => res.json(state.charges));
  outer.get('/__fake/deliveries', (_req, res) => res.json(state.deliveries));
  outer.use('/v1', (_req, res, next) => {
    if (state.outage !== '503') return next();
    res
      .status(503)
      .json({ error: { type: 'api_error', message: 'The payments service is unavailable (simulated outage).' } });
  });
  outer.use((req, res, next) => {
    if (!req.path.startsWith('/v1/')) return next();
    const send = res.send;
    let seen = false;
    res.send = function (body) {
      if (seen) return send.call(this, body);
      seen = true;
      let parsed = body;
      if (typeof body === 'string' || Buffer.isBuffer(body)) {
        try {
          parsed = JSON.parse(String(body));
        } catch {
          parsed = null;
        }
      }
      if (res.get('idempotent-replayed') !== 'true') observe(req, res.statusCode, parsed);
      if (state.outage === 'lose-response') {
        req.socket.destroy();
        return this;
      }
      return send.call(this, body);
    };
    next();
  });
  outer.use(createExpressApp());
  const server = await new Promise((resolve, reject) => {
    const s = outer.listen(port, '127.0.0.1', () => resolve(s));
    s.once('error', reject);
  });
  log(`Payments fake (Stripe API) on http://127.0.0.1:${port}${webhookUrl ? `, webhooks to ${webhookUrl}` : ''}`);
  return {
    stop: () =>
      new Promise((r) => {
        server.closeAllConnections?.();
        server.close(r);
      }),
  };
}

/** The bucket and keys of the local storage fake (s3rver accepts exactly these credentials). */
export const STORAGE_FAKE = {
  bucket: 'tallyvat',
  accessKeyId: 'S3RVER',
  secretAccessKey: 'S3RVER',
  region: 'us-east-1',
};

/**
 * Starts the object-storage fake (s3rver, an S3-compatible server keeping objects in `directory`)
 * on loopback with the app's bucket, and returns the S3_* environment that points the app at it.
 * Objects survive a restart when the directory is kept (`npm start` keeps it under .data/s3).
 * @param {{port: number, directory: string, log?: (m: string) => void}} o
 */
export async function startStorageFake({ port, directory, log = console.log }) {
  const S3rver = require('s3rver');
  const fs = require('node:fs');
  fs.mkdirSync(directory, { recursive: true });
  const server = new S3rver({
    port,
    address: '127.0.0.1',
    silent: true,
    directory,
    configureBuckets: [{ name: STORAGE_FAKE.bucket }],
  });
  const info = await server.run();
  const endpoint = `http://127.0.0.1:${info.port}`;
  log(`Storage fake (S3 API) on ${endpoint}, bucket ${STORAGE_FAKE.bucket}, objects in ${directory}`);
  return {
    endpoint,
    env: {
      S3_ENDPOINT: endpoint,
      S3_BUCKET: STORAGE_FAKE.bucket,
      S3_REGION: STORAGE_FAKE.region,
      S3_ACCESS_KEY_ID: STORAGE_FAKE.accessKeyId,
      S3_SECRET_ACCESS_KEY: STORAGE_FAKE.secretAccessKey,
      S3_FORCE_PATH_STYLE: '1',
    },
    stop: () => server.close(),
  };
}
