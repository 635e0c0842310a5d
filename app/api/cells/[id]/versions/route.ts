import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { cellForOwner, cellForReader } from '@/lib/cells/access';
import { checkDocument, problemsToFields } from '@/lib/cells/document';
import { cellIdParamSchema, saveVersionSchema } from '@/lib/schemas/cells';
import { listVersions, saveVersion } from '@/db/cells';
import { ROLE_TABLE } from '@/lib/roles';

type Ctx = { params: Promise<{ id: string }> };

/** Every version of a cell (newest first), without documents. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const { id } = await parseParams(ctx.params, cellIdParamSchema);
  await cellForReader(user, id);
  return Response.json({ versions: await listVersions(id) });
});

/**
 * Save a new version on top of `baseVersion`. 409 `{ error, latestVersion }` when someone
 * saved in between (nothing is written; the client still holds its document); 422 with
 * every problem's path when the document does not fit the cell schema. Cross-reference
 * problems do not block a save: they come back as `problems`.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cells);
  const { id } = await parseParams(ctx.params, cellIdParamSchema);
  await cellForOwner(user, id);
  const body = await parseJsonBody(req, saveVersionSchema, 'cell');
  const checked = checkDocument(body.document);
  if (!checked.ok) throw new ApiError(422, 'The cell document does not fit the cell schema.', problemsToFields(checked.problems));
  const result = await saveVersion(id, user.id, body.baseVersion, checked.document, body.message);
  if (!result.ok && result.reason === 'missing') throw new ApiError(404, 'No such cell.');
  if (!result.ok) {
    return Response.json(
      { error: `Someone saved version ${result.latestVersion} after the version you started from. Your changes were not saved; reload or keep a copy.`, latestVersion: result.latestVersion },
      { status: 409, headers: { 'cache-control': 'no-store' } },
    );
  }
  return Response.json({ version: result.version, problems: checked.problems }, { status: 201 });
});
