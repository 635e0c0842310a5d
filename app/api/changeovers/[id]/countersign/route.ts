import { apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { changeoverForCountersigner } from '@/lib/changeovers/access';
import { countersignFor } from '@/lib/changeovers/sign-off';
import { changeoverIdParamSchema, signatureSchema } from '@/lib/schemas/changeovers';

type Ctx = { params: Promise<{ id: string }> };

/**
 * A second person countersigns (the person asked, or the administrator; never the signer: 403).
 * Writes the immutable record and answers it (201). 409 with `blockers` while the evidence is
 * not ready, or when the signer has not signed yet.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.countersign);
  const { id } = await parseParams(ctx.params, changeoverIdParamSchema);
  const co = await changeoverForCountersigner(user, id);
  const body = await parseJsonBody(req, signatureSchema);
  return Response.json({ record: await countersignFor(user, co, body) }, { status: 201 });
});
