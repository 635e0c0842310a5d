/** Bad input answers: 400 for broken JSON or query, 422 naming the fields, 404 for malformed ids, 409 for conflicts. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as cohorts from '@/app/api/cohorts/route';
import * as cohort from '@/app/api/cohorts/[id]/route';
import * as invitations from '@/app/api/cohorts/[id]/invitations/route';
import * as accept from '@/app/api/invitations/accept/route';
import * as adminUsers from '@/app/api/admin/users/route';
import * as adminUser from '@/app/api/admin/users/[id]/route';
import * as adminMailOne from '@/app/api/admin/mail/[id]/route';
import { closeDb } from '@/db/knex';
import type { User } from '@/db/users';
import { call, demoCohortId, demoUser, sessionCookie } from './helpers';

let trainerCookie: string;
let adminCookie: string;
let admin: User;
let cohortId: string;

beforeAll(async () => {
  const trainer = await demoUser('trainer@kestrelvale.test');
  admin = await demoUser('admin@kestrelvale.test');
  trainerCookie = await sessionCookie(trainer);
  adminCookie = await sessionCookie(admin);
  cohortId = await demoCohortId(trainer.id);
});

afterAll(async () => {
  await closeDb();
});

describe('input errors', () => {
  it('400 for a body that is not JSON', async () => {
    const res = await call(cohorts.POST, '/api/cohorts', { method: 'POST', cookie: trainerCookie, rawBody: '{"name": ' });
    expect(res).toEqual({ status: 400, body: { error: 'The request body must be valid JSON.' } });
  });

  it('422 naming each bad field', async () => {
    const res = await call(cohorts.POST, '/api/cohorts', { method: 'POST', cookie: trainerCookie, body: { name: 'x', description: 5 } });
    expect(res.status).toBe(422);
    expect(Object.keys((res.body as { fields: object }).fields).sort()).toEqual(['description', 'name']);
  });

  it('422 for an empty address list, with the field', async () => {
    const res = await call(invitations.POST, `/api/cohorts/${cohortId}/invitations`, {
      method: 'POST',
      cookie: trainerCookie,
      params: { id: cohortId },
      body: { emails: [] },
    });
    expect(res.status).toBe(422);
    expect(res.body).toMatchObject({ fields: { emails: ['Enter at least one address.'] } });
  });

  it('422 for a short password when accepting an invitation', async () => {
    const res = await call(accept.POST, '/api/invitations/accept', { method: 'POST', body: { token: 'a'.repeat(43), name: 'Al Bo', password: 'short' } });
    expect(res.status).toBe(422);
    expect(res.body).toMatchObject({ fields: { password: ['Use at least 10 characters.'] } });
  });

  it('400 naming a bad query parameter', async () => {
    const res = await call(adminUsers.GET, '/api/admin/users?sort=password_hash&page=0', { cookie: adminCookie });
    expect(res.status).toBe(400);
    expect(Object.keys((res.body as { fields: object }).fields).sort()).toEqual(['page', 'sort']);
  });

  it('404 for a malformed or unknown id', async () => {
    expect((await call(cohort.GET, '/api/cohorts/nope', { cookie: trainerCookie, params: { id: 'nope' } })).status).toBe(404);
    const unknown = '00000000-0000-4000-8000-000000000000';
    expect((await call(cohort.GET, `/api/cohorts/${unknown}`, { cookie: trainerCookie, params: { id: unknown } })).status).toBe(404);
    expect((await call(adminMailOne.GET, '/api/admin/mail/abc', { cookie: adminCookie, params: { id: 'abc' } })).status).toBe(404);
  });

  it('409 for a second cohort of the same name', async () => {
    const body = { name: 'Duplicate name check', description: '' };
    expect((await call(cohorts.POST, '/api/cohorts', { method: 'POST', cookie: trainerCookie, body })).status).toBe(201);
    const again = await call(cohorts.POST, '/api/cohorts', { method: 'POST', cookie: trainerCookie, body });
    expect(again.status).toBe(409);
    expect(again.body).toMatchObject({ fields: { name: ['Choose another name.'] } });
  });

  it('409 when an admin would lock themselves out', async () => {
    const res = await call(adminUser.PATCH, `/api/admin/users/${admin.id}`, {
      method: 'PATCH',
      cookie: adminCookie,
      params: { id: admin.id },
      body: { disabled: true },
    });
    expect(res.status).toBe(409);
  });

  it('401 for a forged session cookie', async () => {
    const res = await call(cohorts.GET, '/api/cohorts', { cookie: 'next-auth.session-token=forged.token.value' });
    expect(res.status).toBe(401);
  });
});
