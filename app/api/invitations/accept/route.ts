import { apiRoute, ApiError, parseJsonBody } from '@/lib/api/errors';
import { hashPassword } from '@/lib/password';
import { acceptInvitationSchema } from '@/lib/schemas/auth';
import { acceptInvitation } from '@/db/invitations';

const REASONS = {
  invalid: [404, 'This invitation link is not valid.'],
  used: [409, 'This invitation was already used. Sign in instead.'],
  revoked: [409, 'This invitation was withdrawn by the trainer.'],
  expired: [409, 'This invitation has expired. Ask your trainer for a new one.'],
  'account-exists': [409, 'An account with this address exists. Sign in and open the link again to join.'],
} as const;

/** Public: redeem an invitation by setting name and password; creates a student account once. */
export const POST = apiRoute(async (req: Request) => {
  const body = await parseJsonBody(req, acceptInvitationSchema);
  const result = await acceptInvitation(body.token, { name: body.name, passwordHash: await hashPassword(body.password) });
  if (!result.ok) {
    const [status, message] = REASONS[result.reason];
    throw new ApiError(status, message);
  }
  return Response.json({ email: result.email }, { status: 201 });
});
