import { apiRoute, ApiError, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { invitationParamSchema } from '@/lib/schemas/cohorts';
import { cohortForManager } from '@/lib/cohorts/access';
import { revokeInvitation } from '@/db/invitations';

type Ctx = { params: Promise<{ id: string; invitationId: string }> };

/** Revoke an open invitation: its link stops working. */
export const DELETE = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cohorts);
  const { id, invitationId } = await parseParams(ctx.params, invitationParamSchema);
  await cohortForManager(user, id);
  const outcome = await revokeInvitation(id, invitationId);
  if (outcome === 'not-found') throw new ApiError(404, 'No such invitation.');
  if (outcome === 'not-open') throw new ApiError(409, 'The invitation was already used or revoked.');
  return Response.json({ revoked: true });
});
