import { apiRoute } from '@/lib/api/errors';
import { pageOf } from '@/lib/api/paging';
import { replayTrace } from '@/lib/runs/service';
import { readRunPage } from '../run-reader';

type Ctx = { params: Promise<{ id: string }> };

/**
 * The run's trace, re-simulated on the server from the stored log (never a client's), paged
 * by samples. A drill's hidden signals (`fault.<card>`, the rules' signals) appear only for
 * its trainer and admins, or for the student once the drill has closed.
 */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const { user, run, hiddenVisible, page, pageSize } = await readRunPage(req, ctx.params);
  const trace = await replayTrace(run, hiddenVisible, user.id);
  const { items, ...paging } = pageOf(trace.samples, page, pageSize);
  return Response.json({ signals: trace.signals, samples: items, endMs: trace.endMs, ...paging, hiddenVisible });
});
