/**
 * The PLC-link routes' rows of the role × route matrix (route-matrix.test.ts spreads them in).
 * Trainers and leads start PLC links on cells they may read; students and admins get 403;
 * another person's session or cell is 404. Each `prepare` stops this process's sessions first
 * (the per-user cap is one) and starts a fresh one for the demo trainer on a test port.
 */
import * as links from '@/app/api/plc-links/route';
import * as link from '@/app/api/plc-links/[id]/route';
import * as registerMap from '@/app/api/plc-links/[id]/register-map/route';
import { createCell } from '@/db/cells';
import { cellDocumentSchema } from '@/simulator';
import { templateDocument } from '@/lib/cells/templates';
import { startSession, stopAllSessions } from '@/lib/plc-link/sessions';
import { at, type RouteCase, type World, byRole } from './route-matrix-cases';

const TRAINER_LEAD = (ok: number) => byRole('plcLink', ok);
const OWNER = (ok: number) => byRole('plcLink', ok, { lead: 404, otherTrainer: 404 });

// Ports 15030–15039 belong to the matrix (plc-link.test.ts uses 15021–15022).
let nextPort = 0;
const port = () => 15030 + (nextPort++ % 10);

async function trainerCell(w: World): Promise<string> {
  const document = cellDocumentSchema.parse(templateDocument('pick-and-place', 'PLC link matrix'));
  return (await createCell({ ownerId: w.users.trainer.id, name: 'PLC link matrix', origin: 'template', document, message: 'matrix' })).id;
}

async function trainerSession(w: World): Promise<string> {
  await stopAllSessions('stopped by the route matrix');
  const s = await startSession(w.users.trainer, { cellId: await trainerCell(w), port: port(), linkTimeoutMs: 1000 });
  return s.id;
}

export const PLC_LINK_ROUTES: RouteCase[] = [
  { name: 'GET /api/plc-links', handler: links.GET, method: 'GET', prepare: async () => ({ path: '/api/plc-links' }), expect: TRAINER_LEAD(200) },
  {
    name: 'POST /api/plc-links',
    handler: links.POST,
    method: 'POST',
    prepare: async (w) => {
      await stopAllSessions('stopped by the route matrix');
      return { path: '/api/plc-links', body: { cellId: await trainerCell(w), port: port(), linkTimeoutMs: 1000 } };
    },
    expect: OWNER(201),
  },
  {
    name: 'GET /api/plc-links/[id]',
    handler: link.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await trainerSession(w);
      return { path: `/api/plc-links/${id}`, params: at(id) };
    },
    expect: OWNER(200),
  },
  {
    name: 'DELETE /api/plc-links/[id]',
    handler: link.DELETE,
    method: 'DELETE',
    prepare: async (w) => {
      const id = await trainerSession(w);
      return { path: `/api/plc-links/${id}`, params: at(id) };
    },
    expect: OWNER(200),
  },
  {
    name: 'GET /api/plc-links/[id]/register-map',
    handler: registerMap.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await trainerSession(w);
      return { path: `/api/plc-links/${id}/register-map`, params: at(id) };
    },
    expect: OWNER(200),
  },
];
