// A worker process for jobs.test.ts: tsx --conditions=react-server tests/integration/jobs-test-worker.ts
// Works the `test-child` kind with the tests' handler against DATABASE_URL, the way
// scripts/worker.ts works the real kinds, so a test can kill it mid-job and start another.
import { closeDb } from '@/db/knex';
import { closeJobEvents } from '@/lib/jobs/listener';
import { startWorker } from '@/lib/jobs/worker';
import { CHILD_KIND, testHandler } from './jobs-test-handlers';

async function main(): Promise<void> {
  const worker = await startWorker({
    databaseUrl: process.env.DATABASE_URL!,
    handlers: { [CHILD_KIND]: async () => testHandler },
    pollingIntervalSeconds: 0.5,
    maintenanceIntervalSeconds: 1,
    shutdownGraceSeconds: 1,
    log: (line) => console.log(`[test-worker ${process.pid}] ${line}`),
  });
  const stop = async () => {
    await worker.stop();
    await closeJobEvents();
    await closeDb();
    process.exit(0);
  };
  process.on('SIGTERM', () => void stop());
  process.on('SIGINT', () => void stop());
  console.log('[worker] ready');
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
