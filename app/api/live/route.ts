export const dynamic = 'force-dynamic';

/**
 * Liveness: 200 while this process can answer at all. It touches nothing else, so a database or
 * storage outage never makes a platform restart healthy instances (readiness is `/api/ready`).
 */
export function GET() {
  return Response.json({ status: 'alive' }, { headers: { 'cache-control': 'no-store' } });
}
