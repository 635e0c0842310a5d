import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { assignmentForStudent } from '@/lib/drills/access';
import { startOrResumeAttempt } from '@/lib/drills/attempt';
import { ownerRunView } from '@/lib/runs/access';
import { assignmentIdParamSchema } from '@/lib/schemas/drills';

type Ctx = { params: Promise<{ id: string }> };

/**
 * Start the student's attempt, or resume it (lib/drills/attempt.ts): a reload (or a second tab)
 * gets the same run back (200) instead of a new one (201). A drill that is not open yet, or has
 * closed, cannot be started (403); an existing run is still returned.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.attemptDrills);
  const { id } = await parseParams(ctx.params, assignmentIdParamSchema);
  const { assignment, drill } = await assignmentForStudent(user, id);
  const { run, created } = await startOrResumeAttempt(user, assignment, drill);
  return Response.json({ run: await ownerRunView(run), resumed: !created }, { status: created ? 201 : 200 });
});
