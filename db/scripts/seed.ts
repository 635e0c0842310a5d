// Usage: tsx db/scripts/seed.ts [--quiet]   Seeds the demo once; prints the demo sign-ins.
import knexFactory from 'knex';
import { knexConfig } from '../config';
import { DEMO_ACCOUNTS, seedDemo } from '../seeds/demo';
import { env } from '@/lib/env';

async function main(): Promise<void> {
  const knex = knexFactory(knexConfig(env().DATABASE_URL));
  try {
    const seeded = await seedDemo(knex);
    console.log(seeded ? 'demo data seeded' : 'demo data already present (left unchanged)');
    if (!process.argv.includes('--quiet')) {
      console.log('\nDemo sign-ins:');
      for (const a of DEMO_ACCOUNTS) console.log(`  ${a.role.padEnd(8)} ${a.email.padEnd(34)} ${a.password}`);
    }
  } finally {
    await knex.destroy();
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
