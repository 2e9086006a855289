#!/usr/bin/env node
// Access-token benchmark (on demand): `node bench/api-tokens.mjs`.
// A fresh stack, one co-op with two tanks; an admin's session cookie and a read-only personal
// access token. Then, 10 connections, alternating twice: /api/health, GET /tanks with the cookie,
// GET /tanks with `Authorization: Bearer`, and /api/openapi.json → req/s, p97.5, ratio to health.
import { load, makeCoop, report, signInCookie, startStack } from './lib.mjs';

const DURATION = Number(process.env.BENCH_SECONDS ?? 8);
const log = (...a) => console.log('[bench]', ...a);
let stack;
try {
  stack = await startStack({ name: 'api-tokens', log });
  const { pool, baseUrl: base } = stack;
  const coop = await makeCoop(pool, 'tokens-bench');
  await pool.query(
    `INSERT INTO tanks (coop_id, name, capacity_liters, on_hand_liters, value_cents) VALUES ($1, 'A', 4000, 1000, 90000), ($1, 'B', 4000, 0, 0)`,
    [coop.coopId],
  );
  const cookie = await signInCookie(base, coop.people.admin.email);
  const created = await fetch(`${base}/api/coops/${coop.slug}/tokens`, {
    method: 'POST',
    headers: { cookie, origin: base, 'content-type': 'application/json' },
    body: JSON.stringify({ name: 'bench', access: 'read' }),
  });
  const { secret } = await created.json();
  if (!secret) throw new Error(`token not created: ${created.status}`);
  const tanks = `${base}/api/coops/${coop.slug}/tanks`;
  const rows = [];
  for (let round = 1; round <= 2; round++) {
    const health = report(`round ${round} /api/health`, await load({ url: `${base}/api/health`, duration: DURATION }));
    rows.push(health);
    rows.push(
      report(
        `round ${round} tanks (session cookie)`,
        await load({ url: tanks, duration: DURATION, headers: { cookie } }),
        health,
      ),
    );
    rows.push(
      report(
        `round ${round} tanks (bearer token)`,
        await load({ url: tanks, duration: DURATION, headers: { authorization: `Bearer ${secret}` } }),
        health,
      ),
    );
    rows.push(
      report(
        `round ${round} /api/openapi.json`,
        await load({ url: `${base}/api/openapi.json`, duration: DURATION }),
        health,
      ),
    );
  }
  const bytes = (await (await fetch(`${base}/api/openapi.json`)).text()).length;
  log(`/api/openapi.json is ${Math.round(bytes / 1024)} kB`);
} finally {
  await stack?.stop();
}
