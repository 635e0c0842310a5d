import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { idParamSchema, inviteSchema } from '@/lib/schemas/cohorts';
import { cohortForManager } from '@/lib/cohorts/access';
import { inviteAddresses } from '@/lib/cohorts/invite';

type Ctx = { params: Promise<{ id: string }> };

/** Invite one or many addresses; the answer lists each address with its outcome. */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cohorts);
  const { id } = await parseParams(ctx.params, idParamSchema);
  const cohort = await cohortForManager(user, id);
  const { emails } = await parseJsonBody(req, inviteSchema);
  const results = await inviteAddresses(cohort, user, emails);
  return Response.json({ results });
});
