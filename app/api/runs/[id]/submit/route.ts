import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ownerRunView, runForOwner } from '@/lib/runs/access';
import { submit } from '@/lib/runs/service';
import { runIdParamSchema, submitSchema } from '@/lib/schemas/runs';

type Ctx = { params: Promise<{ id: string }> };

/**
 * Submit (a drill run, with the diagnosis) or finish (a practice run). The server regrades
 * from the stored log; a second submit → 409, after the close date → 403; nothing changes then.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req);
  const { id } = await parseParams(ctx.params, runIdParamSchema);
  const run = await runForOwner(user, id);
  const body = await parseJsonBody(req, submitSchema);
  const done = await submit(run, body.diagnosis ?? null);
  return Response.json({ run: await ownerRunView(done) });
});
