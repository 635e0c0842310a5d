import { apiRoute, ApiError } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { joinInvitationSchema } from '@/lib/schemas/auth';
import { joinWithInvitation } from '@/db/invitations';
import { ROLE_TABLE } from '@/lib/roles';

/** A signed-in student whose address was invited joins the cohort with the link. */
export const POST = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.joinCohorts);
  const { token } = await parseJsonBody(req, joinInvitationSchema, 'auth');
  const result = await joinWithInvitation(token, user.id);
  if (!result.ok) {
    if (result.reason === 'invalid') throw new ApiError(404, 'This invitation link is not valid for your account.');
    throw new ApiError(409, `This invitation is ${result.reason === 'used' ? 'already used' : result.reason}.`);
  }
  return Response.json({ joined: true });
});
