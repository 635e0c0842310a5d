import { apiRoute, ApiError, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { mailIdParamSchema } from '@/lib/schemas/admin';
import { getMail } from '@/db/mail';

type Ctx = { params: Promise<{ id: string }> };

/** Admin: one captured message with its text and HTML bodies. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  await requireApiUser(req, ROLE_TABLE.administer);
  const { id } = await parseParams(ctx.params, mailIdParamSchema);
  const message = await getMail(id);
  if (!message) throw new ApiError(404, 'No such message.');
  return Response.json({ message });
});
