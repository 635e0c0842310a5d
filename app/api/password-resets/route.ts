import { apiRoute, parseJsonBody } from '@/lib/api/errors';
import { env } from '@/lib/env';
import { requestResetSchema } from '@/lib/schemas/auth';
import { sendMail } from '@/lib/mail/send';
import { passwordResetMail } from '@/lib/mail/templates';
import { RESET_TTL_MINUTES, createPasswordReset } from '@/db/password-resets';

/**
 * Public: mail a reset link if the address has an active account. The answer
 * is the same either way so it cannot be used to find accounts.
 */
export const POST = apiRoute(async (req: Request) => {
  const { email } = await parseJsonBody(req, requestResetSchema);
  const reset = await createPasswordReset(email);
  if (reset) {
    const link = `${env().APP_URL}/reset-password/${reset.token}`;
    try {
      await sendMail(passwordResetMail({ to: email, name: reset.name, link, expiresInMinutes: RESET_TTL_MINUTES }));
    } catch (err) {
      console.error('[mail] reset not sent', err);
    }
  }
  return Response.json(
    { message: 'If an active account uses this address, a reset link is on its way.' },
    { status: 202 },
  );
});
