import { apiRoute } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { linkRefused } from '@/lib/auth/link-refusals';
import { hashPassword } from '@/lib/password';
import { acceptInvitationSchema } from '@/lib/schemas/auth';
import { acceptInvitation, lookupInvitation } from '@/db/invitations';

/**
 * Public: redeem an invitation by setting name and password; creates a student account once.
 * The invitation is checked (exists, open, not expired, no account yet) before the password
 * is hashed, so a made-up or spent token costs no scrypt run (lib/password.ts); the same
 * checks run again under a row lock when the account is created. Refusals: 404 / 409
 * (lib/auth/link-refusals.ts).
 */
export const POST = apiRoute(async (req: Request) => {
  const body = await parseJsonBody(req, acceptInvitationSchema, 'auth');
  const invitation = await lookupInvitation(body.token);
  if (invitation.state !== 'valid') throw linkRefused('accept-invitation', invitation.state);
  if (invitation.value.existingAccount) throw linkRefused('accept-invitation', 'account-exists');
  const result = await acceptInvitation(body.token, { name: body.name, passwordHash: await hashPassword(body.password) });
  if (!result.ok) throw linkRefused('accept-invitation', result.reason);
  return Response.json({ email: result.email }, { status: 201 });
});
