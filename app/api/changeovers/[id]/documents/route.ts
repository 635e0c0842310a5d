import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { changeoverForReader } from '@/lib/changeovers/access';
import { changeoverDocuments } from '@/lib/changeovers/diff';
import { changeoverIdParamSchema } from '@/lib/schemas/changeovers';

type Ctx = { params: Promise<{ id: string }> };

/** The base and proposal documents, for the rule builder's signal pickers and the scopes' labels. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id } = await parseParams(ctx.params, changeoverIdParamSchema);
  const docs = await changeoverDocuments(await changeoverForReader(user, id));
  return Response.json(docs);
});
