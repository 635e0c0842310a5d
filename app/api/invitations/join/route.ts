import { apiRoute } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { linkRefused } from '@/lib/auth/link-refusals';
import { joinInvitationSchema } from '@/lib/schemas/auth';
import { joinWithInvitation } from '@/db/invitations';

/** A signed-in student whose address was invited joins the cohort with the link (404 / 409: lib/auth/link-refusals.ts). */
export const POST = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.joinCohorts);
  const { token } = await parseJsonBody(req, joinInvitationSchema, 'auth');
  const result = await joinWithInvitation(token, user.id);
  if (!result.ok) throw linkRefused('join-cohort', result.reason);
  return Response.json({ joined: true });
});
