import { apiRoute } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { sessionsOf, startSession } from '@/lib/plc-link/sessions';
import { startPlcLinkSchema } from '@/lib/plc-link/schemas';

export const dynamic = 'force-dynamic';

/** The caller's PLC-link sessions on this server (live and recently finished). */
export const GET = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.plcLink);
  return Response.json({ sessions: sessionsOf(user).map(({ snapshot: _s, ...rest }) => rest) });
});

/**
 * Starts a PLC-link session on a cell the caller may read: 201 with the session; 409 when the
 * port is held (the body names the session holding it) or the caller's own cap is reached;
 * 503 with Retry-After at the server's cap.
 */
export const POST = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.plcLink);
  const body = await parseJsonBody(req, startPlcLinkSchema);
  const session = await startSession(user, body);
  return Response.json({ session }, { status: 201 });
});
