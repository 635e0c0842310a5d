import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { assertCanReadSubject, getJob } from '@/lib/jobs';
import { jobIdParamSchema } from '@/lib/schemas/jobs';

type Ctx = { params: Promise<{ id: string }> };

export const dynamic = 'force-dynamic';

/** One job (state, progress, result or error), for whoever may read its subject; anyone else gets 404. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req);
  const { id } = await parseParams(ctx.params, jobIdParamSchema);
  const job = await getJob(id);
  if (!job) throw new ApiError(404, 'No such job.');
  try {
    await assertCanReadSubject(user, job.subject);
  } catch (err) {
    // A job of a subject the caller may not read does not exist for them, whatever their role.
    if (err instanceof ApiError && err.status === 403) throw new ApiError(404, 'No such job.');
    throw err;
  }
  return Response.json({ job }, { headers: { 'cache-control': 'no-store' } });
});
