import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { cellForOwner } from '@/lib/cells/access';
import { cellScenarioParamSchema, scenarioPatchSchema } from '@/lib/schemas/evidence';
import { deleteScenario, findScenario, updateScenario } from '@/db/scenarios';

type Ctx = { params: Promise<{ id: string; scenarioId: string }> };

/** One scenario with its event script. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cellEvidence);
  const { id, scenarioId } = await parseParams(ctx.params, cellScenarioParamSchema);
  await cellForOwner(user, id);
  const scenario = await findScenario(id, scenarioId);
  if (!scenario) throw new ApiError(404, 'No such scenario.');
  return Response.json({ scenario });
});

/** Renames a scenario or rewrites its description or rules (its script stays what the run did). */
export const PATCH = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cellEvidence);
  const { id, scenarioId } = await parseParams(ctx.params, cellScenarioParamSchema);
  await cellForOwner(user, id);
  const patch = await parseJsonBody(req, scenarioPatchSchema);
  const result = await updateScenario(id, scenarioId, patch);
  if (!result.ok && result.reason === 'missing') throw new ApiError(404, 'No such scenario.');
  if (!result.ok) throw new ApiError(409, 'The cell already keeps a scenario by that name.', { name: ['This name is taken in this cell.'] });
  return Response.json({ scenario: result.scenario });
});

export const DELETE = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cellEvidence);
  const { id, scenarioId } = await parseParams(ctx.params, cellScenarioParamSchema);
  await cellForOwner(user, id);
  if (!(await deleteScenario(id, scenarioId))) throw new ApiError(404, 'No such scenario.');
  return Response.json({ deleted: true });
});
