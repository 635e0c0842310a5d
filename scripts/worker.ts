// The job worker: tsx --conditions=react-server scripts/worker.ts
// Runs every kind in lib/jobs/registry.ts (or WORKER_KINDS) against DATABASE_URL until SIGTERM
// or SIGINT. Start as many as you like, on as many machines: pg-boss hands each job to one.
// Prints "[worker] ready" once it takes jobs (Playwright and the integration tests wait for it).
import { z } from 'zod';
import { env } from '@/lib/env';
import { closeDb } from '@/db/knex';
import { JOB_HANDLERS } from '@/lib/jobs/registry';
import { closeJobEvents } from '@/lib/jobs/listener';
import { startWorker } from '@/lib/jobs/worker';
import type { JobHandler } from '@/lib/jobs/registry';

/** The worker's own settings (the app's are in lib/env.ts, which this process reads too). */
const workerEnvSchema = z.object({
  /** Jobs of each kind this process runs at once. */
  WORKER_CONCURRENCY: z.coerce.number().int().min(1).max(32).default(1),
  /** Kinds this process takes, comma-separated (all registered kinds when unset): lets a machine specialise. */
  WORKER_KINDS: z.string().optional(),
  /** Seconds between polls when no notification arrives (new jobs wake the worker at once). */
  WORKER_POLL_SECONDS: z.coerce.number().min(0.5).max(60).default(2),
  /** Seconds between pg-boss maintenance runs: how soon a dead worker's job goes to another. */
  WORKER_MAINTENANCE_SECONDS: z.coerce.number().int().min(1).max(3600).default(60),
  /** Seconds running jobs may go on after SIGTERM before they are aborted and handed back. */
  WORKER_SHUTDOWN_GRACE_SECONDS: z.coerce.number().min(0).max(600).default(20),
});

function log(line: string): void {
  console.log(`[worker] ${new Date().toISOString()} ${line}`);
}

async function main(): Promise<void> {
  const parsed = workerEnvSchema.safeParse(process.env);
  if (!parsed.success) throw new Error(`Invalid worker configuration: ${parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ')}`);
  const w = parsed.data;
  // The engine's threads (lib/runs/engine-host.ts): this process only replays whole logs, so
  // one live-run thread (which the host always starts) is plenty unless the operator says otherwise.
  process.env.ENGINE_THREADS ??= '1';
  const { DATABASE_URL } = env();

  const wanted = w.WORKER_KINDS ? w.WORKER_KINDS.split(',').map((k) => k.trim()).filter(Boolean) : Object.keys(JOB_HANDLERS);
  const handlers: Record<string, () => Promise<JobHandler>> = {};
  for (const kind of wanted) {
    const h = (JOB_HANDLERS as Record<string, (() => Promise<JobHandler>) | undefined>)[kind];
    if (!h) throw new Error(`WORKER_KINDS names "${kind}", which has no handler in lib/jobs/registry.ts`);
    handlers[kind] = h;
  }

  const worker = await startWorker({
    databaseUrl: DATABASE_URL,
    handlers,
    concurrency: w.WORKER_CONCURRENCY,
    pollingIntervalSeconds: w.WORKER_POLL_SECONDS,
    maintenanceIntervalSeconds: w.WORKER_MAINTENANCE_SECONDS,
    shutdownGraceSeconds: w.WORKER_SHUTDOWN_GRACE_SECONDS,
    log,
  });

  let stopping = false;
  const shutdown = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    log(`${signal}: stopping (running jobs get ${w.WORKER_SHUTDOWN_GRACE_SECONDS} s)`);
    try {
      await worker.stop();
      await closeJobEvents();
      await closeDb();
    } finally {
      process.exit(0);
    }
  };
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
  process.on('SIGINT', () => void shutdown('SIGINT'));
  console.log('[worker] ready');
}

main().catch((err) => {
  console.error(`[worker] ${err instanceof Error ? (err.stack ?? err.message) : String(err)}`);
  process.exit(1);
});
