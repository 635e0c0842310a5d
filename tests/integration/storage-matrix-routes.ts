/**
 * The rows of the role × route matrix (route-matrix.test.ts) for the files kept in the bucket:
 * the printed changeover report and the run archives. Each `prepare` makes its own target.
 */
import * as report from '@/app/api/changeovers/[id]/report/route';
import * as archive from '@/app/api/runs/[id]/archive/route';
import * as archiveOne from '@/app/api/runs/[id]/archive/[archiveId]/route';
import { createCell } from '@/db/cells';
import { createAssignment, createDrill } from '@/db/drills';
import { findRun, startAssignmentRun } from '@/db/runs';
import { drillInputSchema } from '@/lib/schemas/drills';
import { exportRunArchive } from '@/lib/reports/run-archive';
import { cellDocumentSchema, pickAndPlaceCell } from '@/simulator';
import { draftingChangeover } from './changeovers-fixtures';
import { drillBody } from './drills-fixtures';
import { at, type Actor, type RouteCase, type World, byRole } from './route-matrix-cases';

/** The changeover's readers (the opener, the demo lead, and the admin), as for GET …/record. */
const CHANGEOVER_READER = (ok: number) => byRole('changeovers', ok, { trainer: 404, otherTrainer: 404 });
/** A run's readers: its owner, its drill's trainer and admins. */
const RUN_READER = (ok: number): Record<Actor, number> => ({ anonymous: 401, student: ok, trainer: ok, lead: 404, admin: ok, otherTrainer: 404 });

/** A drill run of the demo student on a fresh drill of the demo trainer, assigned to the demo cohort. */
async function studentRun(w: World): Promise<string> {
  const cell = await createCell({ ownerId: w.users.trainer.id, name: 'Archive matrix base', origin: 'template', document: cellDocumentSchema.parse(pickAndPlaceCell), message: 'matrix' });
  const drill = await createDrill(w.users.trainer.id, drillInputSchema.parse(drillBody(cell.id, { title: 'Archive matrix drill' })));
  const a = await createAssignment({
    drillId: drill.id,
    cohortId: w.cohortId,
    opensAt: new Date(Date.now() - 60_000).toISOString(),
    closesAt: new Date(Date.now() + 86_400_000).toISOString(),
    assignedBy: w.users.trainer.id,
  });
  const { run } = await startAssignmentRun({ userId: w.users.student.id, mode: 'drill', drillId: drill.id, assignmentId: a.id, cellId: cell.id, cellVersion: 1, seed: 5 });
  return run.id;
}

export const STORAGE_ROUTES: RouteCase[] = [
  {
    // Before sign-off there is no report: readers get 404 too, others as for the record.
    name: 'GET /api/changeovers/[id]/report',
    handler: report.GET,
    method: 'GET',
    prepare: async (w) => {
      const { id } = await draftingChangeover(w.users.lead.id);
      return { path: `/api/changeovers/${id}/report`, params: at(id) };
    },
    expect: CHANGEOVER_READER(404),
  },
  {
    name: 'POST /api/runs/[id]/archive',
    handler: archive.POST,
    method: 'POST',
    prepare: async (w) => {
      const id = await studentRun(w);
      return { path: `/api/runs/${id}/archive`, params: at(id) };
    },
    expect: RUN_READER(201),
  },
  {
    // An archive the run's owner exported: the owner, the drill's trainer and admins may download it.
    name: 'GET /api/runs/[id]/archive/[archiveId]',
    handler: archiveOne.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await studentRun(w);
      const made = await exportRunArchive(w.users.student, (await findRun(id))!, 'owner', false);
      return { path: `/api/runs/${id}/archive/${made.id}`, params: at(id, { archiveId: made.id }) };
    },
    expect: RUN_READER(200),
  },
];
