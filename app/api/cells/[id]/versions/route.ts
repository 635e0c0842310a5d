import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { cellForOwner, cellForReader } from '@/lib/cells/access';
import { saveCellDocument } from '@/lib/cells/versions';
import { cellIdParamSchema, saveVersionSchema } from '@/lib/schemas/cells';
import { listVersions } from '@/db/cells';

type Ctx = { params: Promise<{ id: string }> };

/** Every version of a cell (newest first), without documents. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const { id } = await parseParams(ctx.params, cellIdParamSchema);
  await cellForReader(user, id);
  return Response.json({ versions: await listVersions(id) });
});

/**
 * Save a new version on top of `baseVersion` (lib/cells/versions.ts). 409 `{ error, latestVersion }`
 * when someone saved in between (nothing is written; the client still holds its document); 422
 * with every problem's path when the document does not fit the cell schema. Cross-reference
 * problems do not block a save: they come back as `problems`.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const { id } = await parseParams(ctx.params, cellIdParamSchema);
  await cellForOwner(user, id);
  const body = await parseJsonBody(req, saveVersionSchema, 'cell');
  const { version, problems } = await saveCellDocument(id, user.id, body);
  return Response.json({ version, problems }, { status: 201 });
});
