import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { cellForOwner } from '@/lib/cells/access';
import { cellIdParamSchema } from '@/lib/schemas/cells';
import { interlockRuleInputSchema } from '@/lib/schemas/evidence';
import { createInterlockRule, listInterlockRules, MAX_RULES_PER_CELL } from '@/db/interlock-rules';

type Ctx = { params: Promise<{ id: string }> };

/** The interlock rules the cell keeps, in order (its owner: a lead or a trainer). */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cellEvidence);
  const { id } = await parseParams(ctx.params, cellIdParamSchema);
  await cellForOwner(user, id);
  return Response.json({ rules: await listInterlockRules(id) });
});

/** Adds a rule (a title and the rule the form built; 422 naming `rule.…` when the engine refuses it). */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.cellEvidence);
  const { id } = await parseParams(ctx.params, cellIdParamSchema);
  await cellForOwner(user, id);
  const input = await parseJsonBody(req, interlockRuleInputSchema);
  const result = await createInterlockRule(id, user.id, input);
  if (!result.ok) throw new ApiError(409, `A cell keeps at most ${MAX_RULES_PER_CELL} interlock rules.`);
  return Response.json({ rule: result.rule }, { status: 201 });
});
