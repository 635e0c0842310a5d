import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { drillForAuthor } from '@/lib/drills/access';
import { checkDrillInput, drillAsInput } from '@/lib/drills/author';
import { drillIdParamSchema, drillPatchSchema } from '@/lib/schemas/drills';
import { deleteDrill, drillHasRuns, updateDrillUnlessFrozen } from '@/db/drills';
import { ROLE_TABLE } from '@/lib/roles';

type Ctx = { params: Promise<{ id: string }> };

/** The whole drill, for its author (or an admin). */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, drillIdParamSchema);
  return Response.json({ drill: await drillForAuthor(user, id) });
});

/**
 * Change a drill. Once anyone has started a run its grading inputs are frozen (409), so a
 * regrade of any stored run always gives its stored grade: duplicate the drill instead.
 */
export const PATCH = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, drillIdParamSchema);
  const drill = await drillForAuthor(user, id);
  const patch = await parseJsonBody(req, drillPatchSchema, 'drill');
  const frozen = () => new ApiError(409, 'Students have started this drill; its faults and grading can no longer change. Create a new drill instead.');
  if (await drillHasRuns(id)) throw frozen();
  const input = { ...drillAsInput(drill), ...Object.fromEntries(Object.entries(patch).filter(([, v]) => v !== undefined)) };
  await checkDrillInput(user, input);
  const updated = await updateDrillUnlessFrozen(id, input);
  if (updated === 'frozen') throw frozen();
  if (!updated) throw new ApiError(404, 'No such drill.');
  return Response.json({ drill: updated });
});

/** Delete (soft): runs and grades stay in the gradebook. */
export const DELETE = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, drillIdParamSchema);
  await drillForAuthor(user, id);
  await deleteDrill(id);
  return Response.json({ deleted: true });
});
