import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { changeoverAbilities, changeoverForReader } from '@/lib/changeovers/access';
import { loadEvidenceDetail } from '@/lib/changeovers/evidence';
import { changeoverIdParamSchema } from '@/lib/schemas/changeovers';
import { listInterlockRules } from '@/db/interlock-rules';
import { listScenarios } from '@/db/scenarios';

type Ctx = { params: Promise<{ id: string }> };

/**
 * The changeover's evidence as its page shows it: the latest proofs and checks with their
 * acceptances, readiness and blockers, the runs under way, and the cell's current interlock
 * rules and scenarios (what the next run would prove and check).
 */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id } = await parseParams(ctx.params, changeoverIdParamSchema);
  const co = await changeoverForReader(user, id);
  const [evidence, rules, scenarios] = await Promise.all([loadEvidenceDetail(co.id, co), listInterlockRules(co.cellId), listScenarios(co.cellId)]);
  return Response.json(
    {
      changeover: { id: co.id, cellId: co.cellId, state: co.state, baseVersion: co.baseVersion, proposedVersion: co.pinnedVersion ?? co.proposedVersion, pinnedVersion: co.pinnedVersion, signedBy: co.signedBy },
      canEdit: changeoverAbilities(user, co).edit,
      evidence,
      rules,
      scenarios,
    },
    { headers: { 'cache-control': 'no-store' } },
  );
});
