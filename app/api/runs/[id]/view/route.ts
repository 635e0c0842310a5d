import { apiRoute, parseParams, parseQuery } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { runForOwner } from '@/lib/runs/access';
import { viewRun } from '@/lib/runs/service';
import { runIdParamSchema, viewQuerySchema } from '@/lib/schemas/runs';

type Ctx = { params: Promise<{ id: string }> };

/**
 * What the run's owner sees at cell time `t`: the server's cell advanced to max(t, the stored
 * end), capped at the drill's time limit. A drill run's snapshot is sanitised (no fault cards).
 */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req);
  const { id } = await parseParams(ctx.params, runIdParamSchema);
  const run = await runForOwner(user, id);
  const { t } = parseQuery(req, viewQuerySchema);
  const view = await viewRun(run, t);
  return Response.json(view, { headers: { 'cache-control': 'no-store' } });
});
