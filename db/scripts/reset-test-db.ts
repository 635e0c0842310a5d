// Empties a *_test database, migrates it and seeds the demo: a known state for Playwright.
import knexFactory from 'knex';
import { knexConfig } from '../config';
import { seedDemo } from '../seeds/demo';
import { env } from '@/lib/env';

async function main(): Promise<void> {
  const url = env().DATABASE_URL;
  const name = new URL(url).pathname.slice(1);
  if (!name.endsWith('_test')) throw new Error(`refusing to reset "${name}": only databases named *_test are reset`);
  const knex = knexFactory(knexConfig(url));
  try {
    await knex.raw('drop schema public cascade');
    await knex.raw('create schema public');
    await knex.migrate.latest();
    await seedDemo(knex);
    console.log(`reset ${name}: migrated and seeded`);
  } finally {
    await knex.destroy();
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
