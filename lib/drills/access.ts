import 'server-only';
import { ApiError } from '@/lib/api/errors';
import type { User } from '@/db/users';
import {
  cohortStudents,
  findAssignment,
  findDrill,
  isCohortMember,
  isDrillOpenedToMember,
  listAssignmentsForStudent,
  listAssignmentsOfTrainer,
  listDrills,
  type Assignment,
  type Drill,
} from '@/db/drills';
import { findCohort, type CohortSummary } from '@/db/cohorts';
import { listAssets, type DrillAssetMeta } from '@/db/drill-assets';
// The diagnosis form's catalogue (DIAGNOSIS_KINDS in lib/schemas/drills.ts) is static and not
// sent here, so a payload search for fault kinds finds only what would be a leak.
import type { DrillPermissions } from '@/lib/schemas/drills';
import { assignmentState, type AssignmentState } from './assignment-window';

/** The drills the user authors: a trainer's own (hidden parts included: they wrote them), every drill for an admin. */
export function drillsAuthoredBy(user: User): Promise<Drill[]> {
  return listDrills(user.role === 'admin' ? null : user.id);
}

/**
 * The assignments the user sees, each marked upcoming / open / closed: a student's (with their
 * run if started), a trainer's drills' (every one for an admin). Other roles have none.
 */
export async function assignmentsOf(user: User) {
  if (user.role === 'student') return (await listAssignmentsForStudent(user.id)).map((a) => ({ ...a, state: assignmentState(a) }));
  if (user.role === 'trainer' || user.role === 'admin') return (await listAssignmentsOfTrainer(user.role === 'admin' ? null : user.id)).map((a) => ({ ...a, state: assignmentState(a) }));
  return [];
}

/** A drill the user may author: 404 for another trainer's (ids reveal nothing). */
export async function drillForAuthor(user: User, id: string): Promise<Drill> {
  const drill = await findDrill(id);
  if (!drill || (user.role !== 'admin' && drill.trainerId !== user.id)) throw new ApiError(404, 'No such drill.');
  return drill;
}

/**
 * A drill whose brief images the user may see: its trainer, admins, and students it is
 * assigned to once that assignment has opened (the brief is not theirs before). Anyone else
 * gets 404, worded as for the image (`what`), so ids reveal nothing.
 */
export async function drillForImageReader(user: User, id: string, what = 'No such image.'): Promise<Drill> {
  const drill = await findDrill(id);
  if (!drill) throw new ApiError(404, what);
  const reads = user.role === 'admin' || drill.trainerId === user.id || (user.role === 'student' && (await isDrillOpenedToMember(id, user.id)));
  if (!reads) throw new ApiError(404, what);
  return drill;
}

/** A cohort the user may assign drills to: 422 naming `cohortId` when it does not exist, 403 for another trainer's (admins: any). */
export async function cohortForAssigning(user: User, cohortId: string): Promise<CohortSummary> {
  const cohort = await findCohort(cohortId);
  if (!cohort) throw new ApiError(422, 'Some fields are not valid.', { cohortId: ['No such cohort.'] });
  if (user.role !== 'admin' && cohort.trainerId !== user.id) throw new ApiError(403, 'You can assign drills only to cohorts you run.');
  return cohort;
}

/** Whom a message on the assignment may go to: a student of its cohort (422 naming `to` otherwise), or everyone (`null`). */
export async function messageRecipient(assignment: Assignment, to: string | null): Promise<string | null> {
  if (to !== null && !(await cohortStudents(assignment.cohortId)).some((s) => s.id === to)) {
    throw new ApiError(422, 'Pick a student of this cohort.', { to: ['Not a student of this cohort.'] });
  }
  return to;
}

/** An assignment given to a cohort the student belongs to; anything else is 404. */
export async function assignmentForStudent(user: User, id: string): Promise<{ assignment: Assignment; drill: Drill }> {
  const assignment = await findAssignment(id);
  if (!assignment || !(await isCohortMember(assignment.cohortId, user.id))) throw new ApiError(404, 'No such assignment.');
  const drill = await findDrill(assignment.drillId);
  if (!drill) throw new ApiError(404, 'No such assignment.');
  return { assignment, drill };
}

// The window rule itself lives in ./assignment-window.ts (pure, shared with the browser).
export { assignmentState, type AssignmentState } from './assignment-window';

/** What a student receives about a drill: never its fault cards, rules or answer. */
export interface StudentDrillPayload {
  assignmentId: string;
  state: AssignmentState;
  opensAt: string;
  closesAt: string;
  drill: {
    id: string;
    title: string;
    brief: string;
    objectives: string[];
    timeLimitMs: number;
    permissions: DrillPermissions;
    cellId: string;
    cellVersion: number;
    assets: DrillAssetMeta[];
  };
}

/**
 * Builds the student payload field by field (nothing is spread from the drill row). Before the
 * assignment opens the student learns only its title, times and limits: the brief, objectives
 * and images come with the opening (and so does the base cell; see the assignment route).
 */
export async function studentDrillPayload(assignment: Assignment, drill: Drill): Promise<StudentDrillPayload> {
  const state = assignmentState(assignment);
  const opened = state !== 'upcoming';
  return {
    assignmentId: assignment.id,
    state,
    opensAt: assignment.opensAt,
    closesAt: assignment.closesAt,
    drill: {
      id: drill.id,
      title: drill.title,
      brief: opened ? drill.brief : '',
      objectives: opened ? [...drill.objectives] : [],
      timeLimitMs: drill.timeLimitMs,
      permissions: { forceAllowed: drill.permissions.forceAllowed, editable: [...drill.permissions.editable] },
      cellId: drill.cellId,
      cellVersion: drill.cellVersion,
      assets: opened ? await listAssets(drill.id) : [],
    },
  };
}
