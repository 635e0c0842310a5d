import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { cellForOwner, cohortForSharing, shareableCohorts } from '@/lib/cells/access';
import { cellIdParamSchema, shareCellSchema } from '@/lib/schemas/cells';
import { listShares, shareCell } from '@/db/cells';

type Ctx = { params: Promise<{ id: string }> };

/** The cohorts my cell is shared with, and the cohorts I may share it with. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.shareCells);
  const { id } = await parseParams(ctx.params, cellIdParamSchema);
  await cellForOwner(user, id);
  const cohorts = (await shareableCohorts(user)).map((c) => ({ cohortId: c.id, cohortName: c.name, memberCount: c.memberCount }));
  return Response.json({ shares: await listShares(id), cohorts });
});

/** Share my cell with a cohort (trainers: their own cohorts; leads: any cohort). Sharing twice is harmless. */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.shareCells);
  const { id } = await parseParams(ctx.params, cellIdParamSchema);
  await cellForOwner(user, id);
  const body = await parseJsonBody(req, shareCellSchema);
  await cohortForSharing(user, body.cohortId);
  await shareCell(id, body.cohortId, user.id);
  return Response.json({ shares: await listShares(id) });
});
