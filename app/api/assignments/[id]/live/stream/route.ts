import { apiRoute, busy, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { assignmentForWatcher, boardStream } from '@/lib/live/board';
import { liveStreamCapacity } from '@/lib/live/sse';
import { assignmentIdParamSchema } from '@/lib/schemas/drills';

export const dynamic = 'force-dynamic';

type Ctx = { params: Promise<{ id: string }> };

/** The live board as Server-Sent Events (lib/live/board.ts), fed by LISTEN/NOTIFY: the drill's trainer and admins. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, assignmentIdParamSchema);
  const { assignment, drill } = await assignmentForWatcher(user, id);
  if (!liveStreamCapacity()) throw busy('Too many live streams are open on this server; try again shortly.', 5);
  return boardStream(req, assignment, drill);
});
