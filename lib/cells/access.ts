import 'server-only';
import { ApiError } from '@/lib/api/errors';
import { may } from '@/lib/roles';
import type { User } from '@/db/users';
import type { CellRecord, CellSummary, SharedCellSummary } from '@/db/cells';
import { findCell, isSharedWithMember, listCellsSharedWithMember, listOwnedCells } from '@/db/cells';
import type { CohortSummary } from '@/db/cohorts';
import { findCohort, listCohorts } from '@/db/cohorts';

export type CellAccess = 'owner' | 'shared';

/** The user's own cells and, for a student, the cells shared with their cohorts (and their copies). */
export async function cellsOf(user: User): Promise<{ cells: CellSummary[]; shared: SharedCellSummary[] }> {
  const [cells, shared] = await Promise.all([listOwnedCells(user.id), user.role === 'student' ? listCellsSharedWithMember(user.id) : Promise.resolve([])]);
  return { cells, shared };
}

/**
 * A cell the user may read: their own, or one shared with a cohort they belong to. Anything
 * else is 404, so ids of other people's cells reveal nothing.
 */
export async function cellForReader(user: User, id: string): Promise<{ cell: CellRecord; access: CellAccess }> {
  const cell = await findCell(id);
  if (!cell) throw new ApiError(404, 'No such cell.');
  if (cell.ownerId === user.id) return { cell, access: 'owner' };
  if (await isSharedWithMember(id, user.id)) return { cell, access: 'shared' };
  throw new ApiError(404, 'No such cell.');
}

/** A cell the user owns: 404 when they cannot see it, 403 when it is only shared with them. */
export async function cellForOwner(user: User, id: string): Promise<CellRecord> {
  const { cell, access } = await cellForReader(user, id);
  if (access !== 'owner') throw new ApiError(403, 'This cell is shared with your cohort to copy, not to change: open your own copy.');
  return cell;
}

/** A cell shared with the student's cohort that they may open as their own copy: 409 when it is already their own. */
export async function sharedCellForCopy(user: User, id: string): Promise<CellRecord> {
  const { cell, access } = await cellForReader(user, id);
  if (access !== 'shared') throw new ApiError(409, 'This is already your own cell.');
  return cell;
}

/** Cohorts the user may share cells with: a trainer's own cohorts; any cohort for a lead. */
export function shareableCohorts(user: User): Promise<CohortSummary[]> {
  if (user.role === 'trainer') return listCohorts(user.id);
  if (user.role === 'lead') return listCohorts(null);
  return Promise.resolve([]);
}

/** The cohort named in a share request: 422 when it does not exist, 403 when it is another trainer's. */
export async function cohortForSharing(user: User, cohortId: string): Promise<CohortSummary> {
  const cohort = await findCohort(cohortId);
  if (!cohort) throw new ApiError(422, 'Some fields are not valid.', { cohortId: ['No such cohort.'] });
  if (user.role === 'trainer' && cohort.trainerId !== user.id) throw new ApiError(403, 'You can share only with cohorts you run.');
  if (!may(user.role, 'shareCells')) throw new ApiError(403, 'Your role may not do this.');
  return cohort;
}
