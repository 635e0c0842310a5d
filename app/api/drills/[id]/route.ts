import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { drillForAuthor } from '@/lib/drills/access';
import { updateDrill } from '@/lib/drills/author';
import { drillIdParamSchema, drillPatchSchema } from '@/lib/schemas/drills';
import { deleteDrill } from '@/db/drills';

type Ctx = { params: Promise<{ id: string }> };

/** The whole drill, for its author (or an admin). */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, drillIdParamSchema);
  return Response.json({ drill: await drillForAuthor(user, id) });
});

/** Change a drill (lib/drills/author.ts): 409 once students have started it, 422 when it does not fit its base cell. */
export const PATCH = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, drillIdParamSchema);
  const drill = await drillForAuthor(user, id);
  const patch = await parseJsonBody(req, drillPatchSchema, 'drill');
  return Response.json({ drill: await updateDrill(user, drill, patch) });
});

/** Delete (soft): runs and grades stay in the gradebook. */
export const DELETE = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, drillIdParamSchema);
  await drillForAuthor(user, id);
  await deleteDrill(id);
  return Response.json({ deleted: true });
});
