import type { Knex } from 'knex';
import { migrationSource } from './migrations';

/**
 * Knex configuration shared by the app, the CLI scripts and the tests.
 * Migrations are listed statically (db/migrations/index.ts) so the same list
 * loads under Next.js, tsx and vitest without a file-system loader.
 */
export function knexConfig(databaseUrl: string): Knex.Config {
  return {
    client: 'pg',
    connection: databaseUrl,
    pool: { min: 0, max: 10 },
    migrations: { migrationSource, tableName: 'knex_migrations' },
  };
}
