// Overview API on the benchmark co-op: 300 members, 50,000 draws, 5 tanks, 2,000 batches,
// 3,600 invoices (the admin sees every section). Target: p97.5 under 80 ms at 10 connections.
import { load, makeCoop, report, signInCookie, startStack } from './lib.mjs';
import { seedBenchCoop } from './seed.mjs';

const stack = await startStack({ name: 'overview' });
try {
  const { pool, baseUrl } = stack;
  const coop = await makeCoop(pool, 'overview-bench');
  const c = coop.coopId;
  const hasBatches = await seedBenchCoop(pool, c);
  // What autovacuum would have done by then: statistics, and the visibility map for index-only scans.
  await pool.query('VACUUM ANALYZE');
  const cookie = await signInCookie(baseUrl, coop.people.admin.email);
  const memberCookie = await signInCookie(baseUrl, coop.people.member.email);
  const headers = { cookie };
  // Server and PostgreSQL CPU per request (steadier than req/s on a shared machine); BENCH_SECONDS per run.
  const cpu = { pid: stack.next.pid, clusterDir: stack.pgClusterDir };
  const duration = Number(process.env.BENCH_SECONDS ?? 10);
  const overviewUrl = `${baseUrl}/api/coops/${coop.slug}/overview`;
  await load({ url: overviewUrl, headers, duration: 2 });
  await load({ url: overviewUrl, headers: { cookie: memberCookie }, duration: 2 });
  const health = report('/api/health (10 conn)', await load({ url: `${baseUrl}/api/health`, duration, cpu }));
  // The tank list's Sequelize query with no session (bench-only route), measured in the same run.
  const benchQuery = report(
    'bench tank query, no session (10 conn)',
    await load({ url: `${baseUrl}/api/bench/tank-query?coop=${coop.slug}`, duration, cpu }),
    health,
  );
  const overview = report(
    'overview API, admin (10 conn)',
    await load({ url: overviewUrl, headers, duration, cpu }),
    health,
  );
  report(
    'overview API, member (10 conn)',
    await load({ url: overviewUrl, headers: { cookie: memberCookie }, duration, cpu }),
    health,
  );
  console.log(`overview (admin) ÷ bench query: ${Math.round((overview.rps / benchQuery.rps) * 100)} %`);
  console.log(
    `target p97.5 < 80 ms: ${overview.p97_5 < 80 ? 'met' : 'NOT met'}${hasBatches ? '' : ' (no batches table in this build)'}`,
  );
} finally {
  await stack.stop();
}
