import 'server-only';
import { ApiError } from '@/lib/api/errors';
import type { User } from '@/db/users';
import { findAssignment, findDrill, isCohortMember, type Assignment, type Drill } from '@/db/drills';
import { listAssets, type DrillAssetMeta } from '@/db/drill-assets';
// The diagnosis form's catalogue (DIAGNOSIS_KINDS in lib/schemas/drills.ts) is static and not
// sent here, so a payload search for fault kinds finds only what would be a leak.
import type { DrillPermissions } from '@/lib/schemas/drills';
import { assignmentState, type AssignmentState } from './assignment-window';

/** A drill the user may author: 404 for another trainer's (ids reveal nothing). */
export async function drillForAuthor(user: User, id: string): Promise<Drill> {
  const drill = await findDrill(id);
  if (!drill || (user.role !== 'admin' && drill.trainerId !== user.id)) throw new ApiError(404, 'No such drill.');
  return drill;
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
