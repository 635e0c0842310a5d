import { apiRoute, ApiError, parseJsonBody } from '@/lib/api/errors';
import { hashPassword } from '@/lib/password';
import { completeResetSchema } from '@/lib/schemas/auth';
import { completePasswordReset } from '@/db/password-resets';

/** Public: set a new password with a reset token (once). */
export const POST = apiRoute(async (req: Request) => {
  const body = await parseJsonBody(req, completeResetSchema);
  const result = await completePasswordReset(body.token, await hashPassword(body.password));
  if (!result.ok) {
    if (result.reason === 'invalid') throw new ApiError(404, 'This reset link is not valid.');
    throw new ApiError(409, result.reason === 'used' ? 'This reset link was already used.' : 'This reset link has expired. Ask for a new one.');
  }
  return Response.json({ reset: true });
});
