import { apiRoute, ApiError, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { memberParamSchema } from '@/lib/schemas/cohorts';
import { cohortForManager } from '@/lib/cohorts/access';
import { removeMember } from '@/db/cohorts';

type Ctx = { params: Promise<{ id: string; userId: string }> };

/** Take a student out of a cohort (the account stays). */
export const DELETE = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cohorts);
  const { id, userId } = await parseParams(ctx.params, memberParamSchema);
  await cohortForManager(user, id);
  if (!(await removeMember(id, userId))) throw new ApiError(404, 'Not a member of this cohort.');
  return Response.json({ removed: true });
});
