import { sequelize } from '@/lib/db';

export const dynamic = 'force-dynamic';

/** Liveness and database check: 200 {status:'ok', db:'ok'} or 503 {status:'degraded', db:'down'}. */
export async function GET() {
  try {
    // Sequelize's own connection check (a trivial query on a pooled connection).
    await sequelize.authenticate({ logging: false });
    return Response.json({ status: 'ok', db: 'ok' });
  } catch {
    return Response.json({ status: 'degraded', db: 'down' }, { status: 503 });
  }
}
