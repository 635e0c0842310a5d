import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { assignmentForStudent, studentDrillPayload } from '@/lib/drills/access';
import { assignmentIdParamSchema } from '@/lib/schemas/drills';
import { getVersion } from '@/db/cells';

type Ctx = { params: Promise<{ id: string }> };

/**
 * The drill as a student receives it: brief, objectives, time limit, what they may use, and
 * the base cell document to draw the workspace; the brief and the cell only once the assignment
 * has opened. Never the fault cards, the rules or the answer.
 */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.attemptDrills);
  const { id } = await parseParams(ctx.params, assignmentIdParamSchema);
  const { assignment, drill } = await assignmentForStudent(user, id);
  const payload = await studentDrillPayload(assignment, drill);
  const version = payload.state === 'upcoming' ? null : await getVersion(drill.cellId, drill.cellVersion);
  return Response.json({ ...payload, document: version?.document ?? null });
});
