/** Every migration goes up and comes down cleanly, in a scratch schema of the test database. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Knex } from 'knex';
import { closeScratchSchema, openScratchSchema } from './scratch-schema';

const SCHEMA = 'migration_check';
const TABLES = ['users', 'cohorts', 'memberships', 'invitations', 'password_resets', 'sign_in_failures', 'audit_log', 'mail_messages', 'seed_markers'];
let knex: Knex;

async function tablesInSchema(): Promise<string[]> {
  const rows = await knex('information_schema.tables').where({ table_schema: SCHEMA }).select('table_name');
  return rows.map((r) => r.table_name as string).sort();
}

beforeAll(async () => {
  knex = await openScratchSchema(SCHEMA);
});

afterAll(() => closeScratchSchema(knex, SCHEMA));

describe('migrations', () => {
  it('go all the way up', async () => {
    await knex.migrate.latest();
    const [, pending] = await knex.migrate.list();
    expect(pending).toEqual([]);
    const tables = await tablesInSchema();
    for (const t of TABLES) expect(tables).toContain(t);
  });

  it('come all the way down, leaving only knex bookkeeping', async () => {
    await knex.migrate.rollback(undefined, true);
    expect(await tablesInSchema()).toEqual(['knex_migrations', 'knex_migrations_lock']);
  });

  it('go up again after coming down (down is a true inverse)', async () => {
    await knex.migrate.latest();
    expect((await tablesInSchema()).filter((t) => TABLES.includes(t)).sort()).toEqual([...TABLES].sort());
  });

  it('step down one at a time', async () => {
    const [done] = await knex.migrate.list();
    for (let i = done.length; i > 0; i--) {
      await knex.migrate.down();
      const [applied] = await knex.migrate.list();
      expect(applied).toHaveLength(i - 1);
    }
  });
});
