import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { changeoverForReader } from '@/lib/changeovers/access';
import { changeoverDiff } from '@/lib/changeovers/diff';
import { changeoverIdParamSchema } from '@/lib/schemas/changeovers';

type Ctx = { params: Promise<{ id: string }> };

/** The structural diff of base and proposal (the pin, or the cell's latest while drafting), as JSON. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id } = await parseParams(ctx.params, changeoverIdParamSchema);
  const co = await changeoverForReader(user, id);
  const { baseVersion, proposedVersion, diff } = await changeoverDiff(co);
  return Response.json({ baseVersion, proposedVersion, pinned: co.pinnedVersion !== null, diff }, { headers: { 'cache-control': 'no-store' } });
});
