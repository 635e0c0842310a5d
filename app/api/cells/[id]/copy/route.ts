import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { sharedCellForCopy } from '@/lib/cells/access';
import { cellIdParamSchema } from '@/lib/schemas/cells';
import { openStudentCopy } from '@/db/cells';

type Ctx = { params: Promise<{ id: string }> };

/**
 * A student opens a cell shared with their cohort: they get their own copy (201 when made
 * now, 200 when they had one already), linked to its source.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.copySharedCells);
  const { id } = await parseParams(ctx.params, cellIdParamSchema);
  const cell = await sharedCellForCopy(user, id);
  const copy = await openStudentCopy(cell, user.id);
  return Response.json({ cell: copy.cell }, { status: copy.created ? 201 : 200 });
});
