import { apiRoute, ApiError, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { idParamSchema } from '@/lib/schemas/cohorts';
import { userPatchSchema } from '@/lib/schemas/admin';
import { assertAccessChangeAllowed } from '@/lib/users/access';
import { updateUserAccess } from '@/db/users';

type Ctx = { params: Promise<{ id: string }> };

/** Admin: change a user's role or disable/enable the account (audited); 409 for a change that would lock the admin out. */
export const PATCH = apiRoute(async (req: Request, ctx: Ctx) => {
  const admin = await requireApiUser(req, ROLE_TABLE.administer);
  const { id } = await parseParams(ctx.params, idParamSchema);
  const change = await parseJsonBody(req, userPatchSchema);
  assertAccessChangeAllowed(admin, id, change);
  const user = await updateUserAccess(admin.id, id, change);
  if (!user) throw new ApiError(404, 'No such user.');
  return Response.json({ user });
});
