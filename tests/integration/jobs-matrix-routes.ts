/**
 * The job queue's rows of the role × route matrix (route-matrix.test.ts spreads them in). Each
 * `prepare` makes a fresh drill of the demo trainer; job rows are queued on it directly (the
 * worker process the global setup starts runs them, which no row depends on).
 */
import { afterAll } from 'vitest';
import * as jobOne from '@/app/api/jobs/[id]/route';
import * as jobStream from '@/app/api/jobs/stream/route';
import * as drillRegrade from '@/app/api/drills/[id]/regrade/route';
import { createCell } from '@/db/cells';
import { createDrill } from '@/db/drills';
import { closeSendingBoss } from '@/lib/jobs/boss';
import { closeJobEvents } from '@/lib/jobs/listener';
import { enqueueJob } from '@/lib/jobs/queue';
import { drillInputSchema } from '@/lib/schemas/drills';
import { cellDocumentSchema, pickAndPlaceCell } from '@/simulator';
import { drillBody } from './drills-fixtures';
import { at, type RouteCase, type World, byRole } from './route-matrix-cases';

// The rows open the queue's sending pool and the stream's LISTEN connection: close them with the file.
afterAll(async () => {
  await closeJobEvents();
  await closeSendingBoss();
});

/** A drill of the demo trainer on a new cell of theirs. */
async function trainerDrill(w: World): Promise<string> {
  const cell = await createCell({ ownerId: w.users.trainer.id, name: 'Matrix job drill', origin: 'template', document: cellDocumentSchema.parse(pickAndPlaceCell), message: 'matrix' });
  const drill = await createDrill(w.users.trainer.id, drillInputSchema.parse(drillBody(cell.id, { title: 'Matrix job drill' })));
  return drill.id;
}

/**
 * The stream's handler as the matrix calls it: a 200 is an endless body, so the row reads the
 * status, then cancels the stream and answers an empty 200 (errors pass through as they are).
 */
async function streamStatus(req: Request): Promise<Response> {
  const abort = new AbortController();
  const res = await jobStream.GET(new Request(req.url, { headers: req.headers, signal: abort.signal }), { params: Promise.resolve({}) });
  if (res.status !== 200) return res;
  await res.body?.cancel();
  abort.abort();
  return new Response(null, { status: 200 });
}

/** The drill's trainer and admins; other roles 403 by role, another trainer 404. */
const DRILL_READER = (ok: number) => byRole('drills', ok, { otherTrainer: 404 });

export const JOB_ROUTES: RouteCase[] = [
  {
    name: 'GET /api/jobs/[id]',
    handler: jobOne.GET,
    method: 'GET',
    prepare: async (w) => {
      const drillId = await trainerDrill(w);
      const job = await enqueueJob({ kind: 'drill-regrade', payload: { drillId }, ownerId: w.users.trainer.id, subject: `drill:${drillId}` });
      return { path: `/api/jobs/${job.id}`, params: at(job.id) };
    },
    // A job of a subject the caller may not read does not exist for them, whatever their role.
    expect: { anonymous: 401, student: 404, trainer: 200, lead: 404, admin: 200, otherTrainer: 404 },
  },
  {
    name: 'GET /api/jobs/stream',
    handler: streamStatus,
    method: 'GET',
    prepare: async (w) => {
      const drillId = await trainerDrill(w);
      return { path: `/api/jobs/stream?subject=drill:${drillId}` };
    },
    expect: DRILL_READER(200),
  },
  {
    name: 'POST /api/drills/[id]/regrade',
    handler: drillRegrade.POST,
    method: 'POST',
    prepare: async (w) => {
      const drillId = await trainerDrill(w);
      return { path: `/api/drills/${drillId}/regrade`, params: at(drillId) };
    },
    expect: DRILL_READER(201),
  },
];
