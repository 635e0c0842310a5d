/**
 * The cells routes' rows of the role × route matrix (route-matrix.test.ts spreads them into
 * its table). Each `prepare` makes a fresh cell owned by the demo trainer, so the trainer is
 * the owner (200/201), other signed-in people see 404 (ids of other people's cells reveal
 * nothing), trainer/lead-only routes give students 403, admins get 403 (cells are not theirs
 * to work on) and anonymous callers 401.
 */
import * as cells from '@/app/api/cells/route';
import * as cellImport from '@/app/api/cells/import/route';
import * as csvTemplates from '@/app/api/cells/csv-templates/[kind]/route';
import * as cell from '@/app/api/cells/[id]/route';
import * as duplicate from '@/app/api/cells/[id]/duplicate/route';
import * as versions from '@/app/api/cells/[id]/versions/route';
import * as version from '@/app/api/cells/[id]/versions/[version]/route';
import * as shares from '@/app/api/cells/[id]/shares/route';
import * as share from '@/app/api/cells/[id]/shares/[cohortId]/route';
import * as copy from '@/app/api/cells/[id]/copy/route';
import * as exportJson from '@/app/api/cells/[id]/export/route';
import * as csv from '@/app/api/cells/[id]/csv/[kind]/route';
import { createCell, shareCell } from '@/db/cells';
import { cellDocumentSchema } from '@/simulator';
import { csvTemplate } from '@/lib/cells/csv';
import { templateDocument } from '@/lib/cells/templates';
import { at, type RouteCase, type World, byRole } from './route-matrix-cases';

const ANY_CELL_ROLE = (ok: number) => byRole('cells', ok);
const OWNER = (ok: number) => byRole('cells', ok, { student: 404, lead: 404, otherTrainer: 404 });
const OWNER_SHARE_ROLE = (ok: number) => byRole('shareCells', ok, { lead: 404, otherTrainer: 404 });

/** A fresh pick-and-place cell owned by the demo trainer. */
async function trainerCell(w: World): Promise<string> {
  const document = cellDocumentSchema.parse(templateDocument('pick-and-place', 'Matrix cell'));
  const made = await createCell({ ownerId: w.users.trainer.id, name: 'Matrix cell', origin: 'template', document, message: 'matrix' });
  return made.id;
}

export const CELL_ROUTES: RouteCase[] = [
  { name: 'GET /api/cells', handler: cells.GET, method: 'GET', prepare: async () => ({ path: '/api/cells' }), expect: ANY_CELL_ROLE(200) },
  {
    name: 'POST /api/cells',
    handler: cells.POST,
    method: 'POST',
    prepare: async (_w, actor) => ({ path: '/api/cells', body: { name: `Matrix ${actor}`, template: 'blank' } }),
    expect: ANY_CELL_ROLE(201),
  },
  {
    name: 'POST /api/cells/import',
    handler: cellImport.POST,
    method: 'POST',
    prepare: async () => ({ path: '/api/cells/import', body: { document: templateDocument('panel-starter', 'Imported in the matrix') } }),
    expect: ANY_CELL_ROLE(201),
  },
  {
    name: 'GET /api/cells/csv-templates/[kind]',
    handler: csvTemplates.GET,
    method: 'GET',
    prepare: async () => ({ path: '/api/cells/csv-templates/point-map', params: { kind: 'point-map' } }),
    expect: ANY_CELL_ROLE(200),
  },
  {
    name: 'GET /api/cells/[id]',
    handler: cell.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await trainerCell(w);
      return { path: `/api/cells/${id}`, params: at(id) };
    },
    expect: OWNER(200),
  },
  {
    name: 'PATCH /api/cells/[id]',
    handler: cell.PATCH,
    method: 'PATCH',
    prepare: async (w) => {
      const id = await trainerCell(w);
      return { path: `/api/cells/${id}`, params: at(id), body: { name: 'Renamed in the matrix' } };
    },
    expect: OWNER(200),
  },
  {
    name: 'DELETE /api/cells/[id]',
    handler: cell.DELETE,
    method: 'DELETE',
    prepare: async (w) => {
      const id = await trainerCell(w);
      return { path: `/api/cells/${id}`, params: at(id) };
    },
    expect: OWNER(200),
  },
  {
    name: 'POST /api/cells/[id]/duplicate',
    handler: duplicate.POST,
    method: 'POST',
    prepare: async (w) => {
      const id = await trainerCell(w);
      return { path: `/api/cells/${id}/duplicate`, params: at(id), body: {} };
    },
    expect: OWNER(201),
  },
  {
    name: 'GET /api/cells/[id]/versions',
    handler: versions.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await trainerCell(w);
      return { path: `/api/cells/${id}/versions`, params: at(id) };
    },
    expect: OWNER(200),
  },
  {
    name: 'POST /api/cells/[id]/versions',
    handler: versions.POST,
    method: 'POST',
    prepare: async (w) => {
      const id = await trainerCell(w);
      return { path: `/api/cells/${id}/versions`, params: at(id), body: { baseVersion: 1, document: templateDocument('pick-and-place', 'Saved'), message: 'matrix' } };
    },
    expect: OWNER(201),
  },
  {
    name: 'GET /api/cells/[id]/versions/[version]',
    handler: version.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await trainerCell(w);
      return { path: `/api/cells/${id}/versions/1`, params: at(id, { version: '1' }) };
    },
    expect: OWNER(200),
  },
  {
    name: 'GET /api/cells/[id]/shares',
    handler: shares.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await trainerCell(w);
      return { path: `/api/cells/${id}/shares`, params: at(id) };
    },
    expect: OWNER_SHARE_ROLE(200),
  },
  {
    name: 'POST /api/cells/[id]/shares',
    handler: shares.POST,
    method: 'POST',
    prepare: async (w) => {
      const id = await trainerCell(w);
      return { path: `/api/cells/${id}/shares`, params: at(id), body: { cohortId: w.cohortId } };
    },
    expect: OWNER_SHARE_ROLE(200),
  },
  {
    name: 'DELETE /api/cells/[id]/shares/[cohortId]',
    handler: share.DELETE,
    method: 'DELETE',
    prepare: async (w) => {
      const id = await trainerCell(w);
      await shareCell(id, w.cohortId, w.users.trainer.id);
      return { path: `/api/cells/${id}/shares/${w.cohortId}`, params: at(id, { cohortId: w.cohortId }) };
    },
    // The demo student can read the shared cell but is not a share role: 403 before any lookup.
    expect: OWNER_SHARE_ROLE(200),
  },
  {
    name: 'POST /api/cells/[id]/copy',
    handler: copy.POST,
    method: 'POST',
    prepare: async (w) => {
      const id = await trainerCell(w);
      await shareCell(id, w.cohortId, w.users.trainer.id);
      return { path: `/api/cells/${id}/copy`, params: at(id) };
    },
    expect: byRole('copySharedCells', 201),
  },
  {
    name: 'GET /api/cells/[id]/export',
    handler: exportJson.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await trainerCell(w);
      return { path: `/api/cells/${id}/export`, params: at(id) };
    },
    expect: OWNER(200),
  },
  {
    name: 'GET /api/cells/[id]/csv/[kind]',
    handler: csv.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await trainerCell(w);
      return { path: `/api/cells/${id}/csv/io-list`, params: at(id, { kind: 'io-list' }) };
    },
    expect: OWNER(200),
  },
  {
    name: 'POST /api/cells/[id]/csv/[kind]',
    handler: csv.POST,
    method: 'POST',
    prepare: async (w) => {
      const id = await trainerCell(w);
      return { path: `/api/cells/${id}/csv/point-map`, params: at(id, { kind: 'point-map' }), body: { baseVersion: 1, csv: csvTemplate('point-map') } };
    },
    expect: OWNER(201),
  },
];
