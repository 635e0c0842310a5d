import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { idParamSchema } from '@/lib/schemas/cohorts';
import { cohortForManager } from '@/lib/cohorts/access';
import { getCohortDetail } from '@/db/cohorts';

type Ctx = { params: Promise<{ id: string }> };

/** Members and open invitations of one cohort (its trainer or an admin). */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cohorts);
  const { id } = await parseParams(ctx.params, idParamSchema);
  await cohortForManager(user, id);
  return Response.json({ cohort: await getCohortDetail(id) });
});
