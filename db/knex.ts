import 'server-only';
import knexFactory from 'knex';
import type { Knex } from 'knex';
import { env } from '@/lib/env';
import { knexConfig } from './config';

const globalForKnex = globalThis as unknown as { cellwrightKnex?: Knex };

/** The one Knex instance, cached on globalThis so hot reloads do not open new pools. */
export function db(): Knex {
  globalForKnex.cellwrightKnex ??= knexFactory(knexConfig(env().DATABASE_URL));
  return globalForKnex.cellwrightKnex;
}

/** Close the pool (scripts and tests); the next db() call opens a new one. */
export async function closeDb(): Promise<void> {
  const k = globalForKnex.cellwrightKnex;
  globalForKnex.cellwrightKnex = undefined;
  if (k) await k.destroy();
}
