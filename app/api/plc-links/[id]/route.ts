import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { sessionForOwner, stopOwnSession, viewOf } from '@/lib/plc-link/sessions';
import { plcLinkIdParamSchema } from '@/lib/plc-link/schemas';

export const dynamic = 'force-dynamic';
type Ctx = { params: Promise<{ id: string }> };

/** The session's live state (status, link health, cell snapshot); the page polls it. Owner only. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.plcLink);
  const { id } = await parseParams(ctx.params, plcLinkIdParamSchema);
  return Response.json({ session: viewOf(sessionForOwner(user, id)) }, { headers: { 'cache-control': 'no-store' } });
});

/** Stops the session (idempotent): the Modbus server closes and the run keeps the PLC's writes. */
export const DELETE = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.plcLink);
  const { id } = await parseParams(ctx.params, plcLinkIdParamSchema);
  return Response.json({ session: await stopOwnSession(user, id) });
});
