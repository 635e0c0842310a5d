import { databaseHealth } from '@/db/health';

export const dynamic = 'force-dynamic';

/** Public liveness: the app answers, and how the database answers. */
export async function GET(): Promise<Response> {
  const database = await databaseHealth();
  const ok = database.ok && database.pendingMigrations === 0;
  return Response.json(
    { status: ok ? 'ok' : 'degraded', app: { ok: true }, database },
    { status: ok ? 200 : 503, headers: { 'cache-control': 'no-store' } },
  );
}
