import { apiRoute } from '@/lib/api/errors';
import { pageOf } from '@/lib/api/paging';
import { sanitiseEvents } from '@/lib/runs/sanitise';
import { storedLog } from '@/lib/runs/service';
import { readRunPage } from '../run-reader';

type Ctx = { params: Promise<{ id: string }> };

/** The run's event log, a page at a time (owner, the drill's trainer, admins). */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const { run, hiddenVisible, page, pageSize } = await readRunPage(req, ctx.params);
  const log = await storedLog(run.id);
  const events = hiddenVisible ? log.events : sanitiseEvents(log.events);
  const { items, ...paging } = pageOf(events, page, pageSize);
  return Response.json({ events: items, ...paging, untilMs: run.endedMs ?? log.untilMs });
});
