import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { cellForOwner } from '@/lib/cells/access';
import { cellShareParamSchema } from '@/lib/schemas/cells';
import { listShares, unshareCell } from '@/db/cells';

type Ctx = { params: Promise<{ id: string; cohortId: string }> };

/** Stop sharing my cell with a cohort. Copies students already opened stay theirs. */
export const DELETE = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.shareCells);
  const { id, cohortId } = await parseParams(ctx.params, cellShareParamSchema);
  await cellForOwner(user, id);
  if (!(await unshareCell(id, cohortId))) throw new ApiError(404, 'This cell is not shared with that cohort.');
  return Response.json({ shares: await listShares(id) });
});
