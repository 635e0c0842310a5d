import { apiRoute, ApiError, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { idParamSchema } from '@/lib/schemas/cohorts';
import { userPatchSchema } from '@/lib/schemas/admin';
import { updateUserAccess } from '@/db/users';
import { ROLE_TABLE } from '@/lib/roles';

type Ctx = { params: Promise<{ id: string }> };

/** Admin: change a user's role or disable/enable the account (audited). */
export const PATCH = apiRoute(async (req: Request, ctx: Ctx) => {
  const admin = await requireApiUser(req, ROLE_TABLE.administer);
  const { id } = await parseParams(ctx.params, idParamSchema);
  const change = await parseJsonBody(req, userPatchSchema);
  // An admin cannot lock themselves out; another admin has to do it.
  if (id === admin.id && (change.disabled === true || (change.role && change.role !== 'admin'))) {
    throw new ApiError(409, 'You cannot disable your own account or remove your own admin role.');
  }
  const user = await updateUserAccess(admin.id, id, change);
  if (!user) throw new ApiError(404, 'No such user.');
  return Response.json({ user });
});
