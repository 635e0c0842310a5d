import { ApiError, apiRoute, parseParams, parseQuery } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { cellForReader } from '@/lib/cells/access';
import { downloadName } from '@/lib/cells/download';
import { cellIdParamSchema, exportQuerySchema } from '@/lib/schemas/cells';
import { getVersion } from '@/db/cells';

type Ctx = { params: Promise<{ id: string }> };

/** The cell document as a JSON file (latest version, or `?version=n`); importable as is. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const { id } = await parseParams(ctx.params, cellIdParamSchema);
  const { version } = parseQuery(req, exportQuerySchema);
  const { cell } = await cellForReader(user, id);
  const found = await getVersion(id, version);
  if (!found) throw new ApiError(404, 'No such version.');
  return new Response(JSON.stringify(found.document, null, 2) + '\n', {
    headers: {
      'content-type': 'application/json; charset=utf-8',
      'content-disposition': `attachment; filename="${downloadName(cell.name)}-v${found.version}.json"`,
      'cache-control': 'no-store',
    },
  });
});
