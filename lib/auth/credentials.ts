import 'server-only';
import { env } from '@/lib/env';
import { DUMMY_HASH, hashPassword, needsRehash, verifyPassword } from '@/lib/password';
import { signInSchema } from '@/lib/schemas/auth';
import type { User } from '@/db/users';
import { findCredentials, markSignedIn, upgradePasswordHash } from '@/db/users';
import { clearFailuresForEmail, forgetAttempt, recordAttempt } from '@/db/sign-in-failures';
import { writeAudit } from '@/db/audit';
import { clientAddress } from './client-address';

export type AuthResult =
  | { ok: true; user: User; sessionGeneration: number }
  | { ok: false; reason: 'invalid' }
  | { ok: false; reason: 'disabled' }
  | { ok: false; reason: 'rate-limited'; retryAfterMinutes: number };

/** Minutes until the oldest attempt that holds a limit leaves the window (at least 1). */
function minutesUntilFree(oldest: Date | null, windowMinutes: number): number {
  const from = oldest?.getTime() ?? Date.now();
  return Math.max(1, Math.ceil((from + windowMinutes * 60_000 - Date.now()) / 60_000));
}

/**
 * Check e-mail + password. Every attempt is recorded in PostgreSQL *before* the password is
 * checked and counted with itself included (db/sign-in-failures.ts), so a burst of parallel
 * guesses cannot all pass the count; past the limit no password is checked at all until the
 * window has moved on. Limits are per account and per client address (`address`, null when
 * it cannot be known: then only the account limit applies).
 *
 * A successful sign-in whose stored hash has an older scrypt cost is hashed again at today's
 * cost (lib/password.ts), once, while the password is at hand.
 */
export async function authenticate(input: { email: unknown; password: unknown; address: string | null }): Promise<AuthResult> {
  const parsed = signInSchema.safeParse({ email: input.email, password: input.password });
  if (!parsed.success) return { ok: false, reason: 'invalid' };
  const { email, password } = parsed.data;
  const { SIGNIN_MAX_FAILURES: max, SIGNIN_WINDOW_MINUTES: windowMinutes } = env();

  const attempt = await recordAttempt(email, input.address, windowMinutes);
  const overEmail = attempt.byEmail > max;
  const overAddress = attempt.byAddress > max;
  if (overEmail || overAddress) {
    // Refused without a check, so it is no failure of its own: the window is not stretched by hammering.
    await forgetAttempt(attempt.id);
    const retryAfterMinutes = Math.max(
      overEmail ? minutesUntilFree(attempt.emailOldest, windowMinutes) : 0,
      overAddress ? minutesUntilFree(attempt.addressOldest, windowMinutes) : 0,
    );
    await writeAudit({
      actorId: null,
      action: 'signin.blocked',
      detail: { email, address: input.address, byEmail: attempt.byEmail - 1, byAddress: Math.max(0, attempt.byAddress - 1) },
    });
    return { ok: false, reason: 'rate-limited', retryAfterMinutes };
  }

  const account = await findCredentials(email);
  // Hash even for unknown accounts so response time does not reveal which e-mails exist.
  const matches = await verifyPassword(password, account?.passwordHash ?? DUMMY_HASH);
  if (!account || !matches) {
    // The attempt's row stays: it is this failure.
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
    await forgetAttempt(attempt.id);
    await writeAudit({
      actorId: null,
      action: 'signin.failed',
      targetUserId: account.id,
      detail: { email, address: input.address, reason: 'disabled' },
    });
    return { ok: false, reason: 'disabled' };
  }
  await clearFailuresForEmail(email);
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
