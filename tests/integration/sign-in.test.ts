/**
 * Sign-in checks behind next-auth's credentials provider: generic failures,
 * disabled accounts, and rate limiting per account and per client address
 * (10 failures in 15 minutes, the defaults in lib/env.ts), kept in PostgreSQL.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { authenticate } from '@/lib/auth/credentials';
import { SIGN_IN_MESSAGES } from '@/lib/auth/messages';
import { userFromSessionToken } from '@/lib/auth/session';
import { closeDb, db } from '@/db/knex';
import { updateUserAccess } from '@/db/users';
import { demoUser, makeUser, sessionCookie, uniqueEmail } from './helpers';

const LIMIT = 10;

afterAll(async () => {
  await closeDb();
});

let addressCounter = 0;
/** A fresh client address per test so per-address counts do not leak between tests. */
function address(): string {
  addressCounter += 1;
  return `192.0.2.${addressCounter}`; // TEST-NET-1 (RFC 5737)
}

describe('credentials', () => {
  it('signs in the demo trainer with the demo password', async () => {
    const res = await authenticate({ email: 'Trainer@KestrelVale.test', password: 'trainer-demo-2026', address: address() });
    expect(res.ok).toBe(true);
    if (res.ok) expect(res.user.role).toBe('trainer');
  });

  it('gives the same answer for a wrong password and an unknown account', async () => {
    const wrong = await authenticate({ email: 'trainer@kestrelvale.test', password: 'not-it', address: address() });
    const unknown = await authenticate({ email: uniqueEmail('ghost'), password: 'not-it', address: address() });
    expect(wrong).toEqual({ ok: false, reason: 'invalid' });
    expect(unknown).toEqual(wrong);
  });

  it('audits failed sign-ins', async () => {
    const email = uniqueEmail('audited');
    await authenticate({ email, password: 'whatever', address: '198.51.100.7' });
    const row = await db()('audit_log').where({ action: 'signin.failed' }).whereRaw("detail->>'email' = ?", [email]).first();
    expect(row.detail).toMatchObject({ email, address: '198.51.100.7', reason: 'wrong-credentials' });
  });

  it('refuses a disabled account even with the right password, and drops its live session', async () => {
    const user = await makeUser('student', 'right-password-1');
    const admin = await demoUser('admin@kestrelvale.test');
    const cookie = await sessionCookie(user);
    expect(await userFromSessionToken(cookie.split('=')[1])).not.toBeNull();
    await updateUserAccess(admin.id, user.id, { disabled: true });
    expect(await authenticate({ email: user.email, password: 'right-password-1', address: address() })).toEqual({ ok: false, reason: 'disabled' });
    expect(await userFromSessionToken(cookie.split('=')[1])).toBeNull();
    const audit = await db()('audit_log').where({ action: 'user.disabled', target_user_id: user.id, actor_id: admin.id });
    expect(audit).toHaveLength(1);
  });

  it('audits role changes with before and after', async () => {
    const user = await makeUser('student');
    const admin = await demoUser('admin@kestrelvale.test');
    await updateUserAccess(admin.id, user.id, { role: 'lead' });
    const row = await db()('audit_log').where({ action: 'role.changed', target_user_id: user.id }).first();
    expect(row.actor_id).toBe(admin.id);
    expect(row.detail).toEqual({ from: 'student', to: 'lead' });
  });
});

describe('rate limiting', () => {
  it(`pauses an account after ${LIMIT} failures, even for the right password`, async () => {
    const user = await makeUser('student', 'the-real-password');
    for (let i = 0; i < LIMIT; i++) {
      // Each failure from a different address: the account limit must still trip.
      expect(await authenticate({ email: user.email, password: `guess-${i}`, address: address() })).toEqual({ ok: false, reason: 'invalid' });
    }
    const blocked = await authenticate({ email: user.email, password: 'the-real-password', address: address() });
    expect(blocked).toMatchObject({ ok: false, reason: 'rate-limited' });
    if (!blocked.ok && blocked.reason === 'rate-limited') {
      expect(blocked.retryAfterMinutes).toBeGreaterThanOrEqual(1);
      expect(blocked.retryAfterMinutes).toBeLessThanOrEqual(15);
      expect(SIGN_IN_MESSAGES.rateLimited(blocked.retryAfterMinutes)).toMatch(/Too many failed sign-ins/);
    }
    expect(await db()('audit_log').where({ action: 'signin.blocked' }).whereRaw("detail->>'email' = ?", [user.email])).toHaveLength(1);
  });

  it('holds across a restart (the counts live in PostgreSQL)', async () => {
    const user = await makeUser('student', 'the-real-password');
    for (let i = 0; i < LIMIT; i++) await authenticate({ email: user.email, password: 'nope', address: address() });
    await closeDb(); // a new pool, as after a server restart
    expect(await authenticate({ email: user.email, password: 'the-real-password', address: address() })).toMatchObject({ reason: 'rate-limited' });
  });

  it('frees the account once the failures leave the 15-minute window', async () => {
    const user = await makeUser('student', 'the-real-password');
    for (let i = 0; i < LIMIT; i++) await authenticate({ email: user.email, password: 'nope', address: address() });
    await db()('sign_in_failures').where({ email: user.email }).update({ created_at: db().raw("now() - interval '16 minutes'") });
    expect((await authenticate({ email: user.email, password: 'the-real-password', address: address() })).ok).toBe(true);
  });

  it(`pauses one client address after ${LIMIT} failures across accounts, not other addresses`, async () => {
    const attacker = '203.0.113.50'; // TEST-NET-3 (RFC 5737)
    for (let i = 0; i < LIMIT; i++) await authenticate({ email: uniqueEmail('spray'), password: 'nope', address: attacker });
    expect(await authenticate({ email: 'ravi.mendez@kestrelvale.test', password: 'student-demo-2026', address: attacker })).toMatchObject({
      reason: 'rate-limited',
    });
    expect((await authenticate({ email: 'ravi.mendez@kestrelvale.test', password: 'student-demo-2026', address: address() })).ok).toBe(true);
  });

  it('a success clears the account count', async () => {
    const user = await makeUser('student', 'the-real-password');
    for (let i = 0; i < LIMIT - 1; i++) await authenticate({ email: user.email, password: 'nope', address: address() });
    expect((await authenticate({ email: user.email, password: 'the-real-password', address: address() })).ok).toBe(true);
    await authenticate({ email: user.email, password: 'nope', address: address() });
    expect((await authenticate({ email: user.email, password: 'the-real-password', address: address() })).ok).toBe(true);
  });
});
