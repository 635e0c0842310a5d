import 'server-only';
import { env } from '@/lib/env';
import { runAfterResponse } from '@/lib/after-response';
import { sendMail } from '@/lib/mail/send';
import { passwordResetMail } from '@/lib/mail/templates';
import { RESET_TTL_MINUTES, admitResetRequest, createPasswordReset } from '@/db/password-resets';

export type ResetRequestOutcome =
  /** Accepted: a link is mailed after the response if an active account uses the address. */
  | { status: 'accepted' }
  /** Accepted in words, but nothing is mailed: this e-mail address had its share for now. */
  | { status: 'accepted-silently' }
  /** Too many requests from this client address: 429 with Retry-After. */
  | { status: 'throttled'; retryAfterSeconds: number };

/**
 * A public "mail me a reset link" request. The answer does not depend on whether the account
 * exists, and neither does the work done before answering: record and count the request,
 * nothing else. Looking the account up, minting the token and sending the mail happen after
 * the response (runAfterResponse), so the response time says nothing about the account.
 *
 * Two limits in the window (RESET_WINDOW_MINUTES), both kept in PostgreSQL:
 * - per client address (RESET_MAX_PER_ADDRESS): past it, 429 with Retry-After. It is about
 *   the sender, not the account, so telling them reveals nothing and lets a real person on a
 *   busy network know to wait.
 * - per e-mail address (RESET_MAX_PER_EMAIL): past it, the same 202 as always and no mail.
 *   A 429 here would tell anyone that somebody else has been asking for this address's
 *   resets; staying silent protects the mailbox from being flooded and gives nothing away.
 *   The mailbox owner already has the links sent in the window.
 */
export async function requestPasswordReset(email: string, address: string | null): Promise<ResetRequestOutcome> {
  const { RESET_MAX_PER_EMAIL, RESET_MAX_PER_ADDRESS, RESET_WINDOW_MINUTES } = env();
  const admission = await admitResetRequest(email, address, {
    maxPerEmail: RESET_MAX_PER_EMAIL,
    maxPerAddress: RESET_MAX_PER_ADDRESS,
    windowMinutes: RESET_WINDOW_MINUTES,
  });
  if (!admission.admitted) {
    if (admission.limit === 'email') return { status: 'accepted-silently' };
    const from = admission.oldestRequest?.getTime() ?? Date.now();
    return { status: 'throttled', retryAfterSeconds: Math.max(1, Math.ceil((from + RESET_WINDOW_MINUTES * 60_000 - Date.now()) / 1000)) };
  }
  runAfterResponse('password reset mail', () => mailResetLink(email));
  return { status: 'accepted' };
}

/** Mint a reset token and mail the link, if an active account uses the address (after the response). */
async function mailResetLink(email: string): Promise<void> {
  const reset = await createPasswordReset(email);
  if (!reset) return;
  const link = `${env().APP_URL}/reset-password/${reset.token}`;
  await sendMail(passwordResetMail({ to: email, name: reset.name, link, expiresInMinutes: RESET_TTL_MINUTES }));
}
