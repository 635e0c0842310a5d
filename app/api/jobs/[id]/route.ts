import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { jobForReader } from '@/lib/jobs';
import { jobIdParamSchema } from '@/lib/schemas/jobs';

type Ctx = { params: Promise<{ id: string }> };

export const dynamic = 'force-dynamic';

/** One job (state, progress, result or error), for whoever may read its subject; anyone else gets 404. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req);
  const { id } = await parseParams(ctx.params, jobIdParamSchema);
  return Response.json({ job: await jobForReader(user, id) }, { headers: { 'cache-control': 'no-store' } });
});
