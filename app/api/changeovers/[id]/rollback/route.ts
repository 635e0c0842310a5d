import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { changeoverForEditor } from '@/lib/changeovers/access';
import { rollBackFor } from '@/lib/changeovers/service';
import { changeoverIdParamSchema, rollbackSchema } from '@/lib/schemas/changeovers';

type Ctx = { params: Promise<{ id: string }> };

/**
 * Puts the base document back as the cell's current version, as a new version naming the
 * changeover (the opener, confirmed). After sign-off the changeover is rolled back; before,
 * the proposal is abandoned. 409 once it has been rolled back or abandoned.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id } = await parseParams(ctx.params, changeoverIdParamSchema);
  const co = await changeoverForEditor(user, id);
  await parseJsonBody(req, rollbackSchema);
  const { changeover, version } = await rollBackFor(user, co);
  return Response.json({ changeover, version });
});
