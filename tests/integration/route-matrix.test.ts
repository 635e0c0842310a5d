/**
 * Role × route matrix: every route handler (and, when they exist, every server
 * action) with the status each kind of caller must get. To cover a new route,
 * add one row to ROUTES; `prepare` makes a fresh target per call so rows do not
 * depend on each other.
 *
 * next-auth's own handler (/api/auth/[...nextauth]) is not in the table: it
 * needs Next.js's request scope; its authorize step is tested in
 * sign-in.test.ts and the whole sign-in in the Playwright suite.
 * There are no server actions yet: mutations go through route handlers.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as health from '@/app/api/health/route';
import * as cohorts from '@/app/api/cohorts/route';
import * as cohort from '@/app/api/cohorts/[id]/route';
import * as invitations from '@/app/api/cohorts/[id]/invitations/route';
import * as invitation from '@/app/api/cohorts/[id]/invitations/[invitationId]/route';
import * as member from '@/app/api/cohorts/[id]/members/[userId]/route';
import * as accept from '@/app/api/invitations/accept/route';
import * as join from '@/app/api/invitations/join/route';
import * as resets from '@/app/api/password-resets/route';
import * as resetComplete from '@/app/api/password-resets/complete/route';
import * as adminUsers from '@/app/api/admin/users/route';
import * as adminUser from '@/app/api/admin/users/[id]/route';
import * as adminMail from '@/app/api/admin/mail/route';
import * as adminMailOne from '@/app/api/admin/mail/[id]/route';
import { closeDb, db } from '@/db/knex';
import { findCohort } from '@/db/cohorts';
import { createInvitation } from '@/db/invitations';
import { createPasswordReset } from '@/db/password-resets';
import { insertMail } from '@/db/mail';
import { call, demoCohortId, demoUser, makeUser, otherTrainerWithCohort, sessionCookie, uniqueEmail } from './helpers';
import { CELL_ROUTES } from './cells-matrix-routes';
import { DRILL_ROUTES } from './drills-matrix-routes';
import { JOB_ROUTES } from './jobs-matrix-routes';
import { CHANGEOVER_ROUTES } from './changeovers-matrix-routes';
import { EVIDENCE_ROUTES } from './evidence-matrix-routes';
import { PLC_LINK_ROUTES } from './plc-link-matrix-routes';
import { LIVE_ROUTES } from './live-matrix-routes';
import { STORAGE_ROUTES } from './storage-matrix-routes';
import { ACTORS, type Actor, type RouteCase, type World, byRole } from './route-matrix-cases';

const PUBLIC = (status: number): Record<Actor, number> => ({
  anonymous: status,
  student: status,
  trainer: status,
  lead: status,
  admin: status,
  otherTrainer: status,
});
// The rest from the role table (byRole, route-matrix-cases.ts): who is refused by role is the table's to say.
/** A cohort's own trainer and admins; another trainer gets 403 for a cohort that is not theirs. */
const TRAINER_OWNED = (ok: number) => byRole('cohorts', ok, { otherTrainer: 403 });
const TRAINER_ANY = (ok: number) => byRole('cohorts', ok);
const ADMIN_ONLY = (ok: number) => byRole('administer', ok);

const ROUTES: RouteCase[] = [
  { name: 'GET /api/health', handler: health.GET, method: 'GET', prepare: async () => ({ path: '/api/health' }), expect: PUBLIC(200) },
  { name: 'GET /api/cohorts', handler: cohorts.GET, method: 'GET', prepare: async () => ({ path: '/api/cohorts' }), expect: TRAINER_ANY(200) },
  {
    name: 'POST /api/cohorts',
    handler: cohorts.POST,
    method: 'POST',
    prepare: async (_w, actor) => ({ path: '/api/cohorts', body: { name: `Matrix ${actor} ${uniqueEmail()}`, description: 'matrix' } }),
    expect: TRAINER_ANY(201),
  },
  {
    name: 'GET /api/cohorts/[id]',
    handler: cohort.GET,
    method: 'GET',
    prepare: async (w) => ({ path: `/api/cohorts/${w.cohortId}`, params: { id: w.cohortId } }),
    expect: TRAINER_OWNED(200),
  },
  {
    name: 'POST /api/cohorts/[id]/invitations',
    handler: invitations.POST,
    method: 'POST',
    prepare: async (w) => ({ path: `/api/cohorts/${w.cohortId}/invitations`, params: { id: w.cohortId }, body: { emails: [uniqueEmail('matrix')] } }),
    expect: TRAINER_OWNED(200),
  },
  {
    name: 'DELETE /api/cohorts/[id]/invitations/[invitationId]',
    handler: invitation.DELETE,
    method: 'DELETE',
    prepare: async (w) => {
      const inv = await createInvitation(w.cohortId, w.users.trainer.id, uniqueEmail('revoke'));
      if (inv.status !== 'invited') throw new Error('setup failed');
      return { path: `/api/cohorts/${w.cohortId}/invitations/${inv.invitationId}`, params: { id: w.cohortId, invitationId: inv.invitationId } };
    },
    expect: TRAINER_OWNED(200),
  },
  {
    name: 'DELETE /api/cohorts/[id]/members/[userId]',
    handler: member.DELETE,
    method: 'DELETE',
    prepare: async (w) => {
      const student = await makeUser('student');
      await db()('memberships').insert({ cohort_id: w.cohortId, user_id: student.id });
      return { path: `/api/cohorts/${w.cohortId}/members/${student.id}`, params: { id: w.cohortId, userId: student.id } };
    },
    expect: TRAINER_OWNED(200),
  },
  {
    name: 'POST /api/invitations/accept',
    handler: accept.POST,
    method: 'POST',
    prepare: async (w) => {
      const inv = await createInvitation(w.cohortId, w.users.trainer.id, uniqueEmail('accept'));
      if (inv.status !== 'invited') throw new Error('setup failed');
      return { path: '/api/invitations/accept', body: { token: inv.token, name: 'Matrix Person', password: 'a-long-enough-password' } };
    },
    expect: PUBLIC(201),
  },
  {
    name: 'POST /api/invitations/join',
    handler: join.POST,
    method: 'POST',
    prepare: async (w, actor) => {
      // The invitation is for the caller's own address (a student joining another cohort).
      const email = actor === 'anonymous' ? uniqueEmail('join') : w.users[actor].email;
      await db()('invitations').where({ cohort_id: w.otherCohortId, email }).update({ revoked_at: db().fn.now() });
      await db()('memberships').where({ cohort_id: w.otherCohortId }).delete();
      const k = db();
      const { newToken } = await import('@/db/tokens');
      const { token, hash } = newToken();
      await k('invitations').insert({
        cohort_id: w.otherCohortId,
        email,
        token_hash: hash,
        invited_by: w.users.otherTrainer.id,
        expires_at: k.raw("now() + interval '1 day'"),
      });
      return { path: '/api/invitations/join', body: { token } };
    },
    expect: byRole('joinCohorts', 200),
  },
  {
    name: 'POST /api/password-resets',
    handler: resets.POST,
    method: 'POST',
    prepare: async () => ({ path: '/api/password-resets', body: { email: 'ravi.mendez@kestrelvale.test' } }),
    expect: PUBLIC(202),
  },
  {
    name: 'POST /api/password-resets/complete',
    handler: resetComplete.POST,
    method: 'POST',
    prepare: async () => {
      const target = await makeUser('student');
      const reset = await createPasswordReset(target.email);
      return { path: '/api/password-resets/complete', body: { token: reset!.token, password: 'another-long-password' } };
    },
    expect: PUBLIC(200),
  },
  { name: 'GET /api/admin/users', handler: adminUsers.GET, method: 'GET', prepare: async () => ({ path: '/api/admin/users?q=kestrel&sort=email&dir=desc' }), expect: ADMIN_ONLY(200) },
  {
    name: 'PATCH /api/admin/users/[id]',
    handler: adminUser.PATCH,
    method: 'PATCH',
    prepare: async () => {
      const target = await makeUser('student');
      return { path: `/api/admin/users/${target.id}`, params: { id: target.id }, body: { role: 'trainer' } };
    },
    expect: ADMIN_ONLY(200),
  },
  { name: 'GET /api/admin/mail', handler: adminMail.GET, method: 'GET', prepare: async () => ({ path: '/api/admin/mail' }), expect: ADMIN_ONLY(200) },
  {
    name: 'GET /api/admin/mail/[id]',
    handler: adminMailOne.GET,
    method: 'GET',
    prepare: async () => {
      const id = await insertMail({
        envelopeFrom: 'a@example.test',
        envelopeTo: ['b@example.test'],
        fromHeader: 'a@example.test',
        toHeader: 'b@example.test',
        subject: 'matrix',
        textBody: 'hello',
        htmlBody: null,
        sizeBytes: 5,
      });
      return { path: `/api/admin/mail/${id}`, params: { id } };
    },
    expect: ADMIN_ONLY(200),
  },
  ...CELL_ROUTES,
  ...DRILL_ROUTES,
  ...JOB_ROUTES,
  ...CHANGEOVER_ROUTES,
  ...EVIDENCE_ROUTES,
  ...PLC_LINK_ROUTES,
  ...LIVE_ROUTES,
  ...STORAGE_ROUTES,
];

/** Server actions would be listed here with the same shape; there are none yet. */
const SERVER_ACTIONS: RouteCase[] = [];

let world: World;
const cookies = new Map<Actor, string | undefined>();

beforeAll(async () => {
  const trainer = await demoUser('trainer@kestrelvale.test');
  const other = await otherTrainerWithCohort();
  const demoCohort = { id: await demoCohortId(trainer.id) };
  world = {
    users: {
      student: await demoUser('ada.lindqvist@kestrelvale.test'),
      trainer,
      lead: await demoUser('lead@brennick.test'),
      admin: await demoUser('admin@kestrelvale.test'),
      otherTrainer: other.trainer,
    },
    cohortId: demoCohort.id,
    otherCohortId: other.cohortId,
  };
  cookies.set('anonymous', undefined);
  for (const actor of ACTORS) if (actor !== 'anonymous') cookies.set(actor, await sessionCookie(world.users[actor]));
});

afterAll(async () => {
  await closeDb();
});

describe.each([...ROUTES, ...SERVER_ACTIONS])('$name', (route) => {
  it.each(ACTORS.map((a) => [a, route.expect[a]] as const))('%s → %i', async (actor, expected) => {
    const prepared = await route.prepare(world, actor);
    const res = await call(route.handler, prepared.path, {
      method: route.method,
      cookie: cookies.get(actor),
      params: prepared.params,
      body: prepared.body,
    });
    expect(res.status, JSON.stringify(res.body)).toBe(expected);
    if (expected >= 400) expect(res.body).toHaveProperty('error');
  });
});

describe('matrix bookkeeping', () => {
  it('reads who is refused by role from the role table (lib/roles.ts)', () => {
    // Cohorts: trainers and admins (ROLE_TABLE.cohorts); everyone else 403 by role, anonymous 401.
    expect(byRole('cohorts', 200)).toEqual({ anonymous: 401, student: 403, trainer: 200, lead: 403, admin: 200, otherTrainer: 200 });
    expect(() => byRole('administer', 200, { trainer: 404 })).toThrow(/outside the role table/);
  });

  it('covers every route handler file under app/api', async () => {
    const { readdirSync } = await import('node:fs');
    const files = (readdirSync('app/api', { recursive: true }) as string[])
      .filter((f) => f.endsWith('/route.ts') && !f.includes('[...nextauth]'))
      .map((f) => `app/api/${f}`);
    const covered = new Set(ROUTES.map((r) => r.name.split(' ')[1]));
    const paths = files.map((f) => '/' + f.replace(/^app\//, '').replace(/\/route\.ts$/, ''));
    expect(paths.filter((p) => !covered.has(p))).toEqual([]);
  });

  it('demo cohort still belongs to the demo trainer after the matrix', async () => {
    const c = await findCohort(world.cohortId);
    expect(c?.trainerId).toBe(world.users.trainer.id);
  });
});
