import { apiRoute } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { linkRefused } from '@/lib/auth/link-refusals';
import { hashPassword } from '@/lib/password';
import { completeResetSchema } from '@/lib/schemas/auth';
import { completePasswordReset, lookupPasswordReset } from '@/db/password-resets';

/**
 * Public: set a new password with a reset token (once). The token is checked (exists, unused,
 * not expired) before the password is hashed: a hash costs about 0.4 s and 128 MiB
 * (lib/password.ts), which a made-up token must not buy. The check is repeated under a row
 * lock when the password is stored, so a double submit still uses the token once. Refusals:
 * 404 / 409 (lib/auth/link-refusals.ts).
 */
export const POST = apiRoute(async (req: Request) => {
  const body = await parseJsonBody(req, completeResetSchema, 'auth');
  const state = await lookupPasswordReset(body.token);
  if (state !== 'valid') throw linkRefused('reset-password', state);
  const result = await completePasswordReset(body.token, await hashPassword(body.password));
  if (!result.ok) throw linkRefused('reset-password', result.reason);
  return Response.json({ reset: true });
});
