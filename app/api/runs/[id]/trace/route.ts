import { apiRoute, parseParams, parseQuery } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { runForReader } from '@/lib/runs/access';
import { replayTrace } from '@/lib/runs/service';
import { pageQuerySchema, runIdParamSchema } from '@/lib/schemas/runs';

type Ctx = { params: Promise<{ id: string }> };

/**
 * The run's trace, re-simulated on the server from the stored log (never a client's), paged
 * by samples. A drill's hidden signals (`fault.<card>`, the rules' signals) appear only for
 * its trainer and admins, or for the student once the drill has closed.
 */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req);
  const { id } = await parseParams(ctx.params, runIdParamSchema);
  const { run, hiddenVisible } = await runForReader(user, id);
  const { page, pageSize } = parseQuery(req, pageQuerySchema);
  const trace = await replayTrace(run, hiddenVisible);
  const start = (page - 1) * pageSize;
  return Response.json({
    signals: trace.signals,
    samples: trace.samples.slice(start, start + pageSize),
    endMs: trace.endMs,
    page,
    pageSize,
    total: trace.samples.length,
    pages: Math.max(1, Math.ceil(trace.samples.length / pageSize)),
    hiddenVisible,
  });
});
