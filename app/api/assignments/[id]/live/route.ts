import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { assignmentForWatcher, loadBoard } from '@/lib/live/board';
import { assignmentIdParamSchema } from '@/lib/schemas/drills';

type Ctx = { params: Promise<{ id: string }> };

/** The live board as it stands (one tile per student, the timeline, the messages): the drill's trainer and admins. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, assignmentIdParamSchema);
  const { assignment, drill } = await assignmentForWatcher(user, id);
  const { board } = await loadBoard(assignment, drill);
  return Response.json(board, { headers: { 'cache-control': 'no-store' } });
});
