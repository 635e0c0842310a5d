import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { cellForOwner, cellForReader } from '@/lib/cells/access';
import { cellIdParamSchema, renameCellSchema } from '@/lib/schemas/cells';
import { deleteCell, getVersion, renameCell } from '@/db/cells';

type Ctx = { params: Promise<{ id: string }> };

/**
 * A cell with its latest version's document. `access` is 'owner' (may save) or 'shared'
 * (a student reading a cell shared with their cohort: may run it, not save it).
 */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const { id } = await parseParams(ctx.params, cellIdParamSchema);
  const { cell, access } = await cellForReader(user, id);
  const latest = await getVersion(id);
  if (!latest) throw new ApiError(404, 'No such cell.');
  return Response.json({ cell, access, version: latest });
});

/** Rename (owner only). */
export const PATCH = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const { id } = await parseParams(ctx.params, cellIdParamSchema);
  await cellForOwner(user, id);
  const body = await parseJsonBody(req, renameCellSchema);
  return Response.json({ cell: await renameCell(id, body.name) });
});

/** Delete (owner only; soft: versions stay for runs that cite them, the cell disappears everywhere). */
export const DELETE = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const { id } = await parseParams(ctx.params, cellIdParamSchema);
  await cellForOwner(user, id);
  await deleteCell(id);
  return Response.json({ deleted: true });
});
