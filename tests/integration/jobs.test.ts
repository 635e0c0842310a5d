/**
 * The job queue against the real PostgreSQL: enqueue → a worker runs it → the row is done;
 * progress reaches LISTEN in order; failures, retries and budgets; a worker killed mid-job and
 * one stopped with SIGTERM; the sweep of rows pg-boss gave up on; the LISTEN connection's
 * reconnect. The machinery runs with the tests' own job kinds (jobs-test-handlers.ts), in this
 * process or in a child process the test can kill; the real worker process (scripts/worker.ts)
 * with the real kinds is in jobs-routes.test.ts.
 */
import type { ChildProcess } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/db/knex';
import { failOrphanedJobs } from '@/db/jobs';
import { closeSendingBoss, ensureQueues, sendingBoss } from '@/lib/jobs/boss';
import { breakJobEventsConnection, closeJobEvents, jobEventsListening, subscribeJobEvents } from '@/lib/jobs/listener';
import { enqueueJob, getJob, listJobs, type EnqueueOverrides } from '@/lib/jobs/queue';
import { QUEUE_SCHEMA } from '@/lib/jobs/settings';
import type { JobEvent, JobKind } from '@/lib/jobs/types';
import { startWorker, type RunningWorker } from '@/lib/jobs/worker';
import type { User } from '@/db/users';
import { demoUser } from './helpers';
import { CHILD_KIND, IN_PROCESS_KIND, testHandler, type TestPayload } from './jobs-test-handlers';
import { startWorkerProcess, stopWorkerProcess, waitForJob, waitForJobWhere } from './jobs-helpers';
import { TEST_ENV } from './test-env';

const URL_ = TEST_ENV.DATABASE_URL;
let owner: User;
const workers: RunningWorker[] = [];
const children: ChildProcess[] = [];

function quietLog(): (line: string) => void {
  return process.env.TEST_WORKER_LOG ? (l) => console.log(`[in-process worker] ${l}`) : () => undefined;
}

async function inProcessWorker(opts: { shutdownGraceSeconds?: number } = {}): Promise<RunningWorker> {
  const w = await startWorker({
    databaseUrl: URL_,
    handlers: { [IN_PROCESS_KIND]: async () => testHandler },
    pollingIntervalSeconds: 0.5,
    maintenanceIntervalSeconds: 1,
    shutdownGraceSeconds: opts.shutdownGraceSeconds ?? 2,
    log: quietLog(),
  });
  workers.push(w);
  return w;
}

function enqueueTest(kind: string, payload: TestPayload, overrides: EnqueueOverrides = {}) {
  return enqueueJob({ kind: kind as JobKind, payload, ownerId: owner.id, subject: `drill:${randomUUID()}` }, overrides);
}

/** A worker process (jobs-test-worker.ts), ready to take `test-child` jobs; killed after the test. */
async function childWorker(): Promise<ChildProcess> {
  const child = await startWorkerProcess('tests/integration/jobs-test-worker.ts');
  children.push(child);
  return child;
}

beforeAll(async () => {
  owner = await demoUser('trainer@kestrelvale.test');
  await ensureQueues(await sendingBoss(URL_), [IN_PROCESS_KIND, CHILD_KIND]);
});

afterEach(async () => {
  while (workers.length) await workers.pop()!.stop();
  while (children.length) await stopWorkerProcess(children.pop()!, 'SIGKILL');
});

afterAll(async () => {
  await closeJobEvents();
  await closeSendingBoss();
  await closeDb();
});

describe('enqueue and run', () => {
  it('a queued job is run by a worker and its row ends done with the result', async () => {
    await inProcessWorker();
    const job = await enqueueTest(IN_PROCESS_KIND, { steps: 2, echo: { hello: 'cell' } });
    expect(job).toMatchObject({ state: 'queued', attempts: 0, progress: { done: 0, total: 0, note: '' }, result: null, error: null, ownerId: owner.id });
    const done = await waitForJob(job.id);
    expect(done).toMatchObject({ state: 'done', attempts: 1, result: { echo: { hello: 'cell' }, steps: 2 }, error: null, progress: { done: 2, total: 2 } });
    expect(done.startedAt).not.toBeNull();
    expect(Date.parse(done.finishedAt!)).toBeGreaterThanOrEqual(Date.parse(done.startedAt!));
    expect((await listJobs(job.subject)).map((j) => j.id)).toEqual([job.id]);
  });

  it('a job row and its delivery are written together: when either is refused, neither is kept', async () => {
    const count = async () => Number((await db()('jobs').count<{ n: string }[]>({ n: '*' }))[0].n);
    const before = await count();
    await expect(enqueueTest(IN_PROCESS_KIND, { echo: 'x'.repeat(70_000) })).rejects.toThrow(/at most/);
    await expect(enqueueJob({ kind: 'drill-regrade', payload: {}, ownerId: owner.id, subject: 'not a subject' })).rejects.toThrow();
    // pg-boss refuses a kind without a queue: the row inserted before it is rolled back.
    await expect(enqueueTest('test-nobody-works', {})).rejects.toThrow(/did not take job/);
    expect(await count()).toBe(before);
    // Row and delivery share their id.
    const job = await enqueueTest(IN_PROCESS_KIND, {});
    expect(await db()(`${QUEUE_SCHEMA}.job`).where({ id: job.id }).first('name')).toEqual({ name: IN_PROCESS_KIND });
  });

  it('progress events arrive through LISTEN/NOTIFY in order, ending with done', async () => {
    const events: JobEvent[] = [];
    const unsubscribe = await subscribeJobEvents(URL_, { onEvent: (e) => events.push(e) });
    try {
      await inProcessWorker();
      const job = await enqueueTest(IN_PROCESS_KIND, { steps: 5, stepMs: 30 });
      await waitForJob(job.id);
      await waitForJobWhere(job.id, () => events.some((e) => e.id === job.id && e.state === 'done'), 5000);
      const mine = events.filter((e) => e.id === job.id);
      expect(mine[0]).toMatchObject({ state: 'queued', subject: job.subject, kind: IN_PROCESS_KIND });
      expect(mine.at(-1)).toMatchObject({ state: 'done', progress: { done: 5, total: 5 } });
      // Versions strictly grow: events arrive in the order the row changed.
      const versions = mine.map((e) => e.version);
      expect(versions).toEqual([...versions].sort((a, b) => a - b));
      expect(new Set(versions).size).toBe(versions.length);
      const dones = mine.filter((e) => e.state === 'running').map((e) => e.progress.done);
      expect(dones).toEqual([...dones].sort((a, b) => a - b));
      expect(dones.at(-1)).toBe(5);
    } finally {
      unsubscribe();
    }
  });
});

describe('several workers', () => {
  it('share the queue: every job runs once, on one of them', async () => {
    const logs: string[] = [];
    for (const name of ['A', 'B']) {
      workers.push(
        await startWorker({
          databaseUrl: URL_,
          handlers: { [IN_PROCESS_KIND]: async () => testHandler },
          concurrency: 2,
          pollingIntervalSeconds: 0.5,
          log: (l) => logs.push(`${name} ${l}`),
        }),
      );
    }
    const jobs = await Promise.all(Array.from({ length: 8 }, (_, i) => enqueueTest(IN_PROCESS_KIND, { steps: 3, stepMs: 40, echo: i })));
    const done = await Promise.all(jobs.map((j) => waitForJob(j.id, ['done'])));
    expect(done.map((j) => j.attempts)).toEqual(Array(8).fill(1));
    expect(done.map((j) => (j.result as { echo: number }).echo)).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
    for (const j of jobs) expect(logs.filter((l) => l.includes(`${j.id} attempt`))).toHaveLength(1);
    // Both took part (each runs two at once, and eight jobs of ~120 ms arrive together).
    expect(new Set(logs.filter((l) => / attempt 1 started/.test(l)).map((l) => l[0])).size).toBe(2);
  });
});

describe('failures', () => {
  it('a failing handler is retried a bounded number of times, then ends failed with its error', async () => {
    await inProcessWorker();
    const job = await enqueueTest(IN_PROCESS_KIND, { fail: 'always', message: 'the cell would not load' }, { retryLimit: 2, retryDelaySeconds: 0 });
    const seen = await waitForJobWhere(job.id, (j) => j.state === 'queued' && j.attempts >= 1, 10_000);
    expect(seen.error).toMatch(/Attempt 1 failed: the cell would not load/);
    const failed = await waitForJob(job.id, ['failed'], 30_000);
    expect(failed.attempts).toBe(3);
    expect(failed.error).toBe('the cell would not load');
    expect(failed.finishedAt).not.toBeNull();
    // Nothing more happens: pg-boss holds no live delivery.
    await new Promise((r) => setTimeout(r, 2500));
    expect((await getJob(job.id))!.attempts).toBe(3);
    const delivery = await db()(`${QUEUE_SCHEMA}.job`).where({ id: job.id }).first('state');
    expect(delivery.state).toBe('failed');
  }, 45_000);

  it('a PermanentJobError fails the job at once, without retries', async () => {
    await inProcessWorker();
    const job = await enqueueTest(IN_PROCESS_KIND, { fail: 'permanent', message: 'the drill is gone' }, { retryLimit: 3, retryDelaySeconds: 0 });
    const failed = await waitForJob(job.id);
    expect(failed).toMatchObject({ state: 'failed', attempts: 1, error: 'the drill is gone' });
  });

  it('a handler past its budget sees its signal abort and the job fails, not retried', async () => {
    await inProcessWorker();
    const job = await enqueueTest(IN_PROCESS_KIND, { waitForAbort: true }, { budgetSeconds: 1, retryLimit: 2 });
    const failed = await waitForJob(job.id, ['failed'], 10_000);
    expect(failed.attempts).toBe(1);
    expect(failed.error).toMatch(/time budget of 1 s/);
  });
});

describe('restarts', () => {
  it('a job survives its worker process being killed mid-job: another worker finishes it', async () => {
    const first = await childWorker();
    const job = await enqueueTest(CHILD_KIND, { steps: 12, stepMs: 250, echo: 'survivor' }, { budgetSeconds: 5, retryLimit: 2 });
    await waitForJobWhere(job.id, (j) => j.state === 'running' && j.progress.done >= 2, 15_000);
    await stopWorkerProcess(first, 'SIGKILL');
    const stranded = await getJob(job.id);
    expect(stranded).toMatchObject({ state: 'running', attempts: 1 });
    expect(stranded!.progress.done).toBeLessThan(12);

    await childWorker();
    const done = await waitForJob(job.id, ['done'], 40_000);
    expect(done.attempts).toBe(2);
    expect(done.result).toEqual({ echo: 'survivor', steps: 12 });
  }, 60_000);

  it('SIGTERM hands a running job back: the next worker runs it again and the row says why it waited', async () => {
    const first = await childWorker();
    const job = await enqueueTest(CHILD_KIND, { steps: 20, stepMs: 200 }, { budgetSeconds: 30, retryLimit: 2, retryDelaySeconds: 0 });
    await waitForJobWhere(job.id, (j) => j.state === 'running' && j.progress.done >= 1, 15_000);
    await stopWorkerProcess(first, 'SIGTERM');
    const back = await getJob(job.id);
    expect(back).toMatchObject({ state: 'queued', attempts: 1 });
    expect(back!.error).toMatch(/worker stopped during this job/);

    await childWorker();
    const done = await waitForJob(job.id, ['done'], 30_000);
    expect(done).toMatchObject({ attempts: 2, error: null, progress: { done: 20, total: 20 } });
  }, 60_000);

  it('the sweep fails a row whose delivery pg-boss gave up on', async () => {
    const job = await enqueueTest(IN_PROCESS_KIND, {});
    // As if the last attempt's worker died and pg-boss failed the delivery after its retries.
    await db()(`${QUEUE_SCHEMA}.job`).where({ id: job.id }).update({ state: 'failed' });
    await db()('jobs').where({ id: job.id }).update({ state: 'running', attempts: 3 });
    await db().raw(`alter table jobs disable trigger jobs_touch`);
    try {
      await db()('jobs').where({ id: job.id }).update({ updated_at: db().raw(`now() - interval '1 minute'`) });
    } finally {
      await db().raw(`alter table jobs enable trigger jobs_touch`);
    }
    const failed = await failOrphanedJobs(QUEUE_SCHEMA);
    expect(failed).toContain(job.id);
    expect(await getJob(job.id)).toMatchObject({ state: 'failed', error: expect.stringMatching(/no attempts are left/) });
    // A row with a live delivery is left alone.
    const live = await enqueueTest(IN_PROCESS_KIND, {});
    expect(await failOrphanedJobs(QUEUE_SCHEMA, 0)).not.toContain(live.id);
  });
});

describe('the LISTEN connection', () => {
  it('reconnects after it breaks, tells subscribers to resynchronise, and hears later changes', async () => {
    const events: JobEvent[] = [];
    let resyncs = 0;
    const unsubscribe = await subscribeJobEvents(URL_, { onEvent: (e) => events.push(e), onResync: () => (resyncs += 1) });
    try {
      expect(jobEventsListening()).toBe(true);
      breakJobEventsConnection();
      const until = Date.now() + 10_000;
      while ((resyncs === 0 || !jobEventsListening()) && Date.now() < until) await new Promise((r) => setTimeout(r, 50));
      expect(resyncs).toBe(1);
      const job = await enqueueTest(IN_PROCESS_KIND, {});
      const heardBy = Date.now() + 5000;
      while (!events.some((e) => e.id === job.id) && Date.now() < heardBy) await new Promise((r) => setTimeout(r, 50));
      expect(events.find((e) => e.id === job.id)).toMatchObject({ state: 'queued' });
    } finally {
      unsubscribe();
    }
  });
});
