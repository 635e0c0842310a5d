/**
 * The live board's rows of the role × route matrix (route-matrix.test.ts spreads them in). Each
 * `prepare` makes a fresh drill of the demo trainer assigned to the demo cohort (Ada is in it).
 */
import { afterAll } from 'vitest';
import * as live from '@/app/api/assignments/[id]/live/route';
import * as liveStream from '@/app/api/assignments/[id]/live/stream/route';
import * as messages from '@/app/api/assignments/[id]/messages/route';
import * as messageStream from '@/app/api/assignments/[id]/messages/stream/route';
import * as findings from '@/app/api/assignments/[id]/findings/route';
import { createCell } from '@/db/cells';
import { createAssignment, createDrill } from '@/db/drills';
import { closeLiveEvents } from '@/lib/live/listener';
import { drillInputSchema } from '@/lib/schemas/drills';
import { cellDocumentSchema, pickAndPlaceCell } from '@/simulator';
import { drillBody } from './drills-fixtures';
import { at, type RouteCase, type World, byRole } from './route-matrix-cases';

// The stream rows open this process's LISTEN connection: close it with the file.
afterAll(async () => {
  await closeLiveEvents();
});

/** An assignment of a new drill of the demo trainer to the demo cohort; closed when asked. */
async function assignment(w: World, closed = false): Promise<string> {
  const cell = await createCell({ ownerId: w.users.trainer.id, name: 'Matrix live drill', origin: 'template', document: cellDocumentSchema.parse(pickAndPlaceCell), message: 'matrix' });
  const drill = await createDrill(w.users.trainer.id, drillInputSchema.parse(drillBody(cell.id, { title: 'Matrix live drill' })));
  const now = Date.now();
  const a = await createAssignment({
    drillId: drill.id,
    cohortId: w.cohortId,
    opensAt: new Date(now - 7_200_000).toISOString(),
    closesAt: new Date(closed ? now - 60_000 : now + 86_400_000).toISOString(),
    assignedBy: w.users.trainer.id,
  });
  return a.id;
}

type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;

/** A stream handler as the matrix calls it: read the status, cancel a 200's endless body. */
function streamStatus(handler: unknown): Handler {
  return async (req, ctx) => {
    const abort = new AbortController();
    const res = await (handler as Handler)(new Request(req.url, { headers: req.headers, signal: abort.signal }), ctx);
    if (res.status !== 200) return res;
    await res.body?.cancel();
    abort.abort();
    return new Response(null, { status: 200 });
  };
}

/** The drill's trainer and admins; other roles 403 by role, another trainer 404. */
const WATCHER = (ok: number) => byRole('drills', ok, { otherTrainer: 404 });
/** Students of the cohort only. */
const COHORT_STUDENT = (ok: number) => byRole('attemptDrills', ok);

export const LIVE_ROUTES: RouteCase[] = [
  {
    name: 'GET /api/assignments/[id]/live',
    handler: live.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await assignment(w);
      return { path: `/api/assignments/${id}/live`, params: at(id) };
    },
    expect: WATCHER(200),
  },
  {
    name: 'GET /api/assignments/[id]/live/stream',
    handler: streamStatus(liveStream.GET),
    method: 'GET',
    prepare: async (w) => {
      const id = await assignment(w);
      return { path: `/api/assignments/${id}/live/stream`, params: at(id) };
    },
    expect: WATCHER(200),
  },
  {
    name: 'POST /api/assignments/[id]/messages',
    handler: messages.POST,
    method: 'POST',
    prepare: async (w) => {
      const id = await assignment(w);
      return { path: `/api/assignments/${id}/messages`, params: at(id), body: { kind: 'hint', body: 'Matrix hint', to: null } };
    },
    expect: WATCHER(201),
  },
  {
    name: 'GET /api/assignments/[id]/messages',
    handler: messages.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await assignment(w);
      return { path: `/api/assignments/${id}/messages`, params: at(id) };
    },
    expect: COHORT_STUDENT(200),
  },
  {
    name: 'GET /api/assignments/[id]/messages/stream',
    handler: streamStatus(messageStream.GET),
    method: 'GET',
    prepare: async (w) => {
      const id = await assignment(w);
      return { path: `/api/assignments/${id}/messages/stream`, params: at(id) };
    },
    expect: COHORT_STUDENT(200),
  },
  {
    name: 'GET /api/assignments/[id]/findings',
    handler: findings.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await assignment(w, true);
      return { path: `/api/assignments/${id}/findings`, params: at(id) };
    },
    expect: WATCHER(200),
  },
];
