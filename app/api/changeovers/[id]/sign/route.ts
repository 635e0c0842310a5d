import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { changeoverForEditor } from '@/lib/changeovers/access';
import { signFor, withdrawSignatureFor } from '@/lib/changeovers/sign-off';
import { changeoverIdParamSchema, signatureSchema } from '@/lib/schemas/changeovers';

type Ctx = { params: Promise<{ id: string }> };

/**
 * The opener signs the pinned changeover. 409 with `blockers` (sentences) while the evidence is
 * not ready, 409 when the pin moved since the signer looked, 422 when the typed name is not theirs.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id } = await parseParams(ctx.params, changeoverIdParamSchema);
  const co = await changeoverForEditor(user, id);
  const body = await parseJsonBody(req, signatureSchema);
  return Response.json({ changeover: await signFor(user, co, body) });
});

/** The opener takes back a signature nobody has countersigned yet. */
export const DELETE = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id } = await parseParams(ctx.params, changeoverIdParamSchema);
  const co = await changeoverForEditor(user, id);
  return Response.json({ changeover: await withdrawSignatureFor(user, co) });
});
