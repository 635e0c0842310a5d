import { apiRoute } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { assignmentState } from '@/lib/drills/access';
import { listAssignmentsForStudent, listAssignmentsOfTrainer } from '@/db/drills';

/**
 * Students: the drills assigned to their cohorts, each marked upcoming / open / closed, with
 * their run if started. Trainers: the assignments of their drills (admins: all). Leads have none.
 */
export const GET = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req, ROLE_TABLE.assignments);
  if (user.role === 'student') {
    const rows = await listAssignmentsForStudent(user.id);
    return Response.json({ assignments: rows.map((a) => ({ ...a, state: assignmentState(a) })) });
  }
  const rows = await listAssignmentsOfTrainer(user.role === 'admin' ? null : user.id);
  return Response.json({ assignments: rows.map((a) => ({ ...a, state: assignmentState(a) })) });
});
