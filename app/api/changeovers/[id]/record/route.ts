import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { changeoverForReader } from '@/lib/changeovers/access';
import { changeoverIdParamSchema } from '@/lib/schemas/changeovers';
import { findSignedRecord } from '@/db/changeovers';

type Ctx = { params: Promise<{ id: string }> };

/** The signed record as JSON (404 before sign-off). It never changes once written. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id } = await parseParams(ctx.params, changeoverIdParamSchema);
  await changeoverForReader(user, id);
  const record = await findSignedRecord(id);
  if (!record) throw new ApiError(404, 'This changeover has no signed record yet.');
  return Response.json({ record });
});
