import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { changeoverForEditor } from '@/lib/changeovers/access';
import { acceptCheck, withdrawCheckAcceptance } from '@/lib/changeovers/evidence-service';
import { acceptanceSchema, changeoverCheckParamSchema } from '@/lib/schemas/evidence';

type Ctx = { params: Promise<{ id: string; checkId: string }> };

/** Accepts a scenario's changed outcome with a written reason: who and when are recorded. */
export const PUT = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id, checkId } = await parseParams(ctx.params, changeoverCheckParamSchema);
  const co = await changeoverForEditor(user, id);
  const { reason } = await parseJsonBody(req, acceptanceSchema);
  return Response.json({ acceptance: await acceptCheck(user, co, checkId, reason) });
});

/** Takes the acceptance back. */
export const DELETE = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id, checkId } = await parseParams(ctx.params, changeoverCheckParamSchema);
  const co = await changeoverForEditor(user, id);
  await withdrawCheckAcceptance(co, checkId);
  return Response.json({ withdrawn: true });
});
