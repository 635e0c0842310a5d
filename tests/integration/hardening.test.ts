/**
 * Hardening (issue 9): the engine never stalls the server and keeps to its budgets, bodies are
 * read through one capped reader, CSV imports are bounded, a drill's hidden parts stay hidden
 * while the student could still attempt it, and submit grades under the run row's lock.
 */
// A short engine budget so a far-ahead view runs out of it within the test.
process.env.ENGINE_BUDGET_MS = '400';
process.env.LIVE_RUNS_PER_USER = '2';

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as health from '@/app/api/health/route';
import * as resets from '@/app/api/password-resets/route';
import * as runsRoute from '@/app/api/runs/route';
import * as runOne from '@/app/api/runs/[id]/route';
import * as batches from '@/app/api/runs/[id]/batches/route';
import * as view from '@/app/api/runs/[id]/view/route';
import * as submitRoute from '@/app/api/runs/[id]/submit/route';
import * as startRun from '@/app/api/assignments/[id]/run/route';
import * as assignmentRoute from '@/app/api/assignments/[id]/route';
import * as csvRoute from '@/app/api/cells/[id]/csv/[kind]/route';
import * as cellsRoute from '@/app/api/cells/route';
import { closeDb, db } from '@/db/knex';
import { createAssignment } from '@/db/drills';
import { findRun, insertBatch, submitLocked } from '@/db/runs';
import { getVersion, saveVersion } from '@/db/cells';
import type { User } from '@/db/users';
import { liveRunsOf } from '@/lib/runs/engine-host';
import { restartEngine } from '@/lib/runs/service';
import { LIMITS } from '@/lib/runs/policy';
import { MAX_REPORTED_PROBLEMS } from '@/lib/cells/csv';
import { BASE, call, demoUser, makeUser, sessionCookie } from './helpers';
import { drillWorld } from './drills-fixtures';

let lead: User;
let leadCookie: string;
let trainer: User;

beforeAll(async () => {
  lead = await demoUser('lead@brennick.test');
  leadCookie = await sessionCookie(lead);
  trainer = await demoUser('trainer@kestrelvale.test');
});
afterAll(async () => {
  await restartEngine();
  await closeDb();
});

async function newCell(user: User, cookie: string): Promise<string> {
  const res = await call(cellsRoute.POST, '/api/cells', { method: 'POST', cookie, body: { name: `Hardening ${Date.now()}`, template: 'pick-and-place' } });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return (res.body as { cell: { id: string } }).cell.id;
}

async function practiceRun(cellId: string, cookie: string): Promise<string> {
  const res = await call(runsRoute.POST, '/api/runs', { method: 'POST', cookie, body: { cellId, seed: 7 } });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return (res.body as { run: { id: string } }).run.id;
}

/** Starts a run's wall-clock age `ms` in the past, so its allowance covers that much cell time. */
const backdate = (runId: string, ms: number) => db()('runs').where({ id: runId }).update({ started_at: new Date(Date.now() - ms) });

describe('1 · the engine runs off the request loop, on a budget', () => {
  it('a view seven simulated days ahead of a fresh run is refused at once (422 naming t), and health answers beside it', async () => {
    const runId = await practiceRun(await newCell(lead, leadCookie), leadCookie);
    const [far, ok] = await Promise.all([
      call(view.GET, `/api/runs/${runId}/view?t=604800000`, { cookie: leadCookie, params: { id: runId } }),
      health.GET(),
    ]);
    expect(far.status).toBe(422);
    expect((far.body as { fields: Record<string, string[]> }).fields.t[0]).toMatch(/at most \d+/);
    expect(ok.status).toBe(200);
  });

  it('a long view within the allowance spends its budget in a worker thread: health answers first, the view gets 503 with Retry-After and keeps its progress', async () => {
    const runId = await practiceRun(await newCell(lead, leadCookie), leadCookie);
    // Seven days old: the allowance (age × 10) covers a week of cell time, far beyond one budget.
    await backdate(runId, 7 * 86_400_000);
    const order: string[] = [];
    const viewing = call(view.GET, `/api/runs/${runId}/view?t=604800000`, { cookie: leadCookie, params: { id: runId } }).then((r) => {
      order.push('view');
      return r;
    });
    // Several health checks while the view is working: each is answered before the view is.
    for (let i = 0; i < 3; i++) {
      const h = await health.GET();
      expect(h.status).toBe(200);
      order.push('health');
    }
    const v = await viewing;
    expect(v.status).toBe(503);
    expect(order.slice(0, 3)).toEqual(['health', 'health', 'health']);
    const raw = await view.GET(new Request(`${BASE}/api/runs/${runId}/view?t=604800000`, { headers: { cookie: leadCookie } }), { params: Promise.resolve({ id: runId }) });
    expect(raw.status).toBe(503);
    expect(Number(raw.headers.get('retry-after'))).toBeGreaterThanOrEqual(1);
    // The second request went on from where the first stopped: a third, short view is answered at once.
    const near = await call(view.GET, `/api/runs/${runId}/view?t=1000`, { cookie: leadCookie, params: { id: runId } });
    expect(near.status).toBe(200);
    expect((near.body as { snapshot: { timeMs: number } }).snapshot.timeMs).toBeGreaterThan(1000);
  });

  it('a batch ahead of what the run\'s age allows is a 429 with Retry-After; nothing is stored', async () => {
    const runId = await practiceRun(await newCell(lead, leadCookie), leadCookie);
    const req = new Request(`${BASE}/api/runs/${runId}/batches`, {
      method: 'POST',
      headers: { cookie: leadCookie, 'content-type': 'application/json' },
      body: JSON.stringify({ key: 'ahead-0001', seq: 1, untilMs: 3_600_000, events: [] }),
    });
    const res = await batches.POST(req, { params: Promise.resolve({ id: runId }) });
    expect(res.status).toBe(429);
    expect(Number(res.headers.get('retry-after'))).toBeGreaterThan(60);
    expect((await findRun(runId))!.lastSeq).toBe(0);
  });

  it(`download events are capped per batch (${LIMITS.downloadsPerBatch})`, async () => {
    const cellId = await newCell(lead, leadCookie);
    const runId = await practiceRun(cellId, leadCookie);
    const doc = (await getVersion(cellId))!.document;
    const events = Array.from({ length: LIMITS.downloadsPerBatch + 1 }, (_, i) => ({ t: 100 + i, event: { type: 'download', logic: doc.plc.sheet } }));
    const res = await call(batches.POST, `/api/runs/${runId}/batches`, { method: 'POST', cookie: leadCookie, params: { id: runId }, body: { key: 'downloads-01', seq: 1, untilMs: 1000, events } });
    expect(res.status).toBe(422);
    expect((res.body as { fields: Record<string, string[]> }).fields.events[0]).toMatch(/at most 5 downloads/);
  });

  it('each user keeps at most LIVE_RUNS_PER_USER live cells; their oldest is dropped and rebuilt from its log when used again', async () => {
    const user = await makeUser('lead');
    const cookie = await sessionCookie(user);
    const cellId = await newCell(user, cookie);
    const ids = [await practiceRun(cellId, cookie), await practiceRun(cellId, cookie), await practiceRun(cellId, cookie)];
    expect(liveRunsOf(user.id)).toEqual(ids.slice(1));
    const again = await call(view.GET, `/api/runs/${ids[0]}/view?t=500`, { cookie, params: { id: ids[0] } });
    expect(again.status).toBe(200);
    expect(liveRunsOf(user.id)).toEqual([ids[2], ids[0]]);
  });
});

describe('2 · one capped body reader', () => {
  it('an anonymous streamed body past the cap is refused with 413 without reading the rest', async () => {
    let pulled = 0;
    const chunk = new TextEncoder().encode(`{"email":"${'a'.repeat(64 * 1024)}`);
    const total = 12 * 1024 * 1024;
    const body = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (pulled >= total) return controller.close();
        pulled += chunk.byteLength;
        controller.enqueue(chunk);
      },
    });
    const req = new Request(`${BASE}/api/password-resets`, { method: 'POST', headers: { 'content-type': 'application/json' }, body, duplex: 'half' } as RequestInit);
    const res = await resets.POST(req, { params: Promise.resolve({}) } as never);
    expect(res.status).toBe(413);
    // The cap for sign-in and reset forms is 16 KiB: the reader stopped after the first chunks.
    expect(pulled).toBeLessThan(512 * 1024);
  });

  it('a declared Content-Length past the cap is refused before reading; a non-JSON type is 415; a cross-site post is 403', async () => {
    const declared = await call(resets.POST, '/api/password-resets', { method: 'POST', rawBody: '{}', headers: { 'content-length': String(12 * 1024 * 1024) } });
    expect(declared.status).toBe(413);
    const typed = await resets.POST(new Request(`${BASE}/api/password-resets`, { method: 'POST', headers: { 'content-type': 'text/plain' }, body: '{"email":"a@b.test"}' }), { params: Promise.resolve({}) } as never);
    expect(typed.status).toBe(415);
    const cross = await call(resets.POST, '/api/password-resets', { method: 'POST', body: { email: 'a@b.test' }, headers: { origin: 'https://elsewhere.example', 'sec-fetch-site': 'cross-site' } });
    expect(cross.status).toBe(403);
    const foreignOrigin = await call(resets.POST, '/api/password-resets', { method: 'POST', body: { email: 'a@b.test' }, headers: { origin: 'https://elsewhere.example' } });
    expect(foreignOrigin.status).toBe(403);
  });
});

describe('3 · CSV imports are bounded; exports neutralise formulas', () => {
  it('a 1 MB point-map CSV in which every row is wrong answers with the first 100 problems and their count', async () => {
    const cellId = await newCell(lead, leadCookie);
    const header = 'family,first_point,count,rack,slot,first_channel\n';
    let csv = header;
    while (csv.length < 1_000_000 - 40) csv += 'XX,zero,many,r,s,c\n';
    const res = await call(csvRoute.POST, `/api/cells/${cellId}/csv/point-map`, { method: 'POST', cookie: leadCookie, params: { id: cellId, kind: 'point-map' }, body: { baseVersion: 1, csv } });
    expect(res.status).toBe(422);
    const body = res.body as { rowErrors: unknown[]; problemCount: number; fields: Record<string, string[]>; error: string };
    expect(body.rowErrors.length).toBe(MAX_REPORTED_PROBLEMS);
    expect(body.problemCount).toBeGreaterThan(MAX_REPORTED_PROBLEMS);
    expect(Object.values(body.fields).flat().length).toBeLessThanOrEqual(MAX_REPORTED_PROBLEMS);
    expect(JSON.stringify(body).length).toBeLessThan(64 * 1024);
    // The file is longer than the document's 256 point-map rows: reading stopped at the limit.
    expect(body.problemCount).toBeLessThan(256 * 7);
    expect((await getVersion(cellId))!.version).toBe(1);
  });

  it('an exported point map neutralises a formula-looking label, and the file imports back to the same label', async () => {
    const cellId = await newCell(lead, leadCookie);
    const v1 = (await getVersion(cellId))!;
    const doc = structuredClone(v1.document);
    const row = doc.controller.pointMap[0];
    row.points = [{ label: '=HYPERLINK("http://x.example")' }, ...(row.points ?? []).slice(1)];
    const saved = await saveVersion(cellId, lead.id, 1, doc, 'formula label');
    expect(saved.ok).toBe(true);
    const out = await call(csvRoute.GET, `/api/cells/${cellId}/csv/point-map`, { cookie: leadCookie, params: { id: cellId, kind: 'point-map' } });
    expect(out.status).toBe(200);
    expect(out.body as string).toContain(`'=HYPERLINK`);
    const back = await call(csvRoute.POST, `/api/cells/${cellId}/csv/point-map`, { method: 'POST', cookie: leadCookie, params: { id: cellId, kind: 'point-map' }, body: { baseVersion: 2, csv: out.body } });
    expect(back.status, JSON.stringify(back.body)).toBe(201);
    const staged = (await getVersion(cellId))!.document.controller.staged!;
    expect(staged[0].points?.[0]?.label).toBe('=HYPERLINK("http://x.example")');
  });
});

describe('6 · hidden parts', () => {
  it('a drill assigned twice: its breakdown stays hidden while one assignment is still open, and shows once both have closed; no seed ever', async () => {
    const w = await drillWorld(trainer, 1);
    const s = w.students[0];
    const cookie = await sessionCookie(s);
    const runId = (await call(startRun.POST, `/api/assignments/${w.assignmentId}/run`, { method: 'POST', cookie, params: { id: w.assignmentId } }) as { body: { run: { id: string } } }).body.run.id;
    const b = await call(batches.POST, `/api/runs/${runId}/batches`, { method: 'POST', cookie, params: { id: runId }, body: { key: 'hidden-0001', seq: 1, untilMs: 4000, events: [] } });
    expect(b.status, JSON.stringify(b.body)).toBe(201);
    const done = await call(submitRoute.POST, `/api/runs/${runId}/submit`, { method: 'POST', cookie, params: { id: runId }, body: { diagnosis: { kind: 'open-wire', location: 'w-stop', note: '' } } });
    expect(done.status, JSON.stringify(done.body)).toBe(200);
    // The same drill, assigned again to the same cohort, still open; the first one closes.
    const second = await createAssignment({ drillId: w.drill.id, cohortId: w.cohortId, opensAt: new Date(Date.now() - 60_000).toISOString(), closesAt: new Date(Date.now() + 86_400_000).toISOString(), assignedBy: trainer.id });
    await db()('assignments').where({ id: w.assignmentId }).update({ closes_at: new Date(Date.now() - 1000) });
    const hidden = await call(runOne.GET, `/api/runs/${runId}`, { cookie, params: { id: runId } });
    expect(hidden.status).toBe(200);
    expect((hidden.body as { hiddenVisible: boolean }).hiddenVisible).toBe(false);
    expect((hidden.body as { run: { breakdown: unknown } }).run.breakdown).toBeNull();
    expect(JSON.stringify(hidden.body)).not.toContain('hiddenRule');
    expect(hidden.body).not.toHaveProperty('run.seed');
    // Both closed: the breakdown may be read; still no seed for the student.
    await db()('assignments').where({ id: second.id }).update({ closes_at: new Date(Date.now() - 1000) });
    const shown = await call(runOne.GET, `/api/runs/${runId}`, { cookie, params: { id: runId } });
    expect((shown.body as { hiddenVisible: boolean }).hiddenVisible).toBe(true);
    expect(JSON.stringify(shown.body)).toContain('hiddenRule');
    expect(shown.body).not.toHaveProperty('run.seed');
  });

  it('an assignment that has not opened shows neither brief nor base cell', async () => {
    const w = await drillWorld(trainer, 1);
    await db()('assignments').where({ id: w.assignmentId }).update({ opens_at: new Date(Date.now() + 86_400_000), closes_at: new Date(Date.now() + 2 * 86_400_000) });
    const res = await call(assignmentRoute.GET, `/api/assignments/${w.assignmentId}`, { cookie: await sessionCookie(w.students[0]), params: { id: w.assignmentId } });
    expect(res.status).toBe(200);
    const body = res.body as { state: string; document: unknown; drill: { brief: string; objectives: string[] } };
    expect(body.state).toBe('upcoming');
    expect(body.document).toBeNull();
    expect(body.drill.brief).toBe('');
    expect(body.drill.objectives).toEqual([]);
  });

  it('a drill run\'s live view carries no seed', async () => {
    const w = await drillWorld(trainer, 1);
    const cookie = await sessionCookie(w.students[0]);
    const runId = (await call(startRun.POST, `/api/assignments/${w.assignmentId}/run`, { method: 'POST', cookie, params: { id: w.assignmentId } }) as { body: { run: { id: string } } }).body.run.id;
    const v = await call(view.GET, `/api/runs/${runId}/view?t=1000`, { cookie, params: { id: runId } });
    expect(v.status).toBe(200);
    expect(v.body).not.toHaveProperty('snapshot.seed');
  });
});

describe('7 · data', () => {
  it('submit grades under the run row\'s lock: a batch from another process waits, then finds the run submitted', async () => {
    const runId = await practiceRun(await newCell(lead, leadCookie), leadCookie);
    let insertDone = false;
    let during: Promise<unknown> | null = null;
    const done = await submitLocked(runId, async (run, stored) => {
      // Another server process stores a batch while this one grades: it must wait for the lock.
      during = insertBatch(runId, { seq: 1, key: 'late-batch-01', untilMs: 1000, events: [] }).then((r) => {
        insertDone = true;
        return r;
      });
      await new Promise((r) => setTimeout(r, 300));
      expect(insertDone).toBe(false);
      return { endedMs: run.untilMs, diagnosis: null, grade: null, breakdown: null, traceHash: `stored-${stored.length}` };
    });
    expect(done.ok).toBe(true);
    expect(await during).toEqual({ ok: false, reason: 'submitted' });
    const run = (await findRun(runId))!;
    expect(run.status).toBe('submitted');
    expect(run.lastSeq).toBe(0);
    expect(run.traceHash).toBe('stored-0');
    // Its hash is made up: remove the run, so the suite's regrade-every-stored-run check never meets it.
    await db()('runs').where({ id: runId }).delete();
  });

  it('run times hold the whole accepted range (30 days of cell time, past 2^31 ms)', async () => {
    const runId = await practiceRun(await newCell(lead, leadCookie), leadCookie);
    const thirtyDays = 30 * 86_400_000;
    expect(thirtyDays).toBeGreaterThan(2 ** 31);
    expect(await insertBatch(runId, { seq: 1, key: 'long-run-01', untilMs: thirtyDays, events: [] })).toEqual({ ok: true });
    expect((await findRun(runId))!.untilMs).toBe(thirtyDays);
  });
});
