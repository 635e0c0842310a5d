import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { cellForReader } from '@/lib/cells/access';
import { cellVersionParamSchema } from '@/lib/schemas/cells';
import { getVersion } from '@/db/cells';

type Ctx = { params: Promise<{ id: string; version: string }> };

/** One version of a cell with its document (for diffs, rollback, reloading after a conflict). */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const { id, version } = await parseParams(ctx.params, cellVersionParamSchema);
  await cellForReader(user, id);
  const found = await getVersion(id, version);
  if (!found) throw new ApiError(404, 'No such version.');
  return Response.json({ version: found });
});
