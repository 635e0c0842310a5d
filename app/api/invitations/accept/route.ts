import { apiRoute, ApiError } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { hashPassword } from '@/lib/password';
import { acceptInvitationSchema } from '@/lib/schemas/auth';
import { acceptInvitation, lookupInvitation } from '@/db/invitations';

const REASONS = {
  invalid: [404, 'This invitation link is not valid.'],
  used: [409, 'This invitation was already used. Sign in instead.'],
  revoked: [409, 'This invitation was withdrawn by the trainer.'],
  expired: [409, 'This invitation has expired. Ask your trainer for a new one.'],
  'account-exists': [409, 'An account with this address exists. Sign in and open the link again to join.'],
} as const;

function refuse(reason: keyof typeof REASONS): never {
  const [status, message] = REASONS[reason];
  throw new ApiError(status, message);
}

/**
 * Public: redeem an invitation by setting name and password; creates a student account once.
 * The invitation is checked (exists, open, not expired, no account yet) before the password
 * is hashed, so a made-up or spent token costs no scrypt run (lib/password.ts); the same
 * checks run again under a row lock when the account is created.
 */
export const POST = apiRoute(async (req: Request) => {
  const body = await parseJsonBody(req, acceptInvitationSchema, 'auth');
  const invitation = await lookupInvitation(body.token);
  if (invitation.state !== 'valid') refuse(invitation.state);
  if (invitation.value.existingAccount) refuse('account-exists');
  const result = await acceptInvitation(body.token, { name: body.name, passwordHash: await hashPassword(body.password) });
  if (!result.ok) refuse(result.reason);
  return Response.json({ email: result.email }, { status: 201 });
});
