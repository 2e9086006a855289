// Shared benchmark harness: a throw-away PostgreSQL (fsync off), migrations, `next start` from
// the production build, sign-in, and autocannon runs reported side by side with /api/health.
// Benchmarks are run on demand (`npm run bench`), never as part of `npm test`.
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import autocannon from 'autocannon';
import bcrypt from 'bcryptjs';
import { QueryTypes, Sequelize } from 'sequelize';
import { startEmbeddedPg, freePort, stopLeftover } from '../scripts/lib/pg.mjs';
import { migrate } from '../scripts/lib/db-setup.mjs';
import { buildIfNeeded } from '../scripts/lib/build.mjs';
import { appEnv, startNext, waitForHealth } from '../scripts/lib/app.mjs';
import { startMailCatcher, startPaymentsFake } from '../scripts/lib/fakes.mjs';

export const PASSWORD = 'bench-password-2026';

/**
 * The benchmark's own way into its database, through Sequelize (only lib/db.ts imports `pg`):
 * `query(text, params)` with positional `$1, $2 …` values bound, never spliced, resolving to
 * `{ rows }` like a `pg` pool, so the seeding scripts read the same; `sql(text, params)` gives
 * the rows directly; `end()` closes it. Statements without values are sent as they are (e.g.
 * `VACUUM ANALYZE`, several statements in one string).
 */
export function dbPool(databaseUrl) {
  const db = new Sequelize(databaseUrl, { logging: false, pool: { max: 4, min: 0 } });
  const sql = (text, params = []) =>
    db.query(text, {
      bind: params.length ? params.map((v) => (v === undefined ? null : v)) : undefined,
      type: QueryTypes.SELECT,
    });
  return {
    sequelize: db,
    sql,
    query: async (text, params = []) => ({ rows: await sql(text, params) }),
    end: () => db.close(),
  };
}

/** Starts everything; returns { baseUrl, pool (see dbPool), stop }. */
export async function startStack({
  name,
  databaseUrlSuffix = '',
  fast = true,
  seed = false,
  log = (m) => console.log('[bench]', m),
}) {
  buildIfNeeded({ log });
  const root = path.resolve('.data', `bench-${name}`);
  stopLeftover(path.join(root, 'pg'));
  fs.rmSync(root, { recursive: true, force: true });
  const stops = [];
  const pgSrv = await startEmbeddedPg({
    dataDir: path.join(root, 'pg'),
    port: await freePort(),
    dbName: 'bench',
    fast,
    log: () => {},
  });
  stops.push(pgSrv.stop);
  migrate({ databaseUrl: pgSrv.url, seed });
  const smtpPort = await freePort();
  const mail = await startMailCatcher({ smtpPort, httpPort: await freePort(), log: () => {} });
  stops.push(mail.stop);
  const paymentsPort = await freePort();
  const pay = await startPaymentsFake({ port: paymentsPort, log: () => {} });
  stops.push(pay.stop);
  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  // BENCH_CPU_PROF=<dir> writes a V8 CPU profile of the server when it stops.
  const nodeArgs = process.env.BENCH_CPU_PROF
    ? ['--cpu-prof', '--cpu-prof-dir', path.resolve(process.env.BENCH_CPU_PROF)]
    : [];
  // BENCH_NODE_ARGS="--flag …" adds Node.js flags to the server (to try runtime settings).
  if (process.env.BENCH_NODE_ARGS) nodeArgs.push(...process.env.BENCH_NODE_ARGS.split(/\s+/).filter(Boolean));
  const env = appEnv({
    databaseUrl: pgSrv.url + databaseUrlSuffix,
    appUrl: baseUrl,
    secret: crypto.randomBytes(32).toString('base64url'),
    smtpPort,
    paymentsPort,
    webhookSecret: 'whsec_bench',
    extra: { NODE_ENV: 'production', DB_POOL_MAX: '20', TALLYVAT_BENCH: '1' },
  });
  const next = startNext({ env, port, host: '127.0.0.1', nodeArgs, stdio: ['ignore', 'ignore', 'inherit'] });
  stops.unshift(next.stop);
  await waitForHealth(baseUrl, next.child);
  const pool = dbPool(pgSrv.url);
  stops.unshift(() => pool.end());
  /** Another `next start` with the same environment (one database), as a second instance behind a load balancer. */
  const startInstance = async () => {
    const p = await freePort();
    const n = startNext({
      env: { ...env, TALLYVAT_SERVICE: `web-${p}` },
      port: p,
      host: '127.0.0.1',
      nodeArgs,
      stdio: ['ignore', 'ignore', 'inherit'],
    });
    stops.unshift(n.stop);
    await waitForHealth(`http://127.0.0.1:${p}`, n.child);
    return { baseUrl: `http://127.0.0.1:${p}`, child: n.child };
  };
  const stop = async () => {
    process.off('SIGINT', interrupted);
    for (const s of stops.splice(0)) await s();
  };
  // Ctrl-C stops everything the stack started (exit code 130, as a shell reports it).
  const interrupted = () => stop().finally(() => process.exit(130));
  process.once('SIGINT', interrupted);
  return {
    baseUrl,
    pool,
    databaseUrl: pgSrv.url,
    root,
    pgClusterDir: path.join(root, 'pg', 'cluster'),
    next: next.child,
    startInstance,
    stop,
  };
}

/**
 * A small round-robin HTTP proxy on loopback in front of `upstreams` (base URLs), as a load
 * balancer would be: each request goes to the next instance, over kept-alive connections.
 * Appends the client address to X-Forwarded-For like a real proxy. Returns { baseUrl, stop }.
 */
export async function roundRobinProxy(upstreams) {
  const http = await import('node:http');
  // Idle connections are dropped after 4 s, before `next start` closes them (its keep-alive
  // timeout is 5 s): reusing a connection the instance is closing fails the request (a 502), the
  // race a load balancer avoids by idling out first (docs/deploy.md, KEEP_ALIVE_TIMEOUT).
  const agent = new http.Agent({ keepAlive: true, maxSockets: 64, timeout: 4000 });
  const targets = upstreams.map((u) => new URL(u));
  let next = 0;
  const server = http.createServer((req, res) => {
    const t = targets[next++ % targets.length];
    const headers = {
      ...req.headers,
      'x-forwarded-for': [req.headers['x-forwarded-for'], req.socket.remoteAddress].filter(Boolean).join(', '),
    };
    const up = http.request(
      { host: t.hostname, port: t.port, method: req.method, path: req.url, headers, agent },
      (r) => {
        res.writeHead(r.statusCode ?? 502, r.headers);
        r.pipe(res);
      },
    );
    up.on('error', (e) => {
      // Logged while a client still waits (not for requests left over when the instances stop).
      if (!res.destroyed) console.error(`[proxy] ${req.method} ${req.url} → ${t.host}: ${e.code ?? e.message}`);
      if (!res.headersSent) res.writeHead(502);
      res.end();
    });
    req.pipe(up);
  });
  const port = await freePort();
  await new Promise((r) => server.listen(port, '127.0.0.1', r));
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    stop: () =>
      new Promise((r) => {
        server.closeAllConnections?.();
        agent.destroy();
        server.close(r);
      }),
  };
}

/** Resident memory of a process in MiB (Linux /proc; null elsewhere). */
export function rssMiB(pid) {
  try {
    const m = /VmRSS:\s+(\d+) kB/.exec(fs.readFileSync(`/proc/${pid}/status`, 'utf8'));
    return m ? Math.round(Number(m[1]) / 1024) : null;
  } catch {
    return null;
  }
}

/** Inserts a co-op with one user per role (same password); returns ids and e-mails. */
export async function makeCoop(pool, slug) {
  const hash = bcrypt.hashSync(PASSWORD, 10);
  const {
    rows: [coop],
  } = await pool.query(`INSERT INTO coops (name, slug) VALUES ($1, $2) RETURNING id`, [`Bench ${slug}`, slug]);
  const people = {};
  for (const role of ['admin', 'treasurer', 'brewer', 'member']) {
    const email = `${role}@${slug}.bench`;
    const {
      rows: [u],
    } = await pool.query(`INSERT INTO users (email, name, password_hash) VALUES ($1, $2, $3) RETURNING id`, [
      email,
      `Bench ${role}`,
      hash,
    ]);
    const {
      rows: [m],
    } = await pool.query(`INSERT INTO memberships (coop_id, user_id, role) VALUES ($1, $2, $3) RETURNING id`, [
      coop.id,
      u.id,
      role,
    ]);
    people[role] = { userId: u.id, membershipId: m.id, email };
  }
  return { coopId: coop.id, slug, people };
}

/** Signs in and returns the Cookie header value for the session. */
export async function signInCookie(baseUrl, email, password = PASSWORD) {
  const csrf = await fetch(`${baseUrl}/api/auth/csrf`);
  const { csrfToken } = await csrf.json();
  const jar = csrf.headers.getSetCookie().map((c) => c.split(';')[0]);
  const res = await fetch(`${baseUrl}/api/auth/callback/credentials`, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'content-type': 'application/x-www-form-urlencoded', cookie: jar.join('; ') },
    body: new URLSearchParams({ csrfToken, email, password, json: 'true' }),
  });
  const session = res.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .find((c) => c.includes('session-token'));
  if (!session) throw new Error(`sign-in failed for ${email}: ${res.status}`);
  return session;
}

/**
 * CPU time the server process has used so far, in ms (Linux /proc; null elsewhere). Taken around a
 * load run it gives the server's CPU per request, a steadier measure than req/s on a shared machine.
 */
export function serverCpuMs(pid) {
  try {
    const stat = fs.readFileSync(`/proc/${pid}/stat`, 'utf8');
    const f = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return ((Number(f[11]) + Number(f[12])) * 1000) / 100; // utime + stime, in clock ticks of 1/100 s (USER_HZ)
  } catch {
    return null;
  }
}

/** CPU time used so far by each of PostgreSQL's processes (the postmaster of `clusterDir` and its children), ms by pid; null when unreadable. */
function postgresCpuByPid(clusterDir) {
  try {
    const postmaster = Number(fs.readFileSync(path.join(clusterDir, 'postmaster.pid'), 'utf8').split('\n')[0]);
    const byPid = new Map();
    for (const pid of fs.readdirSync('/proc').filter((d) => /^\d+$/.test(d))) {
      let stat;
      try {
        stat = fs.readFileSync(`/proc/${pid}/stat`, 'utf8');
      } catch {
        continue;
      }
      const f = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
      if (Number(pid) === postmaster || Number(f[1]) === postmaster)
        byPid.set(pid, ((Number(f[11]) + Number(f[12])) * 1000) / 100);
    }
    return byPid;
  } catch {
    return null;
  }
}

/**
 * Starts counting PostgreSQL's CPU time; the returned function gives the ms used since, by the
 * processes alive then (an autovacuum worker that exits in between does not make it negative).
 */
export function postgresCpuMeter(clusterDir) {
  const before = postgresCpuByPid(clusterDir);
  return () => {
    const now = postgresCpuByPid(clusterDir);
    if (!before || !now) return null;
    let used = 0;
    for (const [pid, ms] of now) used += Math.max(0, ms - (before.get(pid) ?? 0));
    return used;
  };
}

/**
 * Runs autocannon; returns { rps, p97_5, p50, errors, non2xx, total }. With `cpu` ({ pid, clusterDir }: the
 * server's pid and the cluster's directory) also the server's and PostgreSQL's CPU per request in ms.
 */
export async function load({
  url,
  connections = 10,
  duration = 10,
  headers = {},
  method = 'GET',
  body,
  requests,
  cpu,
}) {
  const server0 = cpu ? serverCpuMs(cpu.pid) : null;
  const pgUsed = cpu ? postgresCpuMeter(cpu.clusterDir) : null;
  const r = await autocannon({ url, connections, duration, headers, method, body, requests });
  const server1 = cpu ? serverCpuMs(cpu.pid) : null;
  const pgMs = pgUsed ? pgUsed() : null;
  const per = (ms) => (ms === null || !r.requests.total ? null : Number((ms / r.requests.total).toFixed(2)));
  return {
    rps: Math.round(r.requests.average),
    p50: r.latency.p50,
    p97_5: r.latency.p97_5,
    errors: r.errors,
    non2xx: r.non2xx,
    total: r.requests.total,
    serverCpuMs: server0 === null || server1 === null ? null : per(server1 - server0),
    postgresCpuMs: per(pgMs),
  };
}

/** Prints a result line and returns it. */
export function report(label, r, reference) {
  const ratio = reference ? ` (${Math.round((r.rps / reference.rps) * 100)} % of /api/health)` : '';
  const cpu =
    r.serverCpuMs !== undefined && r.serverCpuMs !== null
      ? `  CPU/req server ${r.serverCpuMs} ms, PG ${r.postgresCpuMs ?? '?'} ms`
      : '';
  console.log(
    `${label.padEnd(40)} ${String(r.rps).padStart(6)} req/s  p50 ${r.p50} ms  p97.5 ${r.p97_5} ms  errors ${r.errors}  non-2xx ${r.non2xx}${ratio}${cpu}`,
  );
  return r;
}
