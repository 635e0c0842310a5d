import 'server-only';
import { db } from './knex';

/** Round-trip to PostgreSQL plus the migration state; never throws. */
export async function databaseHealth(): Promise<{ ok: boolean; latencyMs: number; pendingMigrations: number | null }> {
  const started = performance.now();
  try {
    await db().raw('select 1');
    const [, pending] = await db().migrate.list();
    return { ok: true, latencyMs: Math.round(performance.now() - started), pendingMigrations: pending.length };
  } catch {
    return { ok: false, latencyMs: Math.round(performance.now() - started), pendingMigrations: null };
  }
}
