/**
 * The job routes with a real worker process: this file starts scripts/worker.ts (as start.sh
 * and Playwright do) for the `drill-regrade` kind; a trainer queues a regrade of the demo's
 * graded drill (POST /api/drills/[id]/regrade), the worker process runs it, and the progress
 * reaches GET /api/jobs/stream through LISTEN/NOTIFY; the report finds every stored grade
 * reproduced. Who may follow a subject's jobs, and who may read one.
 *
 * The worker is this file's own, not the global setup's: other suites queue jobs through their
 * routes and run the handlers in-process, which a shared background worker would race.
 */
import type { ChildProcess } from 'node:child_process';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { rmSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as stream from '@/app/api/jobs/stream/route';
import * as jobOne from '@/app/api/jobs/[id]/route';
import * as regradeRoute from '@/app/api/drills/[id]/regrade/route';
import { closeDb, db } from '@/db/knex';
import { listSubmittedRunsOfDrill } from '@/db/runs';
import { DEMO_CLOSED_DRILL } from '@/db/seeds/demo-runs';
import type { User } from '@/db/users';
import { closeSendingBoss } from '@/lib/jobs/boss';
import { closeJobEvents } from '@/lib/jobs/listener';
import { openJobStreams } from '@/lib/jobs/stream';
import type { JobEvent, JobRecord } from '@/lib/jobs/types';
import type { DrillRegradeReport } from '@/lib/drills/regrade-report';
import { BASE, call, demoUser, makeUser, sessionCookie } from './helpers';
import { sseReader, startWorkerProcess, stopWorkerProcess } from './jobs-helpers';

let trainer: User;
let admin: User;
let student: User;
let lead: User;
let otherTrainer: User;
let drillId: string;
let worker: ChildProcess;
// The worker's own engine bundle: this process may rebuild the shared one while the worker loads it.
const WORKER_BUNDLE = path.join(tmpdir(), `cellwright-engine-worker-it-${process.pid}.mjs`);

/** The route takes no params; Next.js passes a context all the same. */
const NO_PARAMS = { params: Promise.resolve({}) };

function streamRequest(subject: string, cookie: string | undefined, signal?: AbortSignal): Request {
  return new Request(`${BASE}/api/jobs/stream?subject=${encodeURIComponent(subject)}`, { headers: cookie ? { cookie } : {}, signal });
}

beforeAll(async () => {
  trainer = await demoUser('trainer@kestrelvale.test');
  admin = await demoUser('admin@kestrelvale.test');
  student = await demoUser('ada.lindqvist@kestrelvale.test');
  lead = await demoUser('lead@brennick.test');
  otherTrainer = await makeUser('trainer');
  const row = await db()('drills').where({ trainer_id: trainer.id, library_key: DEMO_CLOSED_DRILL }).first('id');
  drillId = row.id;
  worker = await startWorkerProcess('scripts/worker.ts', {
    WORKER_KINDS: 'drill-regrade',
    WORKER_POLL_SECONDS: '0.5',
    WORKER_SHUTDOWN_GRACE_SECONDS: '2',
    ENGINE_WORKER_FILE: WORKER_BUNDLE,
  });
}, 90_000);

afterAll(async () => {
  if (worker) await stopWorkerProcess(worker);
  rmSync(WORKER_BUNDLE, { force: true });
  await closeJobEvents();
  await closeSendingBoss();
  await closeDb();
});

describe('drill regrade through the worker process, followed on the stream', () => {
  it("streams the regrade's progress to the drill's trainer and reports every demo run matched", async () => {
    const runs = await listSubmittedRunsOfDrill(drillId);
    expect(runs.length).toBeGreaterThanOrEqual(2);
    const storedBefore = runs.map((r) => ({ id: r.id, grade: r.grade, traceHash: r.traceHash }));

    const cookie = await sessionCookie(trainer);
    const abort = new AbortController();
    const res = await stream.GET(streamRequest(`drill:${drillId}`, cookie, abort.signal), NO_PARAMS);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/event-stream/);
    expect(res.headers.get('cache-control')).toMatch(/no-transform/);
    const sse = sseReader(res.body!);
    const first = await sse.next();
    expect(first.event).toBe('snapshot');
    expect(Array.isArray(first.data)).toBe(true);
    expect(openJobStreams()).toBe(1);

    const queued = await call(regradeRoute.POST, `/api/drills/${drillId}/regrade`, { method: 'POST', cookie, params: { id: drillId } });
    expect(queued.status).toBe(201);
    const job = (queued.body as { job: JobRecord; created: boolean }).job;
    expect(job).toMatchObject({ kind: 'drill-regrade', subject: `drill:${drillId}`, state: 'queued', ownerId: trainer.id });

    // A second request while it is open answers the same job.
    const again = await call(regradeRoute.POST, `/api/drills/${drillId}/regrade`, { method: 'POST', cookie, params: { id: drillId } });
    if (again.status === 200) expect((again.body as { job: JobRecord; created: boolean })).toMatchObject({ created: false, job: { id: job.id } });
    else expect(again.status).toBe(201); // the worker had already finished it

    const messages = await sse.until((m) => m.event === 'job' && (m.data as JobEvent).id === job.id && (m.data as JobEvent).state === 'done', 60_000);
    const events = messages.filter((m) => m.event === 'job').map((m) => m.data as JobEvent).filter((e) => e.id === job.id);
    expect(events[0].state).toBe('queued');
    expect(events.some((e) => e.state === 'running')).toBe(true);
    const versions = events.map((e) => e.version);
    expect(versions).toEqual([...versions].sort((a, b) => a - b));
    const progress = events.filter((e) => e.progress.total > 0).map((e) => e.progress.done);
    expect(progress.at(-1)).toBe(runs.length);
    expect(events.at(-1)!.progress).toMatchObject({ done: runs.length, total: runs.length });

    abort.abort();
    await sse.cancel();
    await expect.poll(() => openJobStreams()).toBe(0);

    const read = await call(jobOne.GET, `/api/jobs/${job.id}`, { cookie, params: { id: job.id } });
    expect(read.status).toBe(200);
    const done = (read.body as { job: JobRecord }).job;
    expect(done).toMatchObject({ state: 'done', attempts: 1, error: null });
    const report = done.result as DrillRegradeReport;
    expect(report).toMatchObject({ drillId, runs: runs.length, matched: runs.length, differed: [], failed: [] });

    // A regrade checks, it never writes: the stored grades are as they were.
    const after = (await listSubmittedRunsOfDrill(drillId)).map((r) => ({ id: r.id, grade: r.grade, traceHash: r.traceHash }));
    expect(after).toEqual(storedBefore);
  }, 90_000);

  it('a regrade that finds a different stored grade reports it and leaves the stored grade alone', async () => {
    const [run] = await listSubmittedRunsOfDrill(drillId);
    await db()('runs').where({ id: run.id }).update({ grade: (run.grade ?? 0) + 1 });
    try {
      const cookie = await sessionCookie(admin);
      const queued = await call(regradeRoute.POST, `/api/drills/${drillId}/regrade`, { method: 'POST', cookie, params: { id: drillId } });
      expect([200, 201]).toContain(queued.status);
      const id = (queued.body as { job: JobRecord }).job.id;
      let job: JobRecord | null = null;
      for (let i = 0; i < 300 && job?.state !== 'done'; i++) {
        const r = await call(jobOne.GET, `/api/jobs/${id}`, { cookie, params: { id } });
        job = (r.body as { job: JobRecord }).job;
        if (job.state === 'failed') throw new Error(job.error ?? 'failed');
        await new Promise((r2) => setTimeout(r2, 100));
      }
      const report = job!.result as DrillRegradeReport;
      expect(report.differed).toEqual([
        expect.objectContaining({ runId: run.id, stored: { grade: (run.grade ?? 0) + 1, traceHash: run.traceHash }, now: { grade: run.grade, traceHash: run.traceHash }, breakdownChanged: false }),
      ]);
      expect(report.matched).toBe(report.runs - 1);
      expect((await db()('runs').where({ id: run.id }).first('grade')).grade).toBe((run.grade ?? 0) + 1);
    } finally {
      await db()('runs').where({ id: run.id }).update({ grade: run.grade });
    }
  }, 60_000);
});

describe('who may follow and read jobs', () => {
  it('the stream answers 401 without a session, 403 to a role that never reads drills, 404 to another trainer', async () => {
    const subject = `drill:${drillId}`;
    expect((await stream.GET(streamRequest(subject, undefined), NO_PARAMS)).status).toBe(401);
    expect((await stream.GET(streamRequest(subject, await sessionCookie(student)), NO_PARAMS)).status).toBe(403);
    expect((await stream.GET(streamRequest(subject, await sessionCookie(lead)), NO_PARAMS)).status).toBe(403);
    expect((await stream.GET(streamRequest(subject, await sessionCookie(otherTrainer)), NO_PARAMS)).status).toBe(404);
    const trainerCookie = await sessionCookie(trainer);
    // A malformed subject is a bad query; a well-formed one nobody knows is not found.
    expect((await stream.GET(streamRequest('drill:not-a-uuid', trainerCookie), NO_PARAMS)).status).toBe(400);
    expect((await stream.GET(streamRequest(`drill:${crypto.randomUUID()}`, trainerCookie), NO_PARAMS)).status).toBe(404);
    expect((await stream.GET(streamRequest(`cell:${drillId}`, trainerCookie), NO_PARAMS)).status).toBe(404);
    expect(openJobStreams()).toBe(0);
  });

  it("a job is read by its subject's readers only; to anyone else it does not exist", async () => {
    const [job] = (await db()('jobs').where({ subject: `drill:${drillId}` }).orderBy('created_at', 'desc').limit(1).select('id')) as { id: string }[];
    const read = async (u: User | null) => (await call(jobOne.GET, `/api/jobs/${job.id}`, { cookie: u ? await sessionCookie(u) : undefined, params: { id: job.id } })).status;
    expect(await read(null)).toBe(401);
    expect(await read(trainer)).toBe(200);
    expect(await read(admin)).toBe(200);
    expect(await read(student)).toBe(404);
    expect(await read(lead)).toBe(404);
    expect(await read(otherTrainer)).toBe(404);
    expect((await call(jobOne.GET, '/api/jobs/nope', { cookie: await sessionCookie(trainer), params: { id: 'nope' } })).status).toBe(404);
  });
});
