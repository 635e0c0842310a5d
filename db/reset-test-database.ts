import knexFactory from 'knex';
import { knexConfig } from './config';
import { seedDemo } from './seeds/demo';

/**
 * Empties a *_test database, migrates it and seeds the demo: the known state the integration
 * tests (tests/integration/global-setup.ts) and the browser tests (db/scripts/reset-test-db.ts)
 * start from. Refuses any other database, so demo or real data is never dropped. Not
 * `server-only`: it runs from scripts and test setup, outside Next.js. Returns the database name.
 */
export async function resetTestDatabase(url: string): Promise<string> {
  const name = new URL(url).pathname.slice(1);
  if (!name.endsWith('_test')) throw new Error(`refusing to reset "${name}": only databases named *_test are reset`);
  const knex = knexFactory(knexConfig(url));
  try {
    await knex.raw('drop schema public cascade');
    // The job queue's deliveries (pg-boss, lib/jobs/boss.ts) live beside public; the first process to use the queue installs it again.
    await knex.raw('drop schema if exists pgboss cascade');
    await knex.raw('create schema public');
    await knex.migrate.latest();
    await seedDemo(knex);
  } finally {
    await knex.destroy();
  }
  return name;
}
