/**
 * Invitation and password-reset flows end to end through the real SMTP
 * catcher: the route handler sends with nodemailer, the catcher process
 * stores the message in PostgreSQL, the test reads the link from there.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as invitations from '@/app/api/cohorts/[id]/invitations/route';
import * as invitation from '@/app/api/cohorts/[id]/invitations/[invitationId]/route';
import * as accept from '@/app/api/invitations/accept/route';
import * as resets from '@/app/api/password-resets/route';
import * as resetComplete from '@/app/api/password-resets/complete/route';
import * as cohort from '@/app/api/cohorts/[id]/route';
import * as cellsList from '@/app/api/cells/route';
import { encode } from 'next-auth/jwt';
import { authOptions } from '@/lib/auth/options';
import { TEST_ENV } from './test-env';
import { authenticate } from '@/lib/auth/credentials';
import { hashToken } from '@/db/tokens';
import { closeDb, db } from '@/db/knex';
import { lookupInvitation } from '@/db/invitations';
import { lookupPasswordReset } from '@/db/password-resets';
import type { User } from '@/db/users';
import { findUserByEmail } from '@/db/users';
import { call, demoCohortId, demoUser, latestMailTo, linkToken, makeUser, sessionCookie, uniqueEmail } from './helpers';

let trainer: User;
let trainerCookie: string;
let cohortId: string;

beforeAll(async () => {
  trainer = await demoUser('trainer@kestrelvale.test');
  trainerCookie = await sessionCookie(trainer);
  cohortId = await demoCohortId(trainer.id);
});

afterAll(async () => {
  await closeDb();
});

async function invite(emails: string[]) {
  return call(invitations.POST, `/api/cohorts/${cohortId}/invitations`, {
    method: 'POST',
    cookie: trainerCookie,
    params: { id: cohortId },
    body: { emails },
  });
}

describe('invitation by e-mail', () => {
  it('mails a single-use link that creates a student account in the cohort', async () => {
    const email = uniqueEmail('invitee');
    const res = await invite([email]);
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ results: [{ email, status: 'invited' }] });

    const mail = await latestMailTo(email);
    expect(mail.subject).toContain('RC-27A Robot cell integration');
    expect(mail.text_body).toContain('Tobias Okafor');
    const token = linkToken(mail.text_body, 'invite');
    // Only the hash is stored, never the token that travelled in the mail.
    expect(await db()('invitations').where({ token_hash: token }).first()).toBeUndefined();
    expect(await db()('invitations').where({ token_hash: hashToken(token) }).first()).toBeDefined();

    const page = await lookupInvitation(token);
    expect(page.state).toBe('valid');

    const accepted = await call(accept.POST, '/api/invitations/accept', {
      method: 'POST',
      body: { token, name: 'Ilse Varga', password: 'my-new-password-1' },
    });
    expect(accepted.status).toBe(201);

    const signIn = await authenticate({ email, password: 'my-new-password-1', address: '10.0.0.1' });
    expect(signIn.ok).toBe(true);
    if (signIn.ok) {
      expect(signIn.user.role).toBe('student');
      expect(signIn.user.name).toBe('Ilse Varga');
    }
    const detail = await call(cohort.GET, `/api/cohorts/${cohortId}`, { cookie: trainerCookie, params: { id: cohortId } });
    const members = (detail.body as { cohort: { members: { email: string }[] } }).cohort.members;
    expect(members.map((m) => m.email)).toContain(email);

    // Second use of the same link: refused, nothing changes.
    const again = await call(accept.POST, '/api/invitations/accept', {
      method: 'POST',
      body: { token, name: 'Someone Else', password: 'another-password-2' },
    });
    expect(again.status).toBe(409);
    expect((await findUserByEmail(email))?.name).toBe('Ilse Varga');
  });

  it('sends the good addresses and rejects each bad one with its reason', async () => {
    const good1 = uniqueEmail('good');
    const good2 = uniqueEmail('good');
    const res = await invite([good1, 'not-an-address', 'ada.lindqvist@kestrelvale.test', good2, good1, 'lead@brennick.test']);
    expect(res.status).toBe(200);
    expect(res.body).toEqual({
      results: [
        { email: good1, status: 'invited' },
        { email: 'not-an-address', status: 'rejected', reason: 'Not a valid e-mail address.' },
        { email: 'ada.lindqvist@kestrelvale.test', status: 'rejected', reason: 'Already a member of this cohort.' },
        { email: good2, status: 'invited' },
        { email: good1, status: 'rejected', reason: 'Listed more than once.' },
        { email: 'lead@brennick.test', status: 'rejected', reason: 'This address belongs to an account that is not a student.' },
      ],
    });
    expect((await latestMailTo(good1)).subject).toContain('Invitation');
    expect((await latestMailTo(good2)).subject).toContain('Invitation');
    // Inviting again while the first is open: told so, no duplicate row.
    const again = await invite([good2]);
    expect(again.body).toEqual({ results: [{ email: good2, status: 'rejected', reason: 'Already invited; the invitation is still open.' }] });
    expect(await db()('invitations').where({ email: good2, cohort_id: cohortId }).count<{ count: string }[]>({ count: '*' })).toEqual([{ count: '1' }]);
  });

  it('refuses an expired link and creates no account', async () => {
    const email = uniqueEmail('late');
    await invite([email]);
    const token = linkToken((await latestMailTo(email)).text_body, 'invite');
    await db()('invitations').where({ token_hash: hashToken(token) }).update({ expires_at: db().raw("now() - interval '1 minute'") });
    expect((await lookupInvitation(token)).state).toBe('expired');
    const res = await call(accept.POST, '/api/invitations/accept', { method: 'POST', body: { token, name: 'Late Person', password: 'late-password-123' } });
    expect(res.status).toBe(409);
    expect(await findUserByEmail(email)).toBeNull();
  });

  it('refuses a revoked link', async () => {
    const email = uniqueEmail('revoked');
    await invite([email]);
    const token = linkToken((await latestMailTo(email)).text_body, 'invite');
    const row = await db()('invitations').where({ token_hash: hashToken(token) }).first();
    const revoked = await call(invitation.DELETE, `/api/cohorts/${cohortId}/invitations/${row.id}`, {
      method: 'DELETE',
      cookie: trainerCookie,
      params: { id: cohortId, invitationId: row.id },
    });
    expect(revoked.status).toBe(200);
    expect((await lookupInvitation(token)).state).toBe('revoked');
    const res = await call(accept.POST, '/api/invitations/accept', { method: 'POST', body: { token, name: 'Gone Person', password: 'gone-password-123' } });
    expect(res.status).toBe(409);
    expect(await findUserByEmail(email)).toBeNull();
    // Revoking twice is a conflict, not a silent success.
    const twice = await call(invitation.DELETE, `/api/cohorts/${cohortId}/invitations/${row.id}`, {
      method: 'DELETE',
      cookie: trainerCookie,
      params: { id: cohortId, invitationId: row.id },
    });
    expect(twice.status).toBe(409);
  });

  it('answers 404 for a token that never existed', async () => {
    const res = await call(accept.POST, '/api/invitations/accept', {
      method: 'POST',
      body: { token: 'x'.repeat(43), name: 'Nobody Here', password: 'nobody-password-1' },
    });
    expect(res.status).toBe(404);
  });
});

describe('password reset by e-mail', () => {
  it('mails a link that sets a new password once', async () => {
    const user = await makeUser('student', 'old-password-123');
    const res = await call(resets.POST, '/api/password-resets', { method: 'POST', body: { email: user.email.toUpperCase() } });
    expect(res.status).toBe(202);
    const mail = await latestMailTo(user.email);
    expect(mail.subject).toBe('Reset your Cellwright password');
    const token = linkToken(mail.text_body, 'reset-password');
    expect(await lookupPasswordReset(token)).toBe('valid');

    const done = await call(resetComplete.POST, '/api/password-resets/complete', { method: 'POST', body: { token, password: 'new-password-456' } });
    expect(done.status).toBe(200);
    expect((await authenticate({ email: user.email, password: 'new-password-456', address: '10.0.0.2' })).ok).toBe(true);
    expect(await authenticate({ email: user.email, password: 'old-password-123', address: '10.0.0.2' })).toEqual({ ok: false, reason: 'invalid' });

    const reuse = await call(resetComplete.POST, '/api/password-resets/complete', { method: 'POST', body: { token, password: 'third-password-789' } });
    expect(reuse.status).toBe(409);
    expect((await authenticate({ email: user.email, password: 'new-password-456', address: '10.0.0.2' })).ok).toBe(true);
  });

  it('ends the sessions opened before the reset; a sign-in with the new password gets a working one', async () => {
    // Common practice (OWASP Session Management Cheat Sheet): a password change or reset
    // invalidates the account's existing sessions.
    const user = await makeUser('student', 'before-reset-123');
    const oldCookie = await sessionCookie(user);
    expect((await call(cellsList.GET, '/api/cells', { cookie: oldCookie })).status).toBe(200);

    await call(resets.POST, '/api/password-resets', { method: 'POST', body: { email: user.email } });
    const token = linkToken((await latestMailTo(user.email)).text_body, 'reset-password');
    expect((await call(resetComplete.POST, '/api/password-resets/complete', { method: 'POST', body: { token, password: 'after-reset-456' } })).status).toBe(200);

    expect((await call(cellsList.GET, '/api/cells', { cookie: oldCookie })).status).toBe(401);

    // The new sign-in carries the account's new generation through next-auth's jwt callback.
    const signedIn = await authenticate({ email: user.email, password: 'after-reset-456', address: '10.0.0.4' });
    if (!signedIn.ok) throw new Error('the new password did not sign in');
    expect(signedIn.sessionGeneration).toBe(1);
    const jwt = authOptions().callbacks!.jwt!;
    const minted = await jwt({ token: { sub: user.id } as never, user: { id: user.id, email: user.email, name: user.name, role: user.role, sessionGeneration: signedIn.sessionGeneration } as never, account: null, trigger: 'signIn' } as never);
    expect(minted.gen).toBe(1);
    const newCookie = `next-auth.session-token=${await encode({ token: minted, secret: TEST_ENV.NEXTAUTH_SECRET })}`;
    expect((await call(cellsList.GET, '/api/cells', { cookie: newCookie })).status).toBe(200);
    expect((await call(cellsList.GET, '/api/cells', { cookie: oldCookie })).status).toBe(401);
  });

  it('answers the same for an unknown address and sends nothing', async () => {
    const email = uniqueEmail('unknown');
    const before = await db()('mail_messages').count<{ count: string }[]>({ count: '*' });
    const res = await call(resets.POST, '/api/password-resets', { method: 'POST', body: { email } });
    expect(res.status).toBe(202);
    expect(res.body).toEqual({ message: 'If an active account uses this address, a reset link is on its way.' });
    expect(await db()('mail_messages').count<{ count: string }[]>({ count: '*' })).toEqual(before);
  });

  it('refuses an expired reset link without changing the password', async () => {
    const user = await makeUser('lead', 'lead-password-123');
    await call(resets.POST, '/api/password-resets', { method: 'POST', body: { email: user.email } });
    const token = linkToken((await latestMailTo(user.email)).text_body, 'reset-password');
    await db()('password_resets').where({ token_hash: hashToken(token) }).update({ expires_at: db().raw("now() - interval '1 second'") });
    const res = await call(resetComplete.POST, '/api/password-resets/complete', { method: 'POST', body: { token, password: 'changed-password-1' } });
    expect(res.status).toBe(409);
    expect((await authenticate({ email: user.email, password: 'lead-password-123', address: '10.0.0.3' })).ok).toBe(true);
  });
});
