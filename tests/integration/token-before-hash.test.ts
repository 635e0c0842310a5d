/**
 * A reset or invitation link is checked before the new password is hashed: a scrypt run
 * costs about 0.4 s and 128 MiB (lib/password.ts), so a made-up, spent, withdrawn or expired
 * token must not buy one. hashPassword is wrapped in a spy (same behaviour) to count calls.
 */
import { afterAll, beforeEach, describe, expect, it, vi } from 'vitest';

vi.mock('@/lib/password', async (importOriginal) => {
  const actual = await importOriginal<typeof import('@/lib/password')>();
  return { ...actual, hashPassword: vi.fn(actual.hashPassword) };
});

import * as accept from '@/app/api/invitations/accept/route';
import * as resetComplete from '@/app/api/password-resets/complete/route';
import { hashPassword } from '@/lib/password';
import { hashToken } from '@/db/tokens';
import { closeDb, db } from '@/db/knex';
import { createInvitation, revokeInvitation } from '@/db/invitations';
import { createPasswordReset } from '@/db/password-resets';
import { createUser } from '@/db/users';
import { call, demoCohortId, demoUser, uniqueEmail } from './helpers';

const hashSpy = vi.mocked(hashPassword);

// A fixed hash for the accounts made here, so that only the handlers under test call hashPassword.
const STORED = 'scrypt$1024$8$1$AAAAAAAAAAAAAAAAAAAAAA$' + Buffer.alloc(64).toString('base64url');

beforeEach(() => {
  hashSpy.mockClear();
});

afterAll(async () => {
  await closeDb();
});

async function student() {
  return createUser({ email: uniqueEmail('tbh'), name: 'Token Person', role: 'student', passwordHash: STORED });
}

function completeReset(token: string) {
  return call(resetComplete.POST, '/api/password-resets/complete', { method: 'POST', body: { token, password: 'a-new-password-1' } });
}

describe('reset links', () => {
  it('a token that never existed: 404, no hash', async () => {
    expect((await completeReset('n'.repeat(43))).status).toBe(404);
    expect(hashSpy).not.toHaveBeenCalled();
  });

  it('an expired token: 409, no hash', async () => {
    const reset = await createPasswordReset((await student()).email);
    await db()('password_resets').where({ token_hash: hashToken(reset!.token) }).update({ expires_at: db().raw("now() - interval '1 second'") });
    expect((await completeReset(reset!.token)).status).toBe(409);
    expect(hashSpy).not.toHaveBeenCalled();
  });

  it('a used token: 409, no hash; the valid use hashed once', async () => {
    const reset = await createPasswordReset((await student()).email);
    expect((await completeReset(reset!.token)).status).toBe(200);
    expect(hashSpy).toHaveBeenCalledTimes(1);
    hashSpy.mockClear();
    expect((await completeReset(reset!.token)).status).toBe(409);
    expect(hashSpy).not.toHaveBeenCalled();
  });
});

describe('invitation links', () => {
  async function invitation() {
    const trainer = await demoUser('trainer@kestrelvale.test');
    const cohortId = await demoCohortId(trainer.id);
    const inv = await createInvitation(cohortId, trainer.id, uniqueEmail('tbh-invite'));
    if (inv.status !== 'invited') throw new Error('setup failed');
    return { ...inv, cohortId };
  }

  function acceptWith(token: string) {
    return call(accept.POST, '/api/invitations/accept', { method: 'POST', body: { token, name: 'Token Person', password: 'a-new-password-1' } });
  }

  it('a token that never existed: 404, no hash', async () => {
    expect((await acceptWith('m'.repeat(43))).status).toBe(404);
    expect(hashSpy).not.toHaveBeenCalled();
  });

  it('a withdrawn invitation: 409, no hash', async () => {
    const inv = await invitation();
    expect(await revokeInvitation(inv.cohortId, inv.invitationId)).toBe('revoked');
    expect((await acceptWith(inv.token)).status).toBe(409);
    expect(hashSpy).not.toHaveBeenCalled();
  });

  it('an expired invitation: 409, no hash', async () => {
    const inv = await invitation();
    await db()('invitations').where({ id: inv.invitationId }).update({ expires_at: db().raw("now() - interval '1 second'") });
    expect((await acceptWith(inv.token)).status).toBe(409);
    expect(hashSpy).not.toHaveBeenCalled();
  });

  it('an address that already has an account: 409, no hash', async () => {
    const inv = await invitation();
    await createUser({ email: inv.email, name: 'Already Here', role: 'student', passwordHash: STORED });
    expect((await acceptWith(inv.token)).status).toBe(409);
    expect(hashSpy).not.toHaveBeenCalled();
  });

  it('a used invitation: 409, no hash; the valid use hashed once', async () => {
    const inv = await invitation();
    expect((await acceptWith(inv.token)).status).toBe(201);
    expect(hashSpy).toHaveBeenCalledTimes(1);
    hashSpy.mockClear();
    expect((await acceptWith(inv.token)).status).toBe(409);
    expect(hashSpy).not.toHaveBeenCalled();
  });
});
