import { apiRoute, parseParams, parseQuery } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { runForReader } from '@/lib/runs/access';
import { sanitiseEvents } from '@/lib/runs/sanitise';
import { storedLog } from '@/lib/runs/service';
import { pageQuerySchema, runIdParamSchema } from '@/lib/schemas/runs';

type Ctx = { params: Promise<{ id: string }> };

/** The run's event log, a page at a time (owner, the drill's trainer, admins). */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req);
  const { id } = await parseParams(ctx.params, runIdParamSchema);
  const { run, hiddenVisible } = await runForReader(user, id);
  const { page, pageSize } = parseQuery(req, pageQuerySchema);
  const log = await storedLog(run.id);
  const events = hiddenVisible ? log.events : sanitiseEvents(log.events);
  const start = (page - 1) * pageSize;
  return Response.json({
    events: events.slice(start, start + pageSize),
    page,
    pageSize,
    total: events.length,
    pages: Math.max(1, Math.ceil(events.length / pageSize)),
    untilMs: run.endedMs ?? log.untilMs,
  });
});
