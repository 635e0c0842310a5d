import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { cellForOwner } from '@/lib/cells/access';
import { cellIdParamSchema, duplicateCellSchema } from '@/lib/schemas/cells';
import { createCell, getVersion } from '@/db/cells';

type Ctx = { params: Promise<{ id: string }> };

/** Duplicate my cell: a new cell whose version 1 is this cell's latest version. */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const { id } = await parseParams(ctx.params, cellIdParamSchema);
  const source = await cellForOwner(user, id);
  const body = await parseJsonBody(req, duplicateCellSchema);
  const latest = await getVersion(id);
  if (!latest) throw new ApiError(404, 'No such cell.');
  const name = body.name ?? `${source.name} (copy)`.slice(0, 120);
  const cell = await createCell({
    ownerId: user.id,
    name,
    origin: 'duplicate',
    sourceCellId: source.id,
    sourceVersion: latest.version,
    document: latest.document,
    message: `Duplicated from "${source.name}" version ${latest.version}`,
  });
  return Response.json({ cell }, { status: 201 });
});
