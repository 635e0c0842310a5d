import { apiRoute } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { openChangeoverFor } from '@/lib/changeovers/service';
import { openChangeoverSchema } from '@/lib/schemas/changeovers';
import { listChangeoversFor } from '@/db/changeovers';

/** The changeovers I may read: mine, those on my cells, those I am asked to countersign (all, for the admin). */
export const GET = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  return Response.json({ changeovers: await listChangeoversFor(user) });
});

/** Open a changeover on one of my cells (leads and trainers); 422 for a cell that is not mine or a version it lacks. */
export const POST = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.openChangeovers);
  const body = await parseJsonBody(req, openChangeoverSchema);
  const changeover = await openChangeoverFor(user, body);
  return Response.json({ changeover }, { status: 201 });
});
