import { apiRoute } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { assignmentsOf } from '@/lib/drills/access';

/**
 * Students: the drills assigned to their cohorts, each marked upcoming / open / closed, with
 * their run if started. Trainers: the assignments of their drills (admins: all). Leads have none.
 */
export const GET = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.assignments);
  return Response.json({ assignments: await assignmentsOf(user) });
});
