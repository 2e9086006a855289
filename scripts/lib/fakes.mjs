// Local stand-ins for the hosted services, started on loopback by `npm start` and by the tests:
//  - an SMTP catcher (smtp-server) with an inbox page and a JSON API to read what was sent;
//  - a payments fake (stripe-stateful-mock) that the official `stripe` SDK talks to.
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
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then((mail) => {
          messages.unshift({
            id: nextId++,
            date: (mail.date ?? new Date()).toISOString(),
            from: mail.from?.text ?? '',
            to: mail.to ? [].concat(mail.to).map((a) => a.text).join(', ') : '',
            subject: mail.subject ?? '',
            text: mail.text ?? '',
            html: typeof mail.html === 'string' ? mail.html : '',
            attachments: (mail.attachments ?? []).map((a) => ({ filename: a.filename, contentType: a.contentType, size: a.size, content: a.content })),
          });
          if (messages.length > 500) messages.length = 500;
          callback();
        })
        .catch(callback);
    },
  });
  await new Promise((resolve, reject) => {
    smtp.once('error', reject);
    smtp.listen(smtpPort, '127.0.0.1', resolve);
  });

  const esc = (s) => String(s).replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
  const web = http.createServer((req, res) => {
    const url = new URL(req.url ?? '/', 'http://localhost');
    if (url.pathname === '/api/messages' && req.method === 'DELETE') {
      messages.length = 0;
      res.writeHead(204).end();
      return;
    }
    if (url.pathname === '/api/messages') {
      res.writeHead(200, { 'content-type': 'application/json' });
      res.end(JSON.stringify(messages.map(({ attachments, ...m }) => ({
        ...m,
        attachments: attachments.map(({ content, ...a }) => a),
      }))));
      return;
    }
    const att = url.pathname.match(/^\/api\/messages\/(\d+)\/attachments\/(\d+)$/);
    if (att) {
      const m = messages.find((x) => x.id === Number(att[1]));
      const a = m?.attachments[Number(att[2])];
      if (!a) return void res.writeHead(404).end('not found');
      res.writeHead(200, { 'content-type': a.contentType, 'content-disposition': `attachment; filename="${a.filename}"` });
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
${messages.length === 0 ? '<p><em>No messages yet.</em></p>' : messages.map((m) => `<article><h2>${esc(m.subject)}</h2>
<small>${esc(m.date)} · from ${esc(m.from)} · to ${esc(m.to)}</small><pre>${linkify(esc(m.text))}</pre>
${m.attachments.map((a, i) => `<p>📎 <a href="/api/messages/${m.id}/attachments/${i}">${esc(a.filename)}</a> (${a.size} bytes)</p>`).join('')}</article>`).join('')}
</body></html>`);
  });
  await new Promise((resolve, reject) => {
    web.once('error', reject);
    web.listen(httpPort, '127.0.0.1', resolve);
  });
  log(`Mail catcher: SMTP on 127.0.0.1:${smtpPort}, inbox at http://127.0.0.1:${httpPort}/`);
  return {
    messages,
    stop: () => Promise.all([new Promise((r) => smtp.close(r)), new Promise((r) => web.close(r))]),
  };
}

function linkify(s) {
  return s.replace(/https?:\/\/[^\s<]+/g, (u) => `<a href="${u}">${u}</a>`);
}

/**
 * Starts the payments fake on port. stripe-stateful-mock answers the Stripe API (customers,
 * charges, refunds); its last route is a catch-all 404, so our own routes go on an outer
 * express app in front of it.
 */
export async function startPaymentsFake({ port, log = console.log }) {
  process.env.LOG_LEVEL ??= 'silent';
  const express = require('express');
  const { createExpressApp } = require('stripe-stateful-mock');
  const outer = express();
  outer.get('/__health', (_req, res) => res.json({ status: 'ok' }));
  outer.use(createExpressApp());
  const server = await new Promise((resolve, reject) => {
    const s = outer.listen(port, '127.0.0.1', () => resolve(s));
    s.once('error', reject);
  });
  log(`Payments fake (Stripe API) on http://127.0.0.1:${port}`);
  return { stop: () => new Promise((r) => server.close(r)) };
}
