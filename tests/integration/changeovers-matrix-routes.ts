/**
 * The changeover routes' rows of the role × route matrix (route-matrix.test.ts spreads them
 * into its table). Each `prepare` makes a fresh changeover of the demo lead on a fresh cell of
 * theirs, so the lead is the opener; the admin reads any changeover (and may countersign) but
 * changes none (403); trainers who are not asked to countersign see 404 (ids reveal nothing);
 * students have no changeovers (403); anonymous callers 401.
 */
import * as changeovers from '@/app/api/changeovers/route';
import * as one from '@/app/api/changeovers/[id]/route';
import * as pin from '@/app/api/changeovers/[id]/pin/route';
import * as diff from '@/app/api/changeovers/[id]/diff/route';
import * as ioSheet from '@/app/api/changeovers/[id]/io-sheet/route';
import * as sign from '@/app/api/changeovers/[id]/sign/route';
import * as countersign from '@/app/api/changeovers/[id]/countersign/route';
import * as rollback from '@/app/api/changeovers/[id]/rollback/route';
import * as record from '@/app/api/changeovers/[id]/record/route';
import { draftingChangeover, cellWithProposal } from './changeovers-fixtures';
import { at, type RouteCase, type World, byRole } from './route-matrix-cases';

/** Reading routes: the opener (demo lead) and the admin. */
const READER = (ok: number) => byRole('changeovers', ok, { trainer: 404, otherTrainer: 404 });
/** Changing routes: the opener only; the admin reads but does not change (403). */
const EDITOR = (ok: number) => byRole('changeovers', ok, { trainer: 404, admin: 403, otherTrainer: 404 });

const fresh = async (w: World, opts: { edited?: boolean; countersignerId?: string } = {}) => (await draftingChangeover(w.users.lead.id, opts)).id;
const path = (id: string, rest = '') => `/api/changeovers/${id}${rest}`;

export const CHANGEOVER_ROUTES: RouteCase[] = [
  {
    name: 'GET /api/changeovers',
    handler: changeovers.GET,
    method: 'GET',
    prepare: async () => ({ path: '/api/changeovers' }),
    expect: byRole('changeovers', 200),
  },
  {
    name: 'POST /api/changeovers',
    handler: changeovers.POST,
    method: 'POST',
    // The cell is the caller's own where they have one (trainers and leads): a cell of someone else is a field error.
    prepare: async (w, actor) => {
      const owner = actor === 'trainer' || actor === 'otherTrainer' || actor === 'lead' ? w.users[actor].id : w.users.lead.id;
      return { path: '/api/changeovers', body: { cellId: await cellWithProposal(owner), title: `Matrix ${actor}` } };
    },
    expect: byRole('openChangeovers', 201),
  },
  {
    name: 'GET /api/changeovers/[id]',
    handler: one.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await fresh(w);
      return { path: path(id), params: at(id) };
    },
    expect: READER(200),
  },
  {
    name: 'PATCH /api/changeovers/[id]',
    handler: one.PATCH,
    method: 'PATCH',
    prepare: async (w) => {
      const id = await fresh(w);
      return { path: path(id), params: at(id), body: { title: 'Renamed in the matrix' } };
    },
    expect: EDITOR(200),
  },
  {
    name: 'POST /api/changeovers/[id]/pin',
    handler: pin.POST,
    method: 'POST',
    prepare: async (w) => {
      const id = await fresh(w);
      return { path: path(id, '/pin'), params: at(id) };
    },
    expect: EDITOR(200),
  },
  {
    name: 'DELETE /api/changeovers/[id]/pin',
    handler: pin.DELETE,
    method: 'DELETE',
    prepare: async (w) => {
      const id = await fresh(w);
      return { path: path(id, '/pin'), params: at(id) };
    },
    expect: EDITOR(200),
  },
  {
    name: 'GET /api/changeovers/[id]/diff',
    handler: diff.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await fresh(w);
      return { path: path(id, '/diff'), params: at(id) };
    },
    expect: READER(200),
  },
  {
    name: 'GET /api/changeovers/[id]/io-sheet',
    handler: ioSheet.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await fresh(w);
      return { path: path(id, '/io-sheet'), params: at(id) };
    },
    expect: READER(200),
  },
  {
    // Not pinned, no evidence: the opener is refused with the reasons (409).
    name: 'POST /api/changeovers/[id]/sign',
    handler: sign.POST,
    method: 'POST',
    prepare: async (w, actor) => {
      const id = await fresh(w);
      const name = actor === 'anonymous' ? 'Nobody' : w.users[actor].name;
      return { path: path(id, '/sign'), params: at(id), body: { baseVersion: 1, proposedVersion: 2, confirmName: name } };
    },
    expect: EDITOR(409),
  },
  {
    name: 'DELETE /api/changeovers/[id]/sign',
    handler: sign.DELETE,
    method: 'DELETE',
    prepare: async (w) => {
      const id = await fresh(w);
      return { path: path(id, '/sign'), params: at(id) };
    },
    expect: EDITOR(200),
  },
  {
    // The demo trainer is asked to countersign: they may read it; nobody has signed yet (409).
    // The lead opened it and may not countersign their own change (403).
    name: 'POST /api/changeovers/[id]/countersign',
    handler: countersign.POST,
    method: 'POST',
    prepare: async (w, actor) => {
      const id = await fresh(w, { countersignerId: w.users.trainer.id });
      const name = actor === 'anonymous' ? 'Nobody' : w.users[actor].name;
      return { path: path(id, '/countersign'), params: at(id), body: { baseVersion: 1, proposedVersion: 2, confirmName: name } };
    },
    expect: byRole('countersign', 409, { lead: 403, otherTrainer: 404 }),
  },
  {
    name: 'POST /api/changeovers/[id]/rollback',
    handler: rollback.POST,
    method: 'POST',
    prepare: async (w) => {
      const id = await fresh(w);
      return { path: path(id, '/rollback'), params: at(id), body: { confirm: true } };
    },
    expect: EDITOR(200),
  },
  {
    // No record before sign-off: readers get 404 too, others as for reading.
    name: 'GET /api/changeovers/[id]/record',
    handler: record.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await fresh(w);
      return { path: path(id, '/record'), params: at(id) };
    },
    expect: READER(404),
  },
];
