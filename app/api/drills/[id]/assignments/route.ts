import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { cohortForAssigning, drillForAuthor } from '@/lib/drills/access';
import { assignDrill } from '@/lib/drills/assign';
import { assignSchema, drillIdParamSchema } from '@/lib/schemas/drills';
import { listAssignmentsOfDrill } from '@/db/drills';

type Ctx = { params: Promise<{ id: string }> };

/** The drill's assignments. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, drillIdParamSchema);
  await drillForAuthor(user, id);
  return Response.json({ assignments: await listAssignmentsOfDrill(id) });
});

/**
 * Assign the drill to one of the trainer's cohorts with open and close dates; every student
 * of the cohort gets an e-mail with a link (lib/drills/assign.ts). 201 with the assignment and
 * how many messages were sent; 422 for a cohort that does not exist, 403 for another trainer's.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, drillIdParamSchema);
  const drill = await drillForAuthor(user, id);
  const body = await parseJsonBody(req, assignSchema);
  const cohort = await cohortForAssigning(user, body.cohortId);
  return Response.json(await assignDrill(user, drill, cohort, body), { status: 201 });
});
