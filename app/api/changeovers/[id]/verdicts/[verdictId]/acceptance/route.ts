import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { changeoverForEditor } from '@/lib/changeovers/access';
import { acceptVerdict, withdrawVerdictAcceptance } from '@/lib/changeovers/evidence-service';
import { acceptanceSchema, changeoverVerdictParamSchema } from '@/lib/schemas/evidence';

type Ctx = { params: Promise<{ id: string; verdictId: string }> };

/** Accepts the proposal's violation (or undecided answer) of a rule with a written reason: who and when are recorded. */
export const PUT = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id, verdictId } = await parseParams(ctx.params, changeoverVerdictParamSchema);
  const co = await changeoverForEditor(user, id);
  const { reason } = await parseJsonBody(req, acceptanceSchema);
  return Response.json({ acceptance: await acceptVerdict(user, co, verdictId, reason) });
});

/** Takes the acceptance back. */
export const DELETE = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id, verdictId } = await parseParams(ctx.params, changeoverVerdictParamSchema);
  const co = await changeoverForEditor(user, id);
  await withdrawVerdictAcceptance(co, verdictId);
  return Response.json({ withdrawn: true });
});
