/**
 * The live board (issue 13): the board's picture for an assignment with students in every
 * state, a stored batch reaching the trainer's stream through LISTEN/NOTIFY, a message to one
 * student reaching only that student's stream, who may watch, and what the cohort found on a
 * closed assignment with graded runs.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as liveRoute from '@/app/api/assignments/[id]/live/route';
import * as liveStream from '@/app/api/assignments/[id]/live/stream/route';
import * as messagesRoute from '@/app/api/assignments/[id]/messages/route';
import * as messageStream from '@/app/api/assignments/[id]/messages/stream/route';
import * as findingsRoute from '@/app/api/assignments/[id]/findings/route';
import * as startRoute from '@/app/api/assignments/[id]/run/route';
import * as batchesRoute from '@/app/api/runs/[id]/batches/route';
import { restartEngine } from '@/lib/runs/service';
import { closeDb, db } from '@/db/knex';
import { insertBatch, startAssignmentRun } from '@/db/runs';
import type { User } from '@/db/users';
import { closeLiveEvents } from '@/lib/live/listener';
import type { Board, BoardTile, StudentMessage } from '@/lib/live/types';
import type { Findings as FindingsShape } from '@/lib/live/findings';
import { BASE, call, demoUser, makeUser, sessionCookie } from './helpers';
import { drillWorld, type DrillWorld } from './drills-fixtures';
import { readSseFrames } from '../sse-frames';

type Ctx = { params: Promise<Record<string, string>> };
type Handler = (req: Request, ctx: Ctx) => Promise<Response>;

/** Reads SSE frames from a live handler until `until` says stop; the stream is cancelled after. */
async function openStream(handler: unknown, path: string, id: string, cookie: string) {
  const abort = new AbortController();
  const res = await (handler as Handler)(new Request(`${BASE}${path}`, { headers: { cookie }, signal: abort.signal }), { params: Promise.resolve({ id }) });
  expect(res.status).toBe(200);
  const frames: { event: string; data: unknown }[] = [];
  const pump = readSseFrames(res.body!, (event, data) => {
    if (data) frames.push({ event, data: JSON.parse(data) });
  });
  return {
    frames,
    async waitFor(pred: (f: { event: string; data: unknown }) => boolean, ms = 5000) {
      const start = Date.now();
      for (;;) {
        const hit = frames.find(pred);
        if (hit) return hit;
        if (Date.now() - start > ms) throw new Error(`no matching frame in ${ms} ms; saw ${frames.map((f) => f.event).join(', ')}`);
        await new Promise((r) => setTimeout(r, 20));
      }
    },
    async close() {
      // The handler ends its stream when the request is aborted (lib/live/sse.ts), which ends the pump.
      abort.abort();
      await pump;
    },
  };
}

let admin: User;
let otherTrainer: User;
let world: DrillWorld;
const runs: Record<string, string> = {};

async function startRun(w: DrillWorld, s: User): Promise<string> {
  const { run } = await startAssignmentRun({ userId: s.id, mode: 'drill', drillId: w.drill.id, assignmentId: w.assignmentId, cellId: w.cellId, cellVersion: 1, seed: 7 });
  return run.id;
}

beforeAll(async () => {
  admin = await demoUser('admin@kestrelvale.test');
  otherTrainer = await makeUser('trainer');
  world = await drillWorld(await makeUser('trainer'), 3);
  const [, running, submitted] = world.students;
  runs.running = await startRun(world, running);
  await insertBatch(runs.running, { seq: 1, key: 'k1', untilMs: 500, events: [{ t: 100, event: { type: 'press', device: 'estop' } }] });
  runs.submitted = await startRun(world, submitted);
  await insertBatch(runs.submitted, { seq: 1, key: 'k1', untilMs: 900, events: [{ t: 200, event: { type: 'clear-fault', id: 'hiddenPartMismatch' } }] });
  await db()('runs').where({ id: runs.submitted }).update({ status: 'submitted', submitted_at: new Date(), grade: 70, diagnosis: { kind: 'open-wire', location: 'w-stop', note: '' } });
});

afterAll(async () => {
  await restartEngine();
  await closeLiveEvents();
  await closeDb();
});

describe('the live board', () => {
  it('shows one tile per student: not started, running (e-stop in), submitted (faults found)', async () => {
    const res = await call(liveRoute.GET, `/api/assignments/${world.assignmentId}/live`, { cookie: await sessionCookie(world.trainer), params: { id: world.assignmentId } });
    expect(res.status).toBe(200);
    const board = res.body as Board;
    const byStudent = new Map(board.tiles.map((t) => [t.studentId, t]));
    const [idle, running, submitted] = world.students;
    expect(byStudent.get(idle.id)).toMatchObject({ status: 'not-started', runId: null, deadline: null });
    const r = byStudent.get(running.id)!;
    expect(r).toMatchObject({ status: 'running', runId: runs.running, estopPressed: ['estop'], untilMs: 500, lastSeq: 1 });
    expect(Date.parse(r.deadline!)).toBeGreaterThan(Date.now());
    expect(r.faults.every((f) => !f.found)).toBe(true);
    const s = byStudent.get(submitted.id)!;
    expect(s).toMatchObject({ status: 'submitted', grade: 70 });
    // Found both: one cleared, the other named in the diagnosis (kind and place).
    expect(Object.fromEntries(s.faults.map((f) => [f.id, f.found]))).toEqual({ hiddenStopBreak: true, hiddenPartMismatch: true });
    expect(board.timeline.map((e) => e.text)).toEqual(expect.arrayContaining(['e-stop estop pressed', 'fault hiddenPartMismatch cleared']));
  });

  it("delivers a stored batch to the trainer's stream as the student's tile and timeline", async () => {
    const stream = await openStream(liveStream.GET, `/api/assignments/${world.assignmentId}/live/stream`, world.assignmentId, await sessionCookie(world.trainer));
    try {
      await stream.waitFor((f) => f.event === 'board');
      const stored = await insertBatch(runs.running, { seq: 2, key: 'k2', untilMs: 1500, events: [{ t: 1200, event: { type: 'release', device: 'estop' } }, { t: 1300, event: { type: 'force', target: '%IX0.1', value: 1 } }] });
      expect(stored.ok).toBe(true);
      const tile = (await stream.waitFor((f) => f.event === 'tile' && (f.data as BoardTile).lastSeq === 2)).data as BoardTile;
      expect(tile).toMatchObject({ runId: runs.running, untilMs: 1500, estopPressed: [], forces: { '%IX0.1': 1 }, lastEvent: 'force %IX0.1 = 1' });
      const tl = (await stream.waitFor((f) => f.event === 'timeline')).data as { text: string }[];
      expect(tl.map((e) => e.text)).toEqual(['e-stop estop released', 'force %IX0.1 = 1']);
      // A student who starts now appears on the board too.
      const late = await startRun(world, world.students[0]);
      const started = (await stream.waitFor((f) => f.event === 'tile' && (f.data as BoardTile).runId === late)).data as BoardTile;
      expect(started.status).toBe('running');
    } finally {
      await stream.close();
    }
  });

  it("shows the student's cell in small from the engine thread that runs her batches", async () => {
    const w = await drillWorld(await makeUser('trainer'), 1);
    const s = w.students[0];
    const cookie = await sessionCookie(s);
    const started = await call(startRoute.POST, `/api/assignments/${w.assignmentId}/run`, { method: 'POST', cookie, params: { id: w.assignmentId } });
    const runId = (started.body as { run: { id: string } }).run.id;
    const stream = await openStream(liveStream.GET, `/api/assignments/${w.assignmentId}/live/stream`, w.assignmentId, await sessionCookie(w.trainer));
    try {
      await stream.waitFor((f) => f.event === 'board');
      const posted = await call(batchesRoute.POST, `/api/runs/${runId}/batches`, {
        method: 'POST', cookie, params: { id: runId },
        body: { key: 'live-board-cell-1', seq: 1, untilMs: 1500, events: [{ t: 1000, event: { type: 'set-field', device: 'part', active: true } }] },
      });
      expect(posted.body).toMatchObject({ seq: 1 });
      expect(posted.status).toBe(201);
      const tile = (await stream.waitFor((f) => f.event === 'tile' && (f.data as BoardTile).lastSeq === 1)).data as BoardTile;
      expect(tile.cell).not.toBeNull();
      expect(typeof tile.cell!.controller).toBe('string');
      expect(Object.keys(tile.cell!.handshake).length).toBeGreaterThan(0);
      // Hidden faults are the trainer's to see on the board.
      expect(tile.faults.map((f) => f.id)).toEqual(['hiddenStopBreak', 'hiddenPartMismatch']);
    } finally {
      await stream.close();
    }
  });

  it("sends a message to one student only, and one to all to every student's stream and the board", async () => {
    const [a, b] = world.students;
    const trainerCookie = await sessionCookie(world.trainer);
    const board = await openStream(liveStream.GET, `/api/assignments/${world.assignmentId}/live/stream`, world.assignmentId, trainerCookie);
    const sa = await openStream(messageStream.GET, `/api/assignments/${world.assignmentId}/messages/stream`, world.assignmentId, await sessionCookie(a));
    const sb = await openStream(messageStream.GET, `/api/assignments/${world.assignmentId}/messages/stream`, world.assignmentId, await sessionCookie(b));
    try {
      await Promise.all([board.waitFor((f) => f.event === 'board'), sa.waitFor((f) => f.event === 'messages'), sb.waitFor((f) => f.event === 'messages')]);
      const one = await call(messagesRoute.POST, `/api/assignments/${world.assignmentId}/messages`, { method: 'POST', cookie: trainerCookie, params: { id: world.assignmentId }, body: { kind: 'hint', body: 'Meter the stop circuit.', to: a.id } });
      expect(one.status).toBe(201);
      const all = await call(messagesRoute.POST, `/api/assignments/${world.assignmentId}/messages`, { method: 'POST', cookie: trainerCookie, params: { id: world.assignmentId }, body: { body: 'Ten minutes left.', to: null } });
      expect(all.status).toBe(201);
      await sa.waitFor((f) => f.event === 'message' && (f.data as StudentMessage).body === 'Ten minutes left.');
      await sb.waitFor((f) => f.event === 'message' && (f.data as StudentMessage).body === 'Ten minutes left.');
      expect(sa.frames.some((f) => f.event === 'message' && (f.data as StudentMessage).body === 'Meter the stop circuit.')).toBe(true);
      // b's stream got the message to all, after the one to a: the one to a never reached it.
      expect(JSON.stringify(sb.frames)).not.toContain('Meter the stop circuit.');
      await board.waitFor((f) => f.event === 'message' && (f.data as { body: string }).body === 'Meter the stop circuit.');
      // The read route agrees.
      const listed = await call(messagesRoute.GET, `/api/assignments/${world.assignmentId}/messages`, { cookie: await sessionCookie(b), params: { id: world.assignmentId } });
      expect((listed.body as { messages: StudentMessage[] }).messages.map((m) => m.body)).toEqual(['Ten minutes left.']);
      // A message to someone outside the cohort is refused.
      const stranger = await call(messagesRoute.POST, `/api/assignments/${world.assignmentId}/messages`, { method: 'POST', cookie: trainerCookie, params: { id: world.assignmentId }, body: { body: 'hi', to: otherTrainer.id } });
      expect(stranger.status).toBe(422);
    } finally {
      await Promise.all([board.close(), sa.close(), sb.close()]);
    }
  });

  it('lets the drill trainer and the admin watch; another trainer 404, a student 403, nobody 401', async () => {
    const path = `/api/assignments/${world.assignmentId}/live`;
    const params = { id: world.assignmentId };
    expect((await call(liveRoute.GET, path, { cookie: await sessionCookie(admin), params })).status).toBe(200);
    expect((await call(liveRoute.GET, path, { cookie: await sessionCookie(otherTrainer), params })).status).toBe(404);
    expect((await call(liveRoute.GET, path, { cookie: await sessionCookie(world.students[0]), params })).status).toBe(403);
    expect((await call(liveRoute.GET, path, { params })).status).toBe(401);
    for (const [cookie, status] of [
      [await sessionCookie(otherTrainer), 404],
      [await sessionCookie(world.students[1]), 403],
    ] as const) {
      const res = await (liveStream.GET as Handler)(new Request(`${BASE}${path}/stream`, { headers: { cookie } }), { params: Promise.resolve(params) });
      expect(res.status).toBe(status);
    }
    // A student cannot read another cohort's messages.
    const outsider = await makeUser('student');
    expect((await call(messagesRoute.GET, `${path.replace('/live', '/messages')}`, { cookie: await sessionCookie(outsider), params })).status).toBe(404);
  });
});

describe('what the cohort found', () => {
  it('is refused while the assignment is open', async () => {
    const res = await call(findingsRoute.GET, `/api/assignments/${world.assignmentId}/findings`, { cookie: await sessionCookie(world.trainer), params: { id: world.assignmentId } });
    expect(res.status).toBe(409);
  });

  it('sums faults found and missed, time to diagnosis, grades and rules failed on a closed assignment, and exports them', async () => {
    const w = await drillWorld(await makeUser('trainer'), 4, { opensAt: new Date(Date.now() - 7_200_000), closesAt: new Date(Date.now() + 60_000) });
    const rule = (id: string, status: string) => ({ id, label: null, kind: 'never', weight: 1, status, earned: status === 'pass' ? 1 : 0, violation: null });
    const graded = [
      { grade: 95, diagnosis: { kind: 'open-wire', location: 'w-stop', note: '' }, correct: true, endedMs: 90_000, rules: [rule('hiddenRuleCycle', 'pass'), rule('hiddenRuleFault', 'fail')] },
      { grade: 42, diagnosis: { kind: 'short-0v', location: 'w-stop', note: '' }, correct: false, endedMs: 400_000, rules: [rule('hiddenRuleCycle', 'fail'), rule('hiddenRuleFault', 'fail')] },
      { grade: 81, diagnosis: { kind: 'open-wire', location: 'W-STOP', note: '' }, correct: true, endedMs: 700_000, rules: [rule('hiddenRuleCycle', 'pass'), rule('hiddenRuleFault', 'pass')] },
    ];
    for (let i = 0; i < graded.length; i++) {
      const id = await startRun(w, w.students[i]);
      const g = graded[i];
      await db()('runs').where({ id }).update({
        status: 'submitted', submitted_at: new Date(), grade: g.grade, ended_ms: g.endedMs, diagnosis: g.diagnosis,
        breakdown: { rules: g.rules, diagnosis: { weight: 10, earned: g.correct ? 10 : 0, kindCorrect: g.correct, locationCorrect: g.correct, given: g.diagnosis }, earned: 0, possible: 0, endedMs: g.endedMs },
      });
    }
    await db()('assignments').where({ id: w.assignmentId }).update({ closes_at: new Date(Date.now() - 1000) });
    const cookie = await sessionCookie(w.trainer);
    const res = await call(findingsRoute.GET, `/api/assignments/${w.assignmentId}/findings`, { cookie, params: { id: w.assignmentId } });
    expect(res.status).toBe(200);
    const f = res.body as FindingsShape;
    expect(f).toMatchObject({ students: 4, submitted: 3 });
    expect(f.faults).toEqual([
      { id: 'hiddenStopBreak', label: 'HIDDEN-LABEL-STOP', found: 2, missed: 1 },
      { id: 'hiddenPartMismatch', label: 'HIDDEN-LABEL-PART', found: 0, missed: 3 },
    ]);
    expect(f.diagnosis.correct).toBe(2);
    expect(f.diagnosis.medianMs).toBe(90_000);
    expect(f.diagnosis.buckets.find((b) => b.label === '0–2 min')!.count).toBe(1);
    expect(f.diagnosis.buckets.find((b) => b.label === '10–20 min')!.count).toBe(1);
    expect(Object.fromEntries(f.grades.filter((g) => g.count).map((g) => [g.label, g.count]))).toEqual({ '40–49': 1, '80–89': 1, '90–100': 1 });
    expect(f.rules[0]).toMatchObject({ id: 'hiddenRuleFault', failed: 2, passed: 1 });
    expect(f.rules[1]).toMatchObject({ id: 'hiddenRuleCycle', failed: 1, passed: 2 });

    const csv = await call(findingsRoute.GET, `/api/assignments/${w.assignmentId}/findings?format=csv`, { cookie, params: { id: w.assignmentId } });
    expect(csv.status).toBe(200);
    expect(csv.body as string).toContain('Fault card,HIDDEN-LABEL-STOP (hiddenStopBreak),found,2');
    expect(csv.body as string).toContain('Grade,90–100,runs,1');
    // Another trainer sees nothing of it.
    expect((await call(findingsRoute.GET, `/api/assignments/${w.assignmentId}/findings`, { cookie: await sessionCookie(otherTrainer), params: { id: w.assignmentId } })).status).toBe(404);
  });
});

