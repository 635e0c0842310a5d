import { apiRoute, ApiError } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requestResetSchema } from '@/lib/schemas/auth';
import { requestAddress } from '@/lib/auth/credentials';
import { requestPasswordReset } from '@/lib/auth/password-reset';

const ACCEPTED = 'If an active account uses this address, a reset link is on its way.';

/**
 * Public: mail a reset link if the address has an active account. The answer, and the work
 * done before it, are the same either way, so neither the body nor the time reveals an
 * account; the mail goes out after the response. Throttled per client address (429 with
 * Retry-After) and per e-mail (the same 202, no mail): lib/auth/password-reset.ts says why.
 */
export const POST = apiRoute(async (req: Request) => {
  const { email } = await parseJsonBody(req, requestResetSchema, 'auth');
  const outcome = await requestPasswordReset(email, requestAddress(req.headers));
  if (outcome.status === 'throttled') {
    const minutes = Math.ceil(outcome.retryAfterSeconds / 60);
    throw new ApiError(429, `Too many reset requests from your network. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`, undefined, {
      headers: { 'retry-after': String(outcome.retryAfterSeconds) },
    });
  }
  return Response.json({ message: ACCEPTED }, { status: 202, headers: { 'cache-control': 'no-store' } });
});
