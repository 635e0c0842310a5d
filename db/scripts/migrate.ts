// Usage: tsx db/scripts/migrate.ts latest|rollback|rollback-all|status   (DATABASE_URL selects the database)
import knexFactory from 'knex';
import { knexConfig } from '../config';
import { env } from '@/lib/env';

async function main(): Promise<void> {
  const command = process.argv[2] ?? 'latest';
  const knex = knexFactory(knexConfig(env().DATABASE_URL));
  try {
    if (command === 'latest') {
      const [batch, names] = await knex.migrate.latest();
      console.log(names.length ? `migrated (batch ${batch}): ${names.join(', ')}` : 'database already up to date');
    } else if (command === 'rollback' || command === 'rollback-all') {
      const [batch, names] = await knex.migrate.rollback(undefined, command === 'rollback-all');
      console.log(names.length ? `rolled back (batch ${batch}): ${names.join(', ')}` : 'nothing to roll back');
    } else if (command === 'status') {
      const [done, pending] = await knex.migrate.list();
      console.log(`applied: ${done.length}, pending: ${pending.length}`);
    } else {
      throw new Error(`unknown command ${command}`);
    }
  } finally {
    await knex.destroy();
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
