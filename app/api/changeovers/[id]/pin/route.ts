import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { changeoverForEditor } from '@/lib/changeovers/access';
import { pinChangeover, unpinChangeover } from '@/lib/changeovers/service';
import { changeoverIdParamSchema } from '@/lib/schemas/changeovers';

type Ctx = { params: Promise<{ id: string }> };

/** Pin the proposal to the cell's latest version (drafting → under check); a pinned one answers its pin. */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id } = await parseParams(ctx.params, changeoverIdParamSchema);
  const co = await changeoverForEditor(user, id);
  return Response.json({ changeover: await pinChangeover(user, co) });
});

/** Back to drafting: the proposal follows the cell's latest version again; a waiting signature is dropped. */
export const DELETE = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id } = await parseParams(ctx.params, changeoverIdParamSchema);
  const co = await changeoverForEditor(user, id);
  return Response.json({ changeover: await unpinChangeover(user, co) });
});
