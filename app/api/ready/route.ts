import { sequelize } from '@/lib/db';
import { HttpError } from '@/lib/http';
import { checkStorage } from '@/lib/storage';

export const dynamic = 'force-dynamic';

/**
 * Readiness for a load balancer: 200 when this instance can serve — the database answers and the
 * object store's bucket can be reached — 503 naming what is down (or storage `not-configured`) otherwise. Liveness is
 * `/api/live`; `/api/health` checks the database alone (see docs/deploy.md).
 */
export async function GET() {
  const [db, storage] = await Promise.all([
    sequelize.authenticate({ logging: false }).then(
      () => 'ok' as const,
      () => 'down' as const,
    ),
    withTimeout(checkStorage(), 3_000).then(
      () => 'ok' as const,
      (e) =>
        e instanceof HttpError && e.extra?.code === 'storage-not-configured'
          ? ('not-configured' as const)
          : ('down' as const),
    ),
  ]);
  const ready = db === 'ok' && storage === 'ok';
  return Response.json(
    { status: ready ? 'ready' : 'not-ready', db, storage },
    { status: ready ? 200 : 503, headers: { 'cache-control': 'no-store' } },
  );
}

function withTimeout<T>(p: Promise<T>, ms: number): Promise<T> {
  return Promise.race([p, new Promise<T>((_, reject) => setTimeout(() => reject(new Error('timeout')), ms).unref())]);
}
