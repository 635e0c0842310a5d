import 'server-only';
import { randomUUID } from 'node:crypto';
import PgBoss from 'pg-boss';
import { claimJob, failOrphanedJobs, finishJobDone, finishJobFailed, requeueJob, saveJobProgress } from '@/db/jobs';
import { ensureQueues, type Delivery } from './boss';
import { JobAbortError, PermanentJobError } from './errors';
import { subscribeJobEvents } from './listener';
import type { JobContext, JobHandler } from './registry';
import { QUEUE_SCHEMA, graceSeconds } from './settings';
import { MAX_PROGRESS_NOTE, type JobProgress } from './types';

/**
 * The worker loop: takes jobs from pg-boss and runs their handlers, keeping each job's row
 * (db/jobs.ts) up to date. Run by scripts/worker.ts (one process per machine, or more), and
 * in-process by the integration tests with handlers of their own.
 *
 * One attempt:
 *  1. claim the row (queued → running, under a fresh attempt token); a row that is finished
 *     or gone means a duplicate delivery, and nothing runs;
 *  2. run the handler with a progress reporter and an AbortSignal that fires when the budget
 *     is spent, the worker shuts down, or the attempt lost the row;
 *  3. record the outcome under the token: done with the result; failed for good (retries
 *     spent, budget spent, PermanentJobError); or queued again with the error (pg-boss retries
 *     it after a pause). Writes under a stale token change nothing, so whatever order two
 *     workers' writes arrive in, the row ends as one attempt left it.
 * A worker that dies mid-job leaves the delivery active; pg-boss expires it after the budget
 * plus grace and hands it to another worker, which claims the row again. The sweep fails rows
 * whose deliveries pg-boss gave up on, so no row stays running for ever.
 */

export interface WorkerOptions {
  databaseUrl: string;
  /** Kind → handler (lazy); every kind listed is worked. */
  handlers: Partial<Record<string, () => Promise<JobHandler>>>;
  /** Jobs of each kind this process runs at once. */
  concurrency?: number;
  /** How often an idle worker asks for jobs when no notification woke it, seconds (pg-boss's minimum is 0.5). */
  pollingIntervalSeconds?: number;
  /** How often pg-boss's maintenance runs (hands expired attempts to other workers), seconds. */
  maintenanceIntervalSeconds?: number;
  /** On stop: how long running jobs may go on before they are aborted, seconds. */
  shutdownGraceSeconds?: number;
  /** How often rows whose delivery ended without them are failed, seconds. */
  sweepIntervalSeconds?: number;
  log?: (line: string) => void;
}

export interface RunningWorker {
  /** Stops taking jobs, lets running ones finish within the grace, aborts the rest (they go back to the queue), closes pg-boss. */
  stop(): Promise<void>;
  /** Jobs running in this process now. */
  running(): string[];
}

const MAX_ERROR_CHARS = 2000;
const MAX_RESULT_BYTES = 4 * 1024 * 1024;

function messageOf(err: unknown): string {
  const m = err instanceof Error ? err.message : String(err);
  return (m || 'The job failed without saying why.').slice(0, MAX_ERROR_CHARS);
}

function cleanProgress(done: number, total: number, note?: string): JobProgress {
  const t = Number.isFinite(total) && total > 0 ? Math.floor(total) : 0;
  let d = Number.isFinite(done) && done > 0 ? Math.floor(done) : 0;
  if (t > 0) d = Math.min(d, t);
  return { done: d, total: t, note: (note ?? '').slice(0, MAX_PROGRESS_NOTE) };
}

/**
 * Progress writes for one attempt, coalesced: while one write is in flight, later reports
 * replace each other and only the newest is written next. A write refused because the attempt
 * lost the row calls `onLost`. Database errors are logged and not thrown: progress is advisory.
 */
function progressWriter(jobId: string, token: string, onLost: () => void, log: (l: string) => void) {
  let pending: JobProgress | null = null;
  let last: JobProgress | null = null;
  let writing: Promise<void> | null = null;
  const drain = async () => {
    try {
      while (pending) {
        const p = pending;
        pending = null;
        try {
          if (!(await saveJobProgress(jobId, token, p))) onLost();
          last = p;
        } catch (err) {
          log(`job ${jobId}: progress not saved: ${messageOf(err)}`);
        }
      }
    } finally {
      writing = null;
    }
  };
  return {
    report(done: number, total: number, note?: string): Promise<void> {
      pending = cleanProgress(done, total, note);
      writing ??= drain();
      return writing;
    },
    flush(): Promise<void> {
      return writing ?? Promise.resolve();
    },
    last: () => last,
  };
}

/** Resolves with the handler's outcome, or rejects with the abort reason once `graceMs` have passed since the signal fired. */
function settleWithin<T>(work: Promise<T>, signal: AbortSignal, graceMs: number): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    let timer: NodeJS.Timeout | null = null;
    const onAbort = () => {
      timer = setTimeout(() => reject(signal.reason), graceMs);
    };
    if (signal.aborted) onAbort();
    else signal.addEventListener('abort', onAbort, { once: true });
    work.then(
      (v) => {
        if (timer) clearTimeout(timer);
        signal.removeEventListener('abort', onAbort);
        resolve(v);
      },
      (e) => {
        if (timer) clearTimeout(timer);
        signal.removeEventListener('abort', onAbort);
        reject(e);
      },
    );
  });
}

function isDelivery(d: unknown): d is Delivery {
  const x = d as Partial<Delivery> | null;
  return Boolean(x && typeof x.jobId === 'string' && typeof x.budgetSeconds === 'number' && x.budgetSeconds > 0);
}

/** Starts working every kind in `opts.handlers`. Resolves once pg-boss has started and every kind is being worked. */
export async function startWorker(opts: WorkerOptions): Promise<RunningWorker> {
  const log = opts.log ?? ((line: string) => console.log(`[worker] ${line}`));
  const kinds = Object.keys(opts.handlers).filter((k) => opts.handlers[k]);
  if (kinds.length === 0) throw new Error('no job handlers to work');
  const concurrency = Math.max(1, Math.floor(opts.concurrency ?? 1));
  const boss = new PgBoss({
    connectionString: opts.databaseUrl,
    schema: QUEUE_SCHEMA,
    supervise: true,
    schedule: false,
    migrate: true,
    maintenanceIntervalSeconds: opts.maintenanceIntervalSeconds ?? 60,
    max: kinds.length * concurrency + 3,
    application_name: 'cellwright-worker',
  });
  boss.on('error', (err) => log(`queue error: ${messageOf(err)}`));
  await boss.start();
  await ensureQueues(boss, kinds);

  const loaded = new Map<string, Promise<JobHandler>>();
  const handlerOf = (kind: string): Promise<JobHandler> => {
    let p = loaded.get(kind);
    if (!p) {
      p = opts.handlers[kind]!();
      p.catch(() => loaded.delete(kind));
      loaded.set(kind, p);
    }
    return p;
  };

  const inFlight = new Map<string, { controller: AbortController; done: Promise<unknown> }>();
  let stopping = false;

  async function runAttempt(kind: string, delivery: PgBoss.JobWithMetadata<unknown>): Promise<unknown> {
    const data = delivery.data;
    if (!isDelivery(data)) {
      log(`${kind} delivery ${delivery.id} carries no job; dropped`);
      return { skipped: 'malformed delivery' };
    }
    const token = randomUUID();
    const claimed = await claimJob(data.jobId, token);
    if (!claimed) return { skipped: 'the job is finished or gone' };
    const { job, payload } = claimed;
    const budgetMs = data.budgetSeconds * 1000;
    const graceMs = graceSeconds(data.budgetSeconds) * 1000;
    const finalAttempt = delivery.retryCount >= delivery.retryLimit;
    const controller = new AbortController();
    const abort = (err: JobAbortError) => {
      if (!controller.signal.aborted) controller.abort(err);
    };
    const budgetTimer = setTimeout(() => abort(new JobAbortError('budget', `The job ran past its time budget of ${data.budgetSeconds} s.`)), budgetMs);
    const progress = progressWriter(job.id, token, () => abort(new JobAbortError('lost', 'Another worker took this job over.')), log);
    const ctx: JobContext = { jobId: job.id, signal: controller.signal, reportProgress: progress.report };
    log(`${kind} ${job.id} attempt ${job.attempts}${finalAttempt ? ' (last)' : ''} started`);
    const started = Date.now();

    const attempt = (async () => {
      try {
        const handler = await handlerOf(kind);
        if (stopping) throw new JobAbortError('shutdown', 'The worker stopped before this job started.');
        const result = await settleWithin(Promise.resolve().then(() => handler(payload, ctx)), controller.signal, graceMs);
        // A handler that returned after its signal fired finished its work all the same: keep it.
        const json = JSON.stringify(result ?? null);
        if (Buffer.byteLength(json, 'utf8') > MAX_RESULT_BYTES) throw new PermanentJobError(`The job's result is larger than ${MAX_RESULT_BYTES} bytes.`);
        await progress.flush();
        const last = progress.last();
        const closing = last && last.total > 0 ? { ...last, done: last.total } : undefined;
        if (await finishJobDone(job.id, token, JSON.parse(json), closing)) log(`${kind} ${job.id} done in ${Date.now() - started} ms`);
        else log(`${kind} ${job.id} finished, but another attempt holds the row; its result is dropped`);
        return { done: true };
      } catch (err) {
        await progress.flush();
        const why = err instanceof JobAbortError ? err.why : null;
        const message = messageOf(err);
        if (why === 'lost') {
          log(`${kind} ${job.id} stopped: ${message}`);
          return { lost: true };
        }
        const permanent = err instanceof PermanentJobError || why === 'budget';
        if (permanent || finalAttempt) {
          const text = why === 'shutdown' ? `${message} No attempts are left.` : message;
          await finishJobFailed(job.id, token, text);
          log(`${kind} ${job.id} failed for good: ${text}`);
          // A permanent failure is not retried: pg-boss marks the delivery completed, the row says failed.
          if (permanent) return { failed: text };
          throw err;
        }
        const retryNote = why === 'shutdown' ? message : `Attempt ${job.attempts} failed: ${message}`;
        await requeueJob(job.id, token, retryNote);
        log(`${kind} ${job.id} attempt ${job.attempts} failed, will be retried: ${message}`);
        throw err;
      } finally {
        clearTimeout(budgetTimer);
      }
    })();
    inFlight.set(job.id, { controller, done: attempt.catch(() => undefined) });
    try {
      return await attempt;
    } finally {
      inFlight.delete(job.id);
    }
  }

  const workerIds = new Map<string, string[]>();
  for (const kind of kinds) {
    const ids: string[] = [];
    for (let i = 0; i < concurrency; i++) {
      ids.push(
        await boss.work<unknown>(kind, { batchSize: 1, includeMetadata: true, pollingIntervalSeconds: opts.pollingIntervalSeconds ?? 2 }, async ([delivery]) => runAttempt(kind, delivery)),
      );
    }
    workerIds.set(kind, ids);
  }

  // A new job wakes this kind's idle loops at once instead of at their next poll.
  const unsubscribe = await subscribeJobEvents(opts.databaseUrl, {
    onEvent: (e) => {
      if (e.state !== 'queued' || stopping) return;
      for (const id of workerIds.get(e.kind) ?? []) boss.notifyWorker(id);
    },
    onResync: () => {
      for (const ids of workerIds.values()) for (const id of ids) boss.notifyWorker(id);
    },
  });

  const sweep = async () => {
    try {
      const failed = await failOrphanedJobs(QUEUE_SCHEMA);
      for (const id of failed) log(`job ${id} failed: its delivery ended without it (the worker running it stopped)`);
    } catch (err) {
      log(`sweep failed: ${messageOf(err)}`);
    }
  };
  const sweepTimer = setInterval(() => void sweep(), (opts.sweepIntervalSeconds ?? 30) * 1000);
  sweepTimer.unref();
  void sweep();

  log(`working ${kinds.map((k) => `${k} ×${concurrency}`).join(', ')}`);

  let stopped: Promise<void> | null = null;
  return {
    running: () => [...inFlight.keys()],
    stop() {
      stopped ??= (async () => {
        stopping = true;
        clearInterval(sweepTimer);
        unsubscribe();
        for (const kind of kinds) await boss.offWork(kind);
        const graceMs = (opts.shutdownGraceSeconds ?? 20) * 1000;
        const deadline = Date.now() + graceMs;
        while (inFlight.size > 0 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
        if (inFlight.size > 0) {
          log(`stopping: aborting ${inFlight.size} running job(s); they go back to the queue`);
          for (const { controller } of inFlight.values()) {
            if (!controller.signal.aborted) controller.abort(new JobAbortError('shutdown', 'The worker stopped during this job; another worker will run it again.'));
          }
          await Promise.all([...inFlight.values()].map((f) => f.done));
        }
        // pg-boss records the outcome of the last deliveries without awaiting it: give those writes a moment.
        await new Promise((r) => setTimeout(r, 200));
        await boss.stop({ graceful: true, wait: true, timeout: 2000 });
        log('stopped');
      })();
      return stopped;
    },
  };
}
