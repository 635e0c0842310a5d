import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { keepRunAsScenario } from '@/lib/changeovers/scenario-service';
import { keepScenarioSchema } from '@/lib/schemas/evidence';
import { runIdParamSchema } from '@/lib/schemas/runs';

type Ctx = { params: Promise<{ id: string }> };

/**
 * Keeps a finished run as a scenario of its cell (leads and trainers, for runs they may read
 * on cells they own): 201 with the scenario and how many editing events were left out.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cellEvidence);
  const { id } = await parseParams(ctx.params, runIdParamSchema);
  const input = await parseJsonBody(req, keepScenarioSchema);
  const { scenario, leftOut } = await keepRunAsScenario(user, id, input);
  const { events: _e, ...summary } = scenario;
  return Response.json({ scenario: { ...summary, eventCount: scenario.events.length }, leftOut }, { status: 201 });
});
