import 'server-only';
import { ApiError } from '@/lib/api/errors';
import { newSeed, prepareLiveRun } from '@/lib/runs/service';
import { findRunOfAssignment, startAssignmentRun, type Run } from '@/db/runs';
import type { Assignment, Drill } from '@/db/drills';
import type { User } from '@/db/users';
import { assignmentState } from './assignment-window';

/**
 * The student's attempt at an assignment, started now or resumed: one run per student and
 * assignment, so a reload (or a second tab) gets the same run back. A drill that is not open
 * yet cannot be started (403), nor one that has closed (403), though an existing run of a
 * closed one is still returned to be read. An open attempt is readied on the live engine.
 */
export async function startOrResumeAttempt(user: User, assignment: Assignment, drill: Drill): Promise<{ run: Run; created: boolean }> {
  const state = assignmentState(assignment);
  if (state === 'upcoming') throw new ApiError(403, 'This drill is not open yet.');
  if (state === 'closed') {
    const existing = await findRunOfAssignment(assignment.id, user.id);
    if (!existing) throw new ApiError(403, 'This drill has closed.');
    return { run: existing, created: false };
  }
  const started = await startAssignmentRun({ userId: user.id, mode: 'drill', drillId: drill.id, assignmentId: assignment.id, cellId: drill.cellId, cellVersion: drill.cellVersion, seed: newSeed() });
  await prepareLiveRun(started.run);
  return started;
}
