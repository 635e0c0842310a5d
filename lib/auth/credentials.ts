import 'server-only';
import { env } from '@/lib/env';
import { DUMMY_HASH, hashPassword, needsRehash, verifyPassword } from '@/lib/password';
import { signInSchema } from '@/lib/schemas/auth';
import type { User } from '@/db/users';
import { findCredentials, markSignedIn, upgradePasswordHash } from '@/db/users';
import { admitAttempt, clearFailuresForEmail, forgetAttempt, markAttemptFailed } from '@/db/sign-in-failures';
import { writeAudit } from '@/db/audit';
import { clientAddress } from './client-address';

export type AuthResult =
  | { ok: true; user: User; sessionGeneration: number }
  | { ok: false; reason: 'invalid' }
  | { ok: false; reason: 'disabled' }
  | { ok: false; reason: 'rate-limited'; retryAfterMinutes: number }
  | { ok: false; reason: 'busy' };

/**
 * How long an attempt may wait for other checks from the same address to finish before it is
 * admitted (db/sign-in-failures.ts admitAttempt). A check takes about 0.4 s on an idle 2-core
 * machine and runs two at a time (lib/password.ts): 15 s lets a class of 30 or more behind one
 * address sign in together, with room for a loaded machine.
 */
const ADMIT_WAIT_MS = 15_000;

/**
 * Check e-mail + password. Every attempt is recorded in PostgreSQL *before* the password is
 * checked and decided under a lock with the attempts admitted before it, including those still
 * being checked (db/sign-in-failures.ts), so a burst of parallel guesses cannot pass the
 * limit; past the limit no password is checked at all until the window has moved on. Limits
 * are per account and per client address (`address`, null when it cannot be known: then only
 * the account limit applies).
 *
 * A successful sign-in whose stored hash has an older scrypt cost is hashed again at today's
 * cost (lib/password.ts), once, while the password is at hand.
 */
export async function authenticate(input: { email: unknown; password: unknown; address: string | null }): Promise<AuthResult> {
  const parsed = signInSchema.safeParse({ email: input.email, password: input.password });
  if (!parsed.success) return { ok: false, reason: 'invalid' };
  const { email, password } = parsed.data;
  const { SIGNIN_MAX_FAILURES: max, SIGNIN_WINDOW_MINUTES: windowMinutes } = env();

  const admission = await admitAttempt(email, input.address, { max, windowMinutes, waitMs: ADMIT_WAIT_MS });
  if (!admission.admitted) {
    if (admission.reason === 'busy') return { ok: false, reason: 'busy' };
    const from = admission.oldestFailure?.getTime() ?? Date.now();
    const retryAfterMinutes = Math.max(1, Math.ceil((from + windowMinutes * 60_000 - Date.now()) / 60_000));
    await writeAudit({ actorId: null, action: 'signin.blocked', detail: { email, address: input.address } });
    return { ok: false, reason: 'rate-limited', retryAfterMinutes };
  }
  const attemptId = admission.id;

  const account = await findCredentials(email);
  // Hash even for unknown accounts so response time does not reveal which e-mails exist.
  const matches = await verifyPassword(password, account?.passwordHash ?? DUMMY_HASH);
  if (!account || !matches) {
    await markAttemptFailed(attemptId);
    await writeAudit({
      actorId: null,
      action: 'signin.failed',
      targetUserId: account?.id ?? null,
      detail: { email, address: input.address, reason: 'wrong-credentials' },
    });
    return { ok: false, reason: 'invalid' };
  }
  if (account.disabled) {
    // The right password for a disabled account is not a guess: it does not count against the limit.
    await forgetAttempt(attemptId);
    await writeAudit({
      actorId: null,
      action: 'signin.failed',
      targetUserId: account.id,
      detail: { email, address: input.address, reason: 'disabled' },
    });
    return { ok: false, reason: 'disabled' };
  }
  await clearFailuresForEmail(email, attemptId);
  if (needsRehash(account.passwordHash)) {
    // Same password, stronger hash: the session generation stays (db/users.ts upgradePasswordHash).
    await upgradePasswordHash(account.id, account.passwordHash, await hashPassword(password));
  }
  await markSignedIn(account.id);
  const { passwordHash: _hash, sessionGeneration, ...user } = account;
  return { ok: true, user, sessionGeneration };
}

/**
 * The client address of a sign-in or reset request: the socket's peer, or with TRUSTED_PROXY
 * the address that proxy reports (lib/auth/client-address.ts says why and how).
 */
export function requestAddress(headers: Headers | Record<string, string | string[] | undefined> | undefined): string | null {
  return clientAddress(headers, env().TRUSTED_PROXY);
}
