import { findCoopIdForBench, findTankRows } from '@/lib/tank';

export const dynamic = 'force-dynamic';

/**
 * Bench-only, not a product route: the tank list's Sequelize query (the same call the tank API
 * makes, lib/tank findTankRows) with no session, so bench/tank.mjs can report the tank API's
 * throughput as a ratio to it. A 404 unless the server was started with TALLYVAT_BENCH=1
 * (bench/lib.mjs does). `?coop=` takes a co-op id or slug.
 */
export async function GET(req: Request): Promise<Response> {
  if (process.env.TALLYVAT_BENCH !== '1') return Response.json({ error: 'Not found.' }, { status: 404 });
  const coopId = await findCoopIdForBench(new URL(req.url).searchParams.get('coop') ?? '');
  if (coopId === null) return Response.json({ error: 'No such co-op.' }, { status: 404 });
  return Response.json({ tanks: await findTankRows(coopId) });
}
