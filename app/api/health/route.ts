import { sequelize } from '@/lib/db';

export const dynamic = 'force-dynamic';

/** Liveness and database check: 200 {status:'ok', db:'ok'} or 503 {status:'degraded', db:'down'}. */
export async function GET() {
  try {
    await sequelize.query('SELECT 1');
    return Response.json({ status: 'ok', db: 'ok' });
  } catch {
    return Response.json({ status: 'degraded', db: 'down' }, { status: 503 });
  }
}
