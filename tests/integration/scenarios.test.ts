/**
 * Scenarios a cell keeps, against the real database: "Keep as scenario" from a finished run
 * (practice and drill), the runner-format import, renaming and rewriting rules, and access.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as keep from '@/app/api/runs/[id]/scenario/route';
import * as scenarios from '@/app/api/cells/[id]/scenarios/route';
import * as scenario from '@/app/api/cells/[id]/scenarios/[scenarioId]/route';
import { closeDb, db } from '@/db/knex';
import { createCell } from '@/db/cells';
import { createRun, insertBatch } from '@/db/runs';
import { createAssignment, createDrill } from '@/db/drills';
import { startAssignmentRun } from '@/db/runs';
import type { User } from '@/db/users';
import { drillInputSchema } from '@/lib/schemas/drills';
import { cellDocumentSchema, pickAndPlaceCell, type LoggedEvent } from '@/simulator';
import { call, demoCohortId, demoUser, makeUser, sessionCookie } from './helpers';
import { drillBody } from './drills-fixtures';

let lead: User;
let cookie: string;

beforeAll(async () => {
  lead = await demoUser('lead@brennick.test');
  cookie = await sessionCookie(lead);
});

afterAll(async () => {
  await closeDb();
});

const doc = () => cellDocumentSchema.parse(structuredClone(pickAndPlaceCell));

const EVENTS: LoggedEvent[] = [
  { t: 1000, event: { type: 'set-field', device: 'part', active: true } },
  { t: 1500, event: { type: 'press', device: 'start' } },
  { t: 1560, event: { type: 'release', device: 'start' } },
  { t: 3000, event: { type: 'download', routine: { steps: doc().controller.routine, poses: doc().controller.poses } } },
  { t: 4000, event: { type: 'set-field', device: 'guard', active: false } },
];

/** A finished run of `user` on `cellId` with EVENTS (submitted directly: grading is not what is tested here). */
async function finishedRun(user: User, cellId: string, mode: 'practice' | 'drill' = 'practice', extra: { drillId?: string; assignmentId?: string } = {}): Promise<string> {
  const run =
    mode === 'practice'
      ? await createRun({ userId: user.id, mode, cellId, cellVersion: 1, seed: 77 })
      : (await startAssignmentRun({ userId: user.id, mode, cellId, cellVersion: 1, seed: 77, drillId: extra.drillId!, assignmentId: extra.assignmentId! })).run;
  expect((await insertBatch(run.id, { seq: 1, key: `k-${run.id}`, untilMs: 6000, events: EVENTS })).ok).toBe(true);
  await db()('runs').where({ id: run.id }).update({ status: 'submitted', submitted_at: db().fn.now(), ended_ms: 6000 });
  return run.id;
}

describe('keep a finished run as a scenario', () => {
  it('keeps a lead’s practice run on their cell: operator events only, its length and seed; a name once per cell', async () => {
    const cell = await createCell({ ownerId: lead.id, name: 'Scenario cell', origin: 'template', document: doc(), message: 'v1' });
    const runId = await finishedRun(lead, cell.id);
    const res = await call(keep.POST, `/api/runs/${runId}/scenario`, { method: 'POST', cookie, params: { id: runId }, body: { name: 'Guard opened after a start' } });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({ leftOut: 1, scenario: { name: 'Guard opened after a start', cellId: cell.id, eventCount: 4, durationMs: 6000, seed: 77, sourceRunId: runId, rules: [], faults: [] } });
    const again = await call(keep.POST, `/x`, { method: 'POST', cookie, params: { id: runId }, body: { name: 'Guard opened after a start' } });
    expect(again.status).toBe(409);
    expect(again.body).toMatchObject({ fields: { name: [expect.any(String)] } });

    const list = await call(scenarios.GET, `/x`, { cookie, params: { id: cell.id } });
    expect(list.body).toMatchObject({ scenarios: [{ name: 'Guard opened after a start', eventCount: 4 }] });
    const id = (list.body as { scenarios: { id: string }[] }).scenarios[0].id;
    const one = await call(scenario.GET, `/x`, { cookie, params: { id: cell.id, scenarioId: id } });
    expect((one.body as { scenario: { events: LoggedEvent[] } }).scenario.events.map((e) => e.event.type)).toEqual(['set-field', 'press', 'release', 'set-field']);
  });

  it('keeps a drill run for the drill’s trainer, with the drill’s fault cards and grading rules', async () => {
    const trainer = await demoUser('trainer@kestrelvale.test');
    const student = await demoUser('ada.lindqvist@kestrelvale.test');
    const cell = await createCell({ ownerId: trainer.id, name: 'Scenario drill base', origin: 'template', document: doc(), message: 'v1' });
    const drill = await createDrill(trainer.id, drillInputSchema.parse(drillBody(cell.id, { title: 'Scenario drill' })));
    const a = await createAssignment({ drillId: drill.id, cohortId: await demoCohortId(trainer.id), opensAt: new Date(Date.now() - 60_000).toISOString(), closesAt: new Date(Date.now() + 86_400_000).toISOString(), assignedBy: trainer.id });
    const runId = await finishedRun(student, cell.id, 'drill', { drillId: drill.id, assignmentId: a.id });
    const res = await call(keep.POST, `/x`, { method: 'POST', cookie: await sessionCookie(trainer), params: { id: runId }, body: { name: 'A student’s stop-circuit hunt' } });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({ scenario: { faults: drill.faults, rules: drill.rules.map((w) => w.rule), seed: 77 } });
    // The student may read the run but is no lead or trainer; another lead cannot read it at all.
    expect((await call(keep.POST, `/x`, { method: 'POST', cookie: await sessionCookie(student), params: { id: runId }, body: { name: 'mine' } })).status).toBe(403);
    expect((await call(keep.POST, `/x`, { method: 'POST', cookie: await sessionCookie(await makeUser('lead')), params: { id: runId }, body: { name: 'mine' } })).status).toBe(404);
  });

  it('refuses a run that is not finished (409) and a run on someone else’s cell (403)', async () => {
    const cell = await createCell({ ownerId: lead.id, name: 'Active run cell', origin: 'template', document: doc(), message: 'v1' });
    const active = await createRun({ userId: lead.id, mode: 'practice', cellId: cell.id, cellVersion: 1, seed: 1 });
    expect((await call(keep.POST, `/x`, { method: 'POST', cookie, params: { id: active.id }, body: { name: 'too early' } })).status).toBe(409);
    const other = await makeUser('lead');
    const otherCell = await createCell({ ownerId: other.id, name: 'Not mine', origin: 'template', document: doc(), message: 'v1' });
    // A lead's own run on another lead's cell (a run they may read, on a cell that is not theirs).
    const runId = await finishedRun(lead, otherCell.id);
    expect((await call(keep.POST, `/x`, { method: 'POST', cookie, params: { id: runId }, body: { name: 'not my cell' } })).status).toBe(403);
  });
});

describe('scenarios in the runner’s formats', () => {
  it('imports a scenario, renames it, rewrites its rules, refuses bad ones, deletes it', async () => {
    const cell = await createCell({ ownerId: lead.id, name: 'Imported scenarios', origin: 'template', document: doc(), message: 'v1' });
    const body = {
      name: 'Start and stop',
      events: EVENTS.slice(0, 3),
      rules: [{ id: 'cycle', kind: 'eventually', withinMs: 15000, p: { signal: 'ctl.cycles', op: '>=', value: 1 } }],
      durationMs: 16000,
    };
    const made = await call(scenarios.POST, `/x`, { method: 'POST', cookie, params: { id: cell.id }, body });
    expect(made.status, JSON.stringify(made.body)).toBe(201);
    const id = (made.body as { scenario: { id: string } }).scenario.id;
    const late = await call(scenarios.POST, `/x`, { method: 'POST', cookie, params: { id: cell.id }, body: { ...body, name: 'Too short', durationMs: 1000 } });
    expect(late.status).toBe(422);
    expect(Object.keys((late.body as { fields: object }).fields)).toContain('events.1.t');

    const renamed = await call(scenario.PATCH, `/x`, { method: 'PATCH', cookie, params: { id: cell.id, scenarioId: id }, body: { name: 'Start, then stop', rules: [{ id: 'never-fault', kind: 'never', p: { signal: 'hs.fault', op: '==', value: 1 } }] } });
    expect(renamed.status).toBe(200);
    expect(renamed.body).toMatchObject({ scenario: { name: 'Start, then stop', rules: [{ id: 'never-fault' }] } });
    const dup = await call(scenario.PATCH, `/x`, { method: 'PATCH', cookie, params: { id: cell.id, scenarioId: id }, body: { rules: [{ id: 'a', kind: 'never', p: { signal: 'x', op: '==', value: 1 } }, { id: 'a', kind: 'never', p: { signal: 'x', op: '==', value: 1 } }] } });
    expect(dup.status).toBe(422);

    expect((await call(scenario.DELETE, `/x`, { method: 'DELETE', cookie, params: { id: cell.id, scenarioId: id } })).status).toBe(200);
    expect((await call(scenario.GET, `/x`, { cookie, params: { id: cell.id, scenarioId: id } })).status).toBe(404);
    expect((await call(scenarios.GET, `/x`, { cookie: await sessionCookie(await makeUser('lead')), params: { id: cell.id } })).status).toBe(404);
    expect((await call(scenarios.GET, `/x`, { cookie: await sessionCookie(await demoUser('admin@kestrelvale.test')), params: { id: cell.id } })).status).toBe(403);
  });
});
