/**
 * Runs: batches stored once per idempotency key, nothing lost across a "server restart",
 * server-side grading that every stored run's regrade reproduces, sanitised views, replay
 * access, free practice, the gradebook with overrides in the audit log, and the seeded library.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as startRun from '@/app/api/assignments/[id]/run/route';
import * as runs from '@/app/api/runs/route';
import * as runOne from '@/app/api/runs/[id]/route';
import * as batches from '@/app/api/runs/[id]/batches/route';
import * as view from '@/app/api/runs/[id]/view/route';
import * as submitRoute from '@/app/api/runs/[id]/submit/route';
import * as eventsRoute from '@/app/api/runs/[id]/events/route';
import * as traceRoute from '@/app/api/runs/[id]/trace/route';
import * as override from '@/app/api/runs/[id]/override/route';
import * as gradebook from '@/app/api/gradebook/route';
import * as gradebookCsv from '@/app/api/gradebook/csv/route';
import { closeDb, db } from '@/db/knex';
import type { User } from '@/db/users';
import { createRun, findRun, listDrillRunsOfUser, listSubmittedRuns, pagePracticeRunsOfUser } from '@/db/runs';
import { listDrills } from '@/db/drills';
import { peekLive } from '@/lib/runs/engine-host';
import { regrade, restartEngine, uncachedSnapshot } from '@/lib/runs/service';
import { sanitiseSnapshot } from '@/lib/runs/sanitise';
import { DRILL_LIBRARY } from '@/lib/drills/library';
import { BATCH_LIMITS } from '@/lib/schemas/runs';
import { call, demoCohortId, demoUser, makeUser, sessionCookie } from './helpers';
import { drillWorld, expectNoSecrets, type DrillWorld } from './drills-fixtures';

let trainer: User;
let trainerCookie: string;
let world: DrillWorld;

beforeAll(async () => {
  trainer = await demoUser('trainer@kestrelvale.test');
  trainerCookie = await sessionCookie(trainer);
  world = await drillWorld(trainer, 3);
});
afterAll(async () => {
  await restartEngine();
  await closeDb();
});

let keyN = 0;
const key = () => `k-${Date.now().toString(36)}-${++keyN}`;

async function start(student: User, assignmentId = world.assignmentId) {
  const res = await call(startRun.POST, `/api/assignments/${assignmentId}/run`, { method: 'POST', cookie: await sessionCookie(student), params: { id: assignmentId } });
  return res as { status: number; body: { run: { id: string }; resumed: boolean; error?: string } };
}

async function post(student: User, runId: string, body: unknown) {
  return call(batches.POST, `/api/runs/${runId}/batches`, { method: 'POST', cookie: await sessionCookie(student), params: { id: runId }, body });
}

const batchCount = async (runId: string) => Number((await db()('run_batches').where({ run_id: runId }).count<{ n: string }[]>({ n: '*' }).first())?.n ?? 0);

const LOG = [
  { seq: 1, untilMs: 2500, events: [{ t: 2000, event: { type: 'set-field', device: 'part', active: true } }] },
  { seq: 2, untilMs: 4000, events: [{ t: 2600, event: { type: 'press', device: 'start' } }, { t: 2700, event: { type: 'release', device: 'start' } }] },
  { seq: 3, untilMs: 12_000, events: [{ t: 9000, event: { type: 'press', device: 'stop' } }, { t: 9100, event: { type: 'release', device: 'stop' } }] },
];

describe('starting and resuming', () => {
  it('starts one run per assignment; starting again resumes the same run', async () => {
    const s = world.students[0];
    const a = await start(s);
    expect(a.status).toBe(201);
    const b = await start(s);
    expect(b.status).toBe(200);
    expect(b.body.run.id).toBe(a.body.run.id);
    expect(b.body.resumed).toBe(true);
  });

  it('refuses to start before the drill opens (403)', async () => {
    const w = await drillWorld(trainer, 1, { opensAt: new Date(Date.now() + 3_600_000), closesAt: new Date(Date.now() + 7_200_000) });
    expect((await start(w.students[0], w.assignmentId)).status).toBe(403);
  });
});

describe('batches', () => {
  it('a repeated idempotency key stores one batch and answers as the first time', async () => {
    const s = world.students[0];
    const runId = (await start(s)).body.run.id;
    const k = key();
    const first = await post(s, runId, { key: k, ...LOG[0] });
    expect(first.status, JSON.stringify(first.body)).toBe(201);
    for (let i = 0; i < 3; i++) {
      const again = await post(s, runId, { key: k, ...LOG[0] });
      expect(again.status).toBe(200);
      expect(again.body).toMatchObject({ seq: 1, untilMs: 2500, duplicate: true });
    }
    // Concurrent retries of the next batch: still exactly one row.
    const k2 = key();
    const all = await Promise.all([0, 1, 2, 3].map(() => post(s, runId, { key: k2, ...LOG[1] })));
    expect(all.map((r) => r.status).sort()).toEqual([200, 200, 200, 201]);
    expect(await batchCount(runId)).toBe(2);
  });

  it('a gap in seq is a 409 naming the expected seq; a bad event is a 422; nothing is stored', async () => {
    const s = world.students[1];
    const runId = (await start(s)).body.run.id;
    const gap = await post(s, runId, { key: key(), ...LOG[1] });
    expect(gap.status).toBe(409);
    expect((gap.body as { fields: { seq: string[] } }).fields.seq[0]).toContain('1');
    const unknownDevice = await post(s, runId, { key: key(), seq: 1, untilMs: 100, events: [{ t: 50, event: { type: 'press', device: 'noSuchButton' } }] });
    expect(unknownDevice.status).toBe(422);
    const clearing = await post(s, runId, { key: key(), seq: 1, untilMs: 100, events: [{ t: 50, event: { type: 'clear-fault', id: 'hiddenStopBreak' } }] });
    expect(clearing.status).toBe(422);
    const forcing = await post(s, runId, { key: key(), seq: 1, untilMs: 100, events: [{ t: 50, event: { type: 'force', target: '%IX0.1', value: 1 } }] });
    expect(forcing.status).toBe(422);
    const pastLimit = await post(s, runId, { key: key(), seq: 1, untilMs: 700_000, events: [] });
    expect(pastLimit.status).toBe(422);
    expect(await batchCount(runId)).toBe(0);
  });

  it('someone else\'s run: 404 for another student, and nothing stored', async () => {
    const owner = world.students[0];
    const runId = (await start(owner)).body.run.id;
    const before = await batchCount(runId);
    const res = await post(world.students[2], runId, { key: key(), seq: before + 1, untilMs: 50_000, events: [] });
    expect(res.status).toBe(404);
    const byTrainer = await post(trainer, runId, { key: key(), seq: before + 1, untilMs: 50_000, events: [] });
    expect(byTrainer.status).toBe(404);
    expect(await batchCount(runId)).toBe(before);
  });

  it('a server restart between batches loses nothing: the rebuilt snapshot equals the uncached one', async () => {
    const s = world.students[0];
    const runId = (await start(s)).body.run.id;
    const have = await batchCount(runId);
    expect(have).toBe(2);
    // Restart: drop the live cells and the database pool.
    await restartEngine();
    await closeDb();
    const third = await post(s, runId, { key: key(), ...LOG[2] });
    expect(third.status, JSON.stringify(third.body)).toBe(201);
    const cached = (await peekLive(runId))!.snapshot;
    await restartEngine();
    await closeDb();
    const run = (await findRun(runId))!;
    const reference = await uncachedSnapshot(run);
    expect(cached).toEqual(reference);
    const v = await call(view.GET, `/api/runs/${runId}/view`, { cookie: await sessionCookie(s), params: { id: runId } });
    expect(v.status).toBe(200);
    expect((v.body as { snapshot: unknown }).snapshot).toEqual(sanitiseSnapshot(reference));
    // The hidden stop-wire break (at 3 s) shows as a symptom: the NC stop input reads off.
    expect((v.body as { snapshot: { wires: { id: string; reading: string }[] } }).snapshot.wires.find((w) => w.id === 'w-stop')!.reading).toBe('off');
  });

  it('the view a student receives has no hidden fault, at any time', async () => {
    const s = world.students[0];
    const runId = (await start(s)).body.run.id;
    for (const t of [0, 5000, 20_000]) {
      const v = await call(view.GET, `/api/runs/${runId}/view?t=${t}`, { cookie: await sessionCookie(s), params: { id: runId } });
      expect(v.status).toBe(200);
      expectNoSecrets(v.body, (text, needle) => expect(text, needle).not.toContain(needle));
    }
  });

  it('an event before the time a view reached is applied at its own time (the log, not the cache, decides)', async () => {
    const s = world.students[2];
    const runId = (await start(s)).body.run.id;
    await call(view.GET, `/api/runs/${runId}/view?t=30000`, { cookie: await sessionCookie(s), params: { id: runId } });
    const res = await post(s, runId, { key: key(), seq: 1, untilMs: 3000, events: [{ t: 1000, event: { type: 'set-field', device: 'part', active: true } }] });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const cached = (await peekLive(runId))!.snapshot;
    expect(cached).toEqual(await uncachedSnapshot((await findRun(runId))!));
  });
});

describe('batches of a cached run (the batch path reads only the session and its insert)', () => {
  it('refuses what another server process changed behind the cache: a stored batch, a submit; and a disabled student at once', async () => {
    const w = await drillWorld(trainer, 1);
    const s = w.students[0];
    const runId = (await start(s, w.assignmentId)).body.run.id;
    const first = await post(s, runId, { key: key(), ...LOG[0] });
    expect(first.status, JSON.stringify(first.body)).toBe(201);
    expect((await peekLive(runId))!.lastSeq).toBe(1);
    // Another process stores batch 2 (the cache here still expects 2): this process's batch 2
    // meets it in the insert, is refused, and nothing is stored twice.
    await db()('run_batches').insert({ run_id: runId, seq: 2, idempotency_key: key(), until_ms: 3000, events: JSON.stringify([]), event_count: 0 });
    const raced = await post(s, runId, { key: key(), seq: 2, untilMs: 3500, events: [] });
    expect(raced.status).toBe(409);
    expect(await batchCount(runId)).toBe(2);
    // The refused batch dropped the stale cell; the client resumes after the stored batch 2.
    const next = await post(s, runId, { key: key(), seq: 3, untilMs: 4000, events: [] });
    expect(next.status, JSON.stringify(next.body)).toBe(201);
    // Another process submits: the cached run still says active, the insert does not.
    await db()('runs').where({ id: runId }).update({ status: 'submitted', submitted_at: db().fn.now() });
    expect(await peekLive(runId)).not.toBeNull();
    const late = await post(s, runId, { key: key(), seq: 4, untilMs: 5000, events: [] });
    expect(late.status).toBe(409);
    expect((late.body as { error: string }).error).toContain('submitted');
    expect(await batchCount(runId)).toBe(3);
    // The session is re-read on every batch, cached run or not: a disabled account is refused.
    await db()('runs').where({ id: runId }).update({ status: 'active', submitted_at: null });
    const cookie = await sessionCookie(s);
    expect((await call(batches.POST, `/api/runs/${runId}/batches`, { method: 'POST', cookie, params: { id: runId }, body: { key: key(), seq: 4, untilMs: 5000, events: [] } })).status).toBe(201);
    await db()('users').where({ id: s.id }).update({ disabled: true });
    const refused = await call(batches.POST, `/api/runs/${runId}/batches`, { method: 'POST', cookie, params: { id: runId }, body: { key: key(), seq: 5, untilMs: 6000, events: [] } });
    expect(refused.status).toBe(401);
    expect(await batchCount(runId)).toBe(4);
  });

  it('a body that is not JSON is a 400; one over the batch size limit a 413 (declared or not); nothing stored', async () => {
    const w = await drillWorld(trainer, 1);
    const s = w.students[0];
    const runId = (await start(s, w.assignmentId)).body.run.id;
    const cookie = await sessionCookie(s);
    const at = { method: 'POST', cookie, params: { id: runId } };
    expect((await call(batches.POST, `/api/runs/${runId}/batches`, { ...at, rawBody: '{"key": ' })).status).toBe(400);
    // Valid JSON padded past the limit: the size is refused before anything is parsed.
    const big = JSON.stringify({ key: key(), ...LOG[0], pad: 'x'.repeat(BATCH_LIMITS.bodyBytes) });
    expect((await call(batches.POST, `/api/runs/${runId}/batches`, { ...at, rawBody: big })).status).toBe(413);
    expect((await call(batches.POST, `/api/runs/${runId}/batches`, { ...at, rawBody: '{}', headers: { 'content-length': String(BATCH_LIMITS.bodyBytes + 1) } })).status).toBe(413);
    // Multi-byte text counts in bytes: under the limit in characters, over it in UTF-8.
    const wide = JSON.stringify({ key: key(), ...LOG[0], pad: '\u00e9'.repeat(Math.ceil(BATCH_LIMITS.bodyBytes / 2) + 10) });
    expect(wide.length).toBeLessThan(BATCH_LIMITS.bodyBytes);
    expect((await call(batches.POST, `/api/runs/${runId}/batches`, { ...at, rawBody: wide })).status).toBe(413);
    expect(await batchCount(runId)).toBe(0);
    expect((await post(s, runId, { key: key(), ...LOG[0] })).status).toBe(201);
  });

  it('starting (or resuming) a run builds its live cell, so the first batch does not; the cell matches the log', async () => {
    const w = await drillWorld(trainer, 1);
    const s = w.students[0];
    const runId = (await start(s, w.assignmentId)).body.run.id;
    expect(await peekLive(runId)).not.toBeNull();
    expect((await post(s, runId, { key: key(), ...LOG[0] })).status).toBe(201);
    await restartEngine();
    expect((await start(s, w.assignmentId)).status).toBe(200);
    expect((await peekLive(runId))!.lastSeq).toBe(1);
    expect((await peekLive(runId))!.snapshot).toEqual(await uncachedSnapshot((await findRun(runId))!));
  });

  it('a cached run stays 404 to everyone but its owner', async () => {
    const w = await drillWorld(trainer, 2);
    const [owner, other] = w.students;
    const runId = (await start(owner, w.assignmentId)).body.run.id;
    expect((await post(owner, runId, { key: key(), ...LOG[0] })).status).toBe(201);
    expect(await peekLive(runId)).not.toBeNull();
    expect((await post(other, runId, { key: key(), seq: 2, untilMs: 3000, events: [] })).status).toBe(404);
    expect((await post(trainer, runId, { key: key(), seq: 2, untilMs: 3000, events: [] })).status).toBe(404);
    expect(await batchCount(runId)).toBe(1);
  });
});

describe('submit, grading and replay', () => {
  it('submits with a diagnosis; the grade comes from the server\'s re-simulation; a second submit is 409', async () => {
    const s = world.students[0];
    const runId = (await start(s)).body.run.id;
    const cookie = await sessionCookie(s);
    const res = await call(submitRoute.POST, `/api/runs/${runId}/submit`, { method: 'POST', cookie, params: { id: runId }, body: { diagnosis: { kind: 'open-wire', location: 'w-stop' } } });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const run = (await findRun(runId))!;
    expect(run.status).toBe('submitted');
    // Rules: a cycle completes within 60 s? The stop break at 3 s holds the robot (fail, 0 of 4);
    // never fault.hiddenStopBreak fails (0 of 6); diagnosis right (10 of 10) → 10 / 20 = 50 %.
    expect(run.grade).toBe(50);
    expect(run.breakdown!.diagnosis.earned).toBe(10);
    // The student sees the grade, not the breakdown, while the drill is open.
    expect((res.body as { run: { breakdown: unknown; grade: number } }).run.breakdown).toBeNull();
    // Apart from the student's own diagnosis (which names a kind), nothing hidden comes back.
    expectNoSecrets({ ...(res.body as { run: object }).run, diagnosis: null }, (text, needle) => expect(text, needle).not.toContain(needle));
    const again = await call(submitRoute.POST, '/x', { method: 'POST', cookie, params: { id: runId }, body: { diagnosis: { kind: 'chatter', location: 'w-part' } } });
    expect(again.status).toBe(409);
    expect((await findRun(runId))!.diagnosis!.kind).toBe('open-wire');
    const late = await post(s, runId, { key: key(), seq: 4, untilMs: 20_000, events: [] });
    expect(late.status).toBe(409);
    expect(await batchCount(runId)).toBe(3);
  });

  it('a submit after the close date is refused and stores nothing', async () => {
    const w = await drillWorld(trainer, 1);
    const s = w.students[0];
    const runId = (await start(s, w.assignmentId)).body.run.id;
    await db()('assignments').where({ id: w.assignmentId }).update({ opens_at: new Date(Date.now() - 7_200_000), closes_at: new Date(Date.now() - 1000) });
    const res = await call(submitRoute.POST, '/x', { method: 'POST', cookie: await sessionCookie(s), params: { id: runId }, body: { diagnosis: { kind: 'open-wire', location: 'w-stop' } } });
    expect(res.status).toBe(403);
    const run = (await findRun(runId))!;
    expect(run.status).toBe('active');
    expect(run.grade).toBeNull();
  });

  it('replay: owner, trainer and admin read events and trace; another student gets 404; hidden signals only for the trainer while open', async () => {
    const runId = (await start(world.students[0])).body.run.id;
    const get = async (u: User, handler: unknown, path: string) => call(handler, path, { cookie: await sessionCookie(u), params: { id: runId } });
    const ownerEvents = await get(world.students[0], eventsRoute.GET, `/api/runs/${runId}/events?page=1&pageSize=2`);
    expect(ownerEvents.status).toBe(200);
    expect(ownerEvents.body).toMatchObject({ total: 5, pages: 3, page: 1 });
    expect((ownerEvents.body as { events: unknown[] }).events).toHaveLength(2);
    const ownerTrace = await get(world.students[0], traceRoute.GET, `/api/runs/${runId}/trace?page=1&pageSize=100`);
    expect(ownerTrace.status).toBe(200);
    expectNoSecrets(ownerTrace.body, (text, needle) => expect(text, needle).not.toContain(needle));
    const trainerTrace = await get(trainer, traceRoute.GET, `/api/runs/${runId}/trace?page=1&pageSize=100`);
    expect((trainerTrace.body as { signals: string[] }).signals).toContain('fault.hiddenStopBreak');
    const admin = await demoUser('admin@kestrelvale.test');
    expect((await get(admin, traceRoute.GET, `/api/runs/${runId}/trace`)).status).toBe(200);
    expect((await get(world.students[1], eventsRoute.GET, `/api/runs/${runId}/events`)).status).toBe(404);
    expect((await get(world.students[1], traceRoute.GET, `/api/runs/${runId}/trace`)).status).toBe(404);
    expect((await get(world.students[1], runOne.GET, `/api/runs/${runId}`)).status).toBe(404);
    expect((await get(await makeUser('trainer'), runOne.GET, `/api/runs/${runId}`)).status).toBe(404);
  });

  it('after the drill closes the student may see the hidden faults in replay', async () => {
    const w = await drillWorld(trainer, 1);
    const s = w.students[0];
    const runId = (await start(s, w.assignmentId)).body.run.id;
    await post(s, runId, { key: key(), ...LOG[0] });
    await db()('assignments').where({ id: w.assignmentId }).update({ opens_at: new Date(Date.now() - 7_200_000), closes_at: new Date(Date.now() - 1000) });
    const tr = await call(traceRoute.GET, '/x', { cookie: await sessionCookie(s), params: { id: runId } });
    expect((tr.body as { hiddenVisible: boolean; signals: string[] }).hiddenVisible).toBe(true);
    expect((tr.body as { signals: string[] }).signals).toContain('fault.hiddenStopBreak');
  });

  it('free practice: start on a shared cell, stream batches, finish; replayable; not on someone else\'s cell', async () => {
    const student = await demoUser('ada.lindqvist@kestrelvale.test');
    const cookie = await sessionCookie(student);
    const shared = await db()('cell_shares as s').join('memberships as m', 'm.cohort_id', 's.cohort_id').where('m.user_id', student.id).first('s.cell_id');
    const res = await call(runs.POST, '/api/runs', { method: 'POST', cookie, body: { cellId: shared.cell_id } });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const runId = (res.body as { run: { id: string } }).run.id;
    // Practice may use fault cards of its own.
    const b = await post(student, runId, {
      key: key(),
      seq: 1,
      untilMs: 3000,
      events: [{ t: 1000, event: { type: 'inject-fault', fault: { id: 'myCard', kind: 'stuck-on', device: 'part' } } }],
    });
    expect(b.status, JSON.stringify(b.body)).toBe(201);
    const done = await call(submitRoute.POST, '/x', { method: 'POST', cookie, params: { id: runId }, body: {} });
    expect(done.status).toBe(200);
    expect((await findRun(runId))!.traceHash).toMatch(/^[0-9a-f]{16}$/);
    const ev = await call(eventsRoute.GET, '/x', { cookie, params: { id: runId } });
    expect((ev.body as { total: number }).total).toBe(1);
    const mine = await call(runs.GET, '/api/runs', { cookie });
    expect((mine.body as { runs: { id: string }[] }).runs.map((r) => r.id)).toContain(runId);
    // A practice run opened after "Restart run" keeps the seed the browser's worker runs.
    const again = await call(runs.POST, '/api/runs', { method: 'POST', cookie, body: { cellId: shared.cell_id, seed: 4242 } });
    expect(again.status, JSON.stringify(again.body)).toBe(201);
    expect((await findRun((again.body as { run: { id: string } }).run.id))!.seed).toBe(4242);
    const badSeed = await call(runs.POST, '/api/runs', { method: 'POST', cookie, body: { cellId: shared.cell_id, seed: -1 } });
    expect(badSeed.status).toBe(422);
    const cellOfOther = await db()('cells').where({ owner_id: (await demoUser('lead@brennick.test')).id }).first('id');
    expect((await call(runs.POST, '/api/runs', { method: 'POST', cookie, body: { cellId: cellOfOther.id } })).status).toBe(404);
  });
});

describe('gradebook', () => {
  it('shows the cohort × drill matrix to its trainer, with CSV export; students get 403', async () => {
    const res = await call(gradebook.GET, `/api/gradebook?cohort=${world.cohortId}`, { cookie: trainerCookie });
    expect(res.status).toBe(200);
    const book = (res.body as { gradebook: { columns: { assignmentId: string }[]; rows: { studentId: string; cells: Record<string, { grade: number } | null> }[] } }).gradebook;
    expect(book.rows).toHaveLength(3);
    const row = book.rows.find((r) => r.studentId === world.students[0].id)!;
    expect(row.cells[world.assignmentId]!.grade).toBe(50);
    const csv = await call(gradebookCsv.GET, `/api/gradebook/csv?cohort=${world.cohortId}`, { cookie: trainerCookie });
    expect(csv.status).toBe(200);
    const lines = (csv.body as string).trim().split(/\r?\n/);
    expect(lines[0]).toContain('Integration drill');
    expect(lines.some((l) => l.includes(world.students[0].email) && l.endsWith(',50'))).toBe(true);
    expect((await call(gradebook.GET, `/api/gradebook?cohort=${world.cohortId}`, { cookie: await sessionCookie(world.students[0]) })).status).toBe(403);
    expect((await call(gradebook.GET, `/api/gradebook?cohort=${world.cohortId}`, { cookie: await sessionCookie(await makeUser('trainer')) })).status).toBe(404);
  });

  it('a trainer overrides a grade with a reason, recorded in the audit log; the computed grade stays', async () => {
    const runId = (await start(world.students[0])).body.run.id;
    const res = await call(override.POST, '/x', { method: 'POST', cookie: trainerCookie, params: { id: runId }, body: { grade: 80, reason: 'Found it by a valid route the rules miss.' } });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const run = (await findRun(runId))!;
    expect(run.overrideGrade).toBe(80);
    expect(run.grade).toBe(50);
    const audit = await db()('audit_log').where({ action: 'grade.overridden', target_user_id: world.students[0].id }).orderBy('id', 'desc').first();
    expect(audit.detail).toMatchObject({ runId, from: 50, to: 80, reason: 'Found it by a valid route the rules miss.' });
    const book = await call(gradebook.GET, `/api/gradebook?cohort=${world.cohortId}`, { cookie: trainerCookie });
    const cells = (book.body as { gradebook: { rows: { studentId: string; cells: Record<string, { grade: number; overridden: boolean }> }[] } }).gradebook.rows.find((r) => r.studentId === world.students[0].id)!.cells;
    expect(cells[world.assignmentId]).toMatchObject({ grade: 80, overridden: true });
    const noReason = await call(override.POST, '/x', { method: 'POST', cookie: trainerCookie, params: { id: runId }, body: { grade: 10, reason: '' } });
    expect(noReason.status).toBe(422);
    const byStudent = await call(override.POST, '/x', { method: 'POST', cookie: await sessionCookie(world.students[0]), params: { id: runId }, body: { grade: 100, reason: 'I deserve it' } });
    expect(byStudent.status).toBe(403);
    expect((await findRun(runId))!.overrideGrade).toBe(80);
  });
});

describe('run listings', () => {
  it('a drill attempt stays listed behind any number of practice runs, and practice runs page without gaps or repeats', async () => {
    const student = await makeUser('student');
    await db()('memberships').insert({ cohort_id: world.cohortId, user_id: student.id });
    const attempt = await start(student);
    expect(attempt.status).toBe(201);
    // 101 practice runs started after the attempt: more than one capped "latest runs" list holds.
    const practiceIds: string[] = [];
    for (let i = 0; i < 101; i++) {
      const r = await createRun({ userId: student.id, mode: 'practice', cellId: world.cellId, cellVersion: 1, seed: i });
      practiceIds.push(r.id);
    }
    // Distinct start times, newest last created, so the expected order is known.
    for (const [i, id] of practiceIds.entries()) await db()('runs').where({ id }).update({ started_at: new Date(Date.now() + (i + 1) * 1000) });

    const attempts = await listDrillRunsOfUser(student.id);
    expect(attempts.map((r) => r.id)).toEqual([attempt.body.run.id]);

    const seen: string[] = [];
    for (let page = 1; page <= 5; page++) {
      const p = await pagePracticeRunsOfUser(student.id, page, 25);
      expect(p.total).toBe(101);
      expect(p.runs.every((r) => r.mode === 'practice' && r.cellName === 'Drill base')).toBe(true);
      seen.push(...p.runs.map((r) => r.id));
    }
    expect(seen).toEqual([...practiceIds].reverse());
    expect((await pagePracticeRunsOfUser(student.id, 6, 25)).runs).toEqual([]);
  });
});

describe('determinism and the library', () => {
  it('the regrade of every stored run equals its stored grade and trace hash', async () => {
    // Runs the server graded carry a trace hash; other files mark fixture runs submitted by hand.
    const all = (await listSubmittedRuns()).filter((r) => r.traceHash !== null);
    expect(all.length).toBeGreaterThan(0);
    for (const run of all) {
      const again = await regrade(run, run.diagnosis, run.endedMs!);
      expect(again.grade, run.id).toBe(run.grade);
      expect(again.traceHash, run.id).toBe(run.traceHash);
      expect(again.breakdown).toEqual(run.breakdown);
    }
  });

  it('the demo seed holds the whole library for the demo trainer and assigns one drill to the demo cohort', async () => {
    const mine = await listDrills(trainer.id);
    const keys = mine.map((d) => d.libraryKey).filter(Boolean);
    for (const d of DRILL_LIBRARY) expect(keys).toContain(d.key);
    const cohortId = await demoCohortId(trainer.id);
    const assigned = await db()('assignments as a').join('drills as d', 'd.id', 'a.drill_id').where({ 'a.cohort_id': cohortId, 'd.library_key': 'nc-stop-broken-wire' }).first('a.id');
    expect(assigned).toBeTruthy();
  });
});
