import 'server-only';
import { ApiError } from '@/lib/api/errors';
import type { User } from '@/db/users';
import type { CohortSummary } from '@/db/cohorts';
import { findCohort, listCohorts } from '@/db/cohorts';

/** True when the user may manage the cohort: its own trainer, or any admin. */
export function canManageCohort(user: User, cohort: CohortSummary): boolean {
  return user.role === 'admin' || (user.role === 'trainer' && cohort.trainerId === user.id);
}

/** The cohorts the user manages: a trainer's own, every cohort for an admin. */
export function cohortsManagedBy(user: User): Promise<CohortSummary[]> {
  return listCohorts(user.role === 'admin' ? null : user.id);
}

/** Load a cohort for a route handler: 404 when missing, 403 when it belongs to another trainer. */
export async function cohortForManager(user: User, cohortId: string): Promise<CohortSummary> {
  const cohort = await findCohort(cohortId);
  if (!cohort) throw new ApiError(404, 'No such cohort.');
  if (!canManageCohort(user, cohort)) throw new ApiError(403, 'This cohort belongs to another trainer.');
  return cohort;
}
