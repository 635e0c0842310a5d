import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { changeoverForEditor } from '@/lib/changeovers/access';
import { startEvidenceJob } from '@/lib/changeovers/evidence-service';
import { changeoverIdParamSchema } from '@/lib/schemas/changeovers';

type Ctx = { params: Promise<{ id: string }> };

/**
 * Runs the changeover's scenario checks (every scenario of the cell, on base and proposal) as a job:
 * 202 with the run (its progress streams on subject `changeover:<id>`); the run already under
 * way when there is one (`created: false`). 409 once the changeover is signed or closed.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id } = await parseParams(ctx.params, changeoverIdParamSchema);
  const co = await changeoverForEditor(user, id);
  const { run, created } = await startEvidenceJob(user, co, 'checks');
  return Response.json({ run, created }, { status: 202 });
});
