/**
 * The drills, assignments, runs and gradebook rows of the role × route matrix
 * (route-matrix.test.ts spreads them into its table). Each `prepare` makes fresh targets: a
 * drill of the demo trainer on a new cell of theirs, assigned to the demo cohort (so the demo
 * student is a member), and for run routes a run of the demo student on its own assignment.
 * Ids of other people's drills and runs are 404 (they reveal nothing); role refusals are 403.
 */
import * as drills from '@/app/api/drills/route';
import * as drillOne from '@/app/api/drills/[id]/route';
import * as preview from '@/app/api/drills/[id]/preview/route';
import * as assets from '@/app/api/drills/[id]/assets/route';
import * as asset from '@/app/api/drills/[id]/assets/[assetId]/route';
import * as drillAssignments from '@/app/api/drills/[id]/assignments/route';
import * as assignments from '@/app/api/assignments/route';
import * as assignmentOne from '@/app/api/assignments/[id]/route';
import * as assignmentRun from '@/app/api/assignments/[id]/run/route';
import * as runs from '@/app/api/runs/route';
import * as runOne from '@/app/api/runs/[id]/route';
import * as batches from '@/app/api/runs/[id]/batches/route';
import * as view from '@/app/api/runs/[id]/view/route';
import * as submitRoute from '@/app/api/runs/[id]/submit/route';
import * as events from '@/app/api/runs/[id]/events/route';
import * as trace from '@/app/api/runs/[id]/trace/route';
import * as override from '@/app/api/runs/[id]/override/route';
import * as gradebook from '@/app/api/gradebook/route';
import * as gradebookCsv from '@/app/api/gradebook/csv/route';
import { createCell } from '@/db/cells';
import { createAssignment, createDrill } from '@/db/drills';
import { insertAsset } from '@/db/drill-assets';
import { startAssignmentRun } from '@/db/runs';
import { drillInputSchema } from '@/lib/schemas/drills';
import { submit } from '@/lib/runs/service';
import { cellDocumentSchema, pickAndPlaceCell } from '@/simulator';
import { drillBody } from './drills-fixtures';
import { at, type Actor, type RouteCase, type World, byRole } from './route-matrix-cases';

/** Trainer-only routes on a drill of the demo trainer: other trainers 404, other roles 403. */
const AUTHOR = (ok: number) => byRole('drills', ok, { otherTrainer: 404 });
/** Run routes only the run's owner (the demo student) may call. */
const RUN_OWNER = (ok: number): Record<Actor, number> => ({ anonymous: 401, student: ok, trainer: 404, lead: 404, admin: 404, otherTrainer: 404 });
/** Run routes its owner, the drill's trainer and admins may call. */
const RUN_READER = (ok: number): Record<Actor, number> => ({ anonymous: 401, student: ok, trainer: ok, lead: 404, admin: ok, otherTrainer: 404 });
const STUDENT_ONLY = (ok: number) => byRole('attemptDrills', ok);

const PNG_1x1 = Buffer.from('89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c4890000000d4944415478da63f8ffff3f0005fe02fea7d6a1bb0000000049454e44ae426082', 'hex');

async function trainerCell(w: World): Promise<string> {
  const c = await createCell({ ownerId: w.users.trainer.id, name: 'Matrix drill base', origin: 'template', document: cellDocumentSchema.parse(pickAndPlaceCell), message: 'matrix' });
  return c.id;
}

/** A drill of the demo trainer, assigned to the demo cohort (open for a day). */
async function drillAndAssignment(w: World): Promise<{ drillId: string; assignmentId: string; cellId: string }> {
  const cellId = await trainerCell(w);
  const drill = await createDrill(w.users.trainer.id, drillInputSchema.parse(drillBody(cellId, { title: 'Matrix drill' })));
  const a = await createAssignment({
    drillId: drill.id,
    cohortId: w.cohortId,
    opensAt: new Date(Date.now() - 60_000).toISOString(),
    closesAt: new Date(Date.now() + 86_400_000).toISOString(),
    assignedBy: w.users.trainer.id,
  });
  return { drillId: drill.id, assignmentId: a.id, cellId };
}

/** A run of the demo student on a fresh assignment. */
async function studentRun(w: World): Promise<string> {
  const { drillId, assignmentId, cellId } = await drillAndAssignment(w);
  const { run } = await startAssignmentRun({ userId: w.users.student.id, mode: 'drill', drillId, assignmentId, cellId, cellVersion: 1, seed: 5 });
  return run.id;
}

/** The matrix's `call` sends JSON; an upload needs multipart, so rebuild the request with a form (same cookie). */
async function uploadHandler(req: Request, ctx: { params: Promise<{ id: string }> }): Promise<Response> {
  const form = new FormData();
  form.append('file', new Blob([new Uint8Array(PNG_1x1)], { type: 'image/png' }), 'matrix.png');
  const headers: Record<string, string> = {};
  const cookie = req.headers.get('cookie');
  if (cookie) headers.cookie = cookie;
  return assets.POST(new Request(req.url, { method: 'POST', headers, body: form }), ctx);
}

const window = () => ({ opensAt: new Date(Date.now() - 60_000).toISOString(), closesAt: new Date(Date.now() + 86_400_000).toISOString() });

export const DRILL_ROUTES: RouteCase[] = [
  { name: 'GET /api/drills', handler: drills.GET, method: 'GET', prepare: async () => ({ path: '/api/drills' }), expect: byRole('drills', 200) },
  {
    name: 'POST /api/drills',
    handler: drills.POST,
    method: 'POST',
    prepare: async (w) => ({ path: '/api/drills', body: drillBody(await trainerCell(w)) }),
    // The base cell is the demo trainer's: another trainer's drill on it is refused as a field error.
    expect: byRole('drills', 201, { otherTrainer: 422 }),
  },
  ...(['GET', 'PATCH', 'DELETE'] as const).map((method) => ({
    name: `${method} /api/drills/[id]`,
    handler: drillOne[method],
    method,
    prepare: async (w: World) => {
      const { drillId } = await drillAndAssignment(w);
      return { path: `/api/drills/${drillId}`, params: at(drillId), body: method === 'PATCH' ? { title: 'Matrix renamed' } : undefined };
    },
    expect: AUTHOR(200),
  })),
  {
    name: 'GET /api/drills/[id]/preview',
    handler: preview.GET,
    method: 'GET',
    prepare: async (w) => {
      const { drillId } = await drillAndAssignment(w);
      return { path: `/api/drills/${drillId}/preview`, params: at(drillId) };
    },
    expect: AUTHOR(200),
  },
  {
    name: 'GET /api/drills/[id]/assets',
    handler: assets.GET,
    method: 'GET',
    prepare: async (w) => {
      const { drillId } = await drillAndAssignment(w);
      return { path: `/api/drills/${drillId}/assets`, params: at(drillId) };
    },
    expect: AUTHOR(200),
  },
  {
    name: 'POST /api/drills/[id]/assets',
    handler: uploadHandler,
    method: 'POST',
    prepare: async (w) => {
      const { drillId } = await drillAndAssignment(w);
      return { path: `/api/drills/${drillId}/assets`, params: at(drillId) };
    },
    expect: AUTHOR(201),
  },
  {
    name: 'GET /api/drills/[id]/assets/[assetId]',
    handler: asset.GET,
    method: 'GET',
    prepare: async (w) => {
      const { drillId } = await drillAndAssignment(w);
      const a = await insertAsset({ drillId, name: 'm.png', mediaType: 'image/png', bytes: PNG_1x1, uploadedBy: w.users.trainer.id });
      return { path: `/api/drills/${drillId}/assets/${a.id}`, params: at(drillId, { assetId: a.id }) };
    },
    // The demo student's cohort has the drill assigned: the brief's images are theirs to read.
    expect: { anonymous: 401, student: 200, trainer: 200, lead: 404, admin: 200, otherTrainer: 404 },
  },
  {
    name: 'GET /api/drills/[id]/assignments',
    handler: drillAssignments.GET,
    method: 'GET',
    prepare: async (w) => {
      const { drillId } = await drillAndAssignment(w);
      return { path: `/api/drills/${drillId}/assignments`, params: at(drillId) };
    },
    expect: AUTHOR(200),
  },
  {
    name: 'POST /api/drills/[id]/assignments',
    handler: drillAssignments.POST,
    method: 'POST',
    prepare: async (w) => {
      const { drillId } = await drillAndAssignment(w);
      return { path: `/api/drills/${drillId}/assignments`, params: at(drillId), body: { cohortId: w.cohortId, ...window() } };
    },
    expect: AUTHOR(201),
  },
  {
    name: 'GET /api/assignments',
    handler: assignments.GET,
    method: 'GET',
    prepare: async () => ({ path: '/api/assignments' }),
    expect: byRole('assignments', 200),
  },
  {
    name: 'GET /api/assignments/[id]',
    handler: assignmentOne.GET,
    method: 'GET',
    prepare: async (w) => {
      const { assignmentId } = await drillAndAssignment(w);
      return { path: `/api/assignments/${assignmentId}`, params: at(assignmentId) };
    },
    expect: STUDENT_ONLY(200),
  },
  {
    name: 'POST /api/assignments/[id]/run',
    handler: assignmentRun.POST,
    method: 'POST',
    prepare: async (w) => {
      const { assignmentId } = await drillAndAssignment(w);
      return { path: `/api/assignments/${assignmentId}/run`, params: at(assignmentId) };
    },
    expect: STUDENT_ONLY(201),
  },
  {
    name: 'GET /api/runs',
    handler: runs.GET,
    method: 'GET',
    prepare: async () => ({ path: '/api/runs' }),
    expect: byRole('cells', 200),
  },
  {
    name: 'POST /api/runs',
    handler: runs.POST,
    method: 'POST',
    prepare: async (w) => {
      // A trainer's cell shared with the demo cohort: the owner and the cohort's student may practise on it.
      const { shareCell } = await import('@/db/cells');
      const cellId = await trainerCell(w);
      await shareCell(cellId, w.cohortId, w.users.trainer.id);
      return { path: '/api/runs', body: { cellId } };
    },
    expect: byRole('cells', 201, { lead: 404, otherTrainer: 404 }),
  },
  {
    name: 'GET /api/runs/[id]',
    handler: runOne.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await studentRun(w);
      return { path: `/api/runs/${id}`, params: at(id) };
    },
    expect: RUN_READER(200),
  },
  {
    name: 'POST /api/runs/[id]/batches',
    handler: batches.POST,
    method: 'POST',
    prepare: async (w, actor) => {
      const id = await studentRun(w);
      return { path: `/api/runs/${id}/batches`, params: at(id), body: { key: `matrix-${actor}-${id}`, seq: 1, untilMs: 1000, events: [{ t: 500, event: { type: 'set-field', device: 'part', active: true } }] } };
    },
    expect: RUN_OWNER(201),
  },
  {
    name: 'GET /api/runs/[id]/view',
    handler: view.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await studentRun(w);
      return { path: `/api/runs/${id}/view?t=1000`, params: at(id) };
    },
    expect: RUN_OWNER(200),
  },
  {
    name: 'POST /api/runs/[id]/submit',
    handler: submitRoute.POST,
    method: 'POST',
    prepare: async (w) => {
      const id = await studentRun(w);
      return { path: `/api/runs/${id}/submit`, params: at(id), body: { diagnosis: { kind: 'open-wire', location: 'w-stop' } } };
    },
    expect: RUN_OWNER(200),
  },
  {
    name: 'GET /api/runs/[id]/events',
    handler: events.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await studentRun(w);
      return { path: `/api/runs/${id}/events?page=1&pageSize=50`, params: at(id) };
    },
    expect: RUN_READER(200),
  },
  {
    name: 'GET /api/runs/[id]/trace',
    handler: trace.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await studentRun(w);
      return { path: `/api/runs/${id}/trace?page=1`, params: at(id) };
    },
    expect: RUN_READER(200),
  },
  {
    name: 'POST /api/runs/[id]/override',
    handler: override.POST,
    method: 'POST',
    prepare: async (w) => {
      const id = await studentRun(w);
      const { findRun } = await import('@/db/runs');
      await submit((await findRun(id))!, { kind: 'open-wire', location: 'w-stop', note: '' });
      return { path: `/api/runs/${id}/override`, params: at(id), body: { grade: 90, reason: 'Matrix override' } };
    },
    expect: AUTHOR(200),
  },
  {
    name: 'GET /api/gradebook',
    handler: gradebook.GET,
    method: 'GET',
    prepare: async (w) => ({ path: `/api/gradebook?cohort=${w.cohortId}` }),
    expect: AUTHOR(200),
  },
  {
    name: 'GET /api/gradebook/csv',
    handler: gradebookCsv.GET,
    method: 'GET',
    prepare: async (w) => ({ path: `/api/gradebook/csv?cohort=${w.cohortId}` }),
    expect: AUTHOR(200),
  },
];
