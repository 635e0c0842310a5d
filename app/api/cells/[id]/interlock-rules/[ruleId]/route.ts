import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { cellForOwner } from '@/lib/cells/access';
import { cellRuleParamSchema, interlockRuleInputSchema } from '@/lib/schemas/evidence';
import { deleteInterlockRule, updateInterlockRule } from '@/db/interlock-rules';

type Ctx = { params: Promise<{ id: string; ruleId: string }> };

/** Rewrites a rule's title and conditions (the proofs that ran on the old one stay as they were). */
export const PATCH = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cellEvidence);
  const { id, ruleId } = await parseParams(ctx.params, cellRuleParamSchema);
  await cellForOwner(user, id);
  const input = await parseJsonBody(req, interlockRuleInputSchema);
  const rule = await updateInterlockRule(id, ruleId, user.id, input);
  if (!rule) throw new ApiError(404, 'No such rule.');
  return Response.json({ rule });
});

export const DELETE = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cellEvidence);
  const { id, ruleId } = await parseParams(ctx.params, cellRuleParamSchema);
  await cellForOwner(user, id);
  if (!(await deleteInterlockRule(id, ruleId))) throw new ApiError(404, 'No such rule.');
  return Response.json({ deleted: true });
});
