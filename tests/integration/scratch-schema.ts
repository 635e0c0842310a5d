import knexFactory from 'knex';
import type { Knex } from 'knex';
import { knexConfig } from '@/db/config';
import { TEST_ENV } from './test-env';

/**
 * A Knex bound to an empty schema of its own in the test database, with its own migrations
 * table: migration tests run up and down there without touching the shared tables.
 */
export async function openScratchSchema(schema: string): Promise<Knex> {
  const admin = knexFactory(knexConfig(TEST_ENV.DATABASE_URL));
  await admin.raw(`drop schema if exists ${schema} cascade`);
  await admin.raw(`create schema ${schema}`);
  await admin.destroy();
  const base = knexConfig(TEST_ENV.DATABASE_URL);
  return knexFactory({ ...base, searchPath: [schema], migrations: { ...base.migrations, schemaName: schema } });
}

/** Drops the schema and closes the Knex that {@link openScratchSchema} gave. */
export async function closeScratchSchema(knex: Knex, schema: string): Promise<void> {
  await knex.raw(`drop schema if exists ${schema} cascade`);
  await knex.destroy();
}
