import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { assignmentForStudent, assignmentState } from '@/lib/drills/access';
import { drillSecretsVisibleToStudent, runView } from '@/lib/runs/access';
import { newSeed, prepareLiveRun } from '@/lib/runs/service';
import { assignmentIdParamSchema } from '@/lib/schemas/drills';
import { findRunOfAssignment, startAssignmentRun } from '@/db/runs';
import { ROLE_TABLE } from '@/lib/roles';

type Ctx = { params: Promise<{ id: string }> };

/**
 * Start the student's attempt, or resume it: one run per student and assignment, so a reload
 * (or a second tab) gets the same run back (200) instead of a new one (201). A drill that is
 * not open yet, or has closed, cannot be started (403); an existing run is still returned.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.attemptDrills);
  const { id } = await parseParams(ctx.params, assignmentIdParamSchema);
  const { assignment, drill } = await assignmentForStudent(user, id);
  const state = assignmentState(assignment);
  if (state === 'upcoming') throw new ApiError(403, 'This drill is not open yet.');
  const { run, created } = await (async () => {
    if (state === 'closed') {
      const existing = await findRunOfAssignment(assignment.id, user.id);
      if (!existing) throw new ApiError(403, 'This drill has closed.');
      return { run: existing, created: false };
    }
    return startAssignmentRun({ userId: user.id, mode: 'drill', drillId: drill.id, assignmentId: assignment.id, cellId: drill.cellId, cellVersion: drill.cellVersion, seed: newSeed() });
  })();
  if (state === 'open') await prepareLiveRun(run);
  const visible = state === 'closed' && (await drillSecretsVisibleToStudent(drill.id, user.id));
  return Response.json({ run: runView(run, visible), resumed: !created }, { status: created ? 201 : 200 });
});
