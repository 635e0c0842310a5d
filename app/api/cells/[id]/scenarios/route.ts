import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { cellForOwner } from '@/lib/cells/access';
import { addScenario } from '@/lib/changeovers/scenario-service';
import { cellIdParamSchema } from '@/lib/schemas/cells';
import { scenarioInputSchema } from '@/lib/schemas/evidence';
import { listScenarios } from '@/db/scenarios';

type Ctx = { params: Promise<{ id: string }> };

/** The scenarios the cell keeps, without their event scripts. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cellEvidence);
  const { id } = await parseParams(ctx.params, cellIdParamSchema);
  await cellForOwner(user, id);
  return Response.json({ scenarios: await listScenarios(id) });
});

/** Adds a scenario written in the headless runner's formats (events, rules, fault cards); 409 for a name the cell already uses. */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cellEvidence);
  const { id } = await parseParams(ctx.params, cellIdParamSchema);
  const input = await parseJsonBody(req, scenarioInputSchema, 'batch');
  return Response.json({ scenario: await addScenario(user, id, input) }, { status: 201 });
});
