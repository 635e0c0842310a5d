import 'server-only';
import { env } from '@/lib/env';
import { DUMMY_HASH, verifyPassword } from '@/lib/password';
import { signInSchema } from '@/lib/schemas/auth';
import type { User } from '@/db/users';
import { findCredentials, markSignedIn } from '@/db/users';
import { clearFailuresForEmail, countRecentFailures, recordFailure } from '@/db/sign-in-failures';
import { writeAudit } from '@/db/audit';

export type AuthResult =
  | { ok: true; user: User; sessionGeneration: number }
  | { ok: false; reason: 'invalid' }
  | { ok: false; reason: 'disabled' }
  | { ok: false; reason: 'rate-limited'; retryAfterMinutes: number };

/**
 * Check e-mail + password. Failed attempts are counted per account and per
 * client address in PostgreSQL (so limits survive restarts); past the limit
 * no password is checked at all until the window has moved on.
 */
export async function authenticate(input: { email: unknown; password: unknown; address: string }): Promise<AuthResult> {
  const parsed = signInSchema.safeParse({ email: input.email, password: input.password });
  if (!parsed.success) return { ok: false, reason: 'invalid' };
  const { email, password } = parsed.data;
  const { SIGNIN_MAX_FAILURES: max, SIGNIN_WINDOW_MINUTES: windowMinutes } = env();

  const recent = await countRecentFailures(email, input.address, windowMinutes);
  if (recent.byEmail >= max || recent.byAddress >= max) {
    const oldest = recent.oldestRelevant?.getTime() ?? Date.now();
    const retryAfterMinutes = Math.max(1, Math.ceil((oldest + windowMinutes * 60_000 - Date.now()) / 60_000));
    await writeAudit({
      actorId: null,
      action: 'signin.blocked',
      detail: { email, address: input.address, byEmail: recent.byEmail, byAddress: recent.byAddress },
    });
    return { ok: false, reason: 'rate-limited', retryAfterMinutes };
  }

  const account = await findCredentials(email);
  // Hash even for unknown accounts so response time does not reveal which e-mails exist.
  const matches = await verifyPassword(password, account?.passwordHash ?? DUMMY_HASH);
  if (!account || !matches) {
    await recordFailure(email, input.address);
    await writeAudit({
      actorId: null,
      action: 'signin.failed',
      targetUserId: account?.id ?? null,
      detail: { email, address: input.address, reason: 'wrong-credentials' },
    });
    return { ok: false, reason: 'invalid' };
  }
  if (account.disabled) {
    await writeAudit({
      actorId: null,
      action: 'signin.failed',
      targetUserId: account.id,
      detail: { email, address: input.address, reason: 'disabled' },
    });
    return { ok: false, reason: 'disabled' };
  }
  await clearFailuresForEmail(email);
  await markSignedIn(account.id);
  const { passwordHash: _hash, sessionGeneration, ...user } = account;
  return { ok: true, user, sessionGeneration };
}

/**
 * The client address for rate limiting: first hop of x-forwarded-for, else x-real-ip.
 * `next start` fills x-forwarded-for from the socket only when the request has
 * none, so a direct client can choose its own value: in production put a
 * reverse proxy in front that overwrites the header. The per-account limit
 * does not depend on it.
 */
export function clientAddress(headers: Headers | Record<string, string | string[] | undefined> | undefined): string {
  const get = (name: string): string | undefined => {
    if (!headers) return undefined;
    if (headers instanceof Headers) return headers.get(name) ?? undefined;
    const v = headers[name];
    return Array.isArray(v) ? v[0] : v;
  };
  const forwarded = get('x-forwarded-for')?.split(',')[0]?.trim();
  return forwarded || get('x-real-ip')?.trim() || 'unknown';
}
