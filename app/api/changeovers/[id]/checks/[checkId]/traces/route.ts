import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { changeoverForReader } from '@/lib/changeovers/access';
import { changeoverCheckParamSchema } from '@/lib/schemas/evidence';
import { checkTraces, findCheck } from '@/db/changeover-evidence';

type Ctx = { params: Promise<{ id: string; checkId: string }> };

/** A check's two traces (base and proposal) for the comparison scope, with the check itself. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id, checkId } = await parseParams(ctx.params, changeoverCheckParamSchema);
  const co = await changeoverForReader(user, id);
  const [check, traces] = await Promise.all([findCheck(co.id, checkId), checkTraces(co.id, checkId)]);
  if (!check || !traces) throw new ApiError(404, 'No such check.');
  return Response.json({ check, traces });
});
