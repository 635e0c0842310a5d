// Empties a *_test database, migrates it and seeds the demo: a known state for Playwright.
import { resetTestDatabase } from '../reset-test-database';
import { env } from '@/lib/env';

async function main(): Promise<void> {
  const name = await resetTestDatabase(env().DATABASE_URL);
  console.log(`reset ${name}: migrated and seeded`);
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
