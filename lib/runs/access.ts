import 'server-only';
import { ApiError } from '@/lib/api/errors';
import type { User } from '@/db/users';
import { findAssignment, findDrill } from '@/db/drills';
import { findRun, type Run } from '@/db/runs';

/** A run the user owns (batches, view, submit); anybody else gets 404. */
export async function runForOwner(user: User, id: string): Promise<Run> {
  const run = await findRun(id);
  if (!run || run.userId !== user.id) throw new ApiError(404, 'No such run.');
  return run;
}

export type RunReader = 'owner' | 'trainer' | 'admin';

/**
 * A run the user may read (replay, events, trace): its owner, the trainer of its drill, or an
 * admin. Other people get 404, so run ids reveal nothing. `hiddenVisible` says whether the
 * drill's fault cards may be shown: to the trainer and admins always, to the student only
 * once the drill has closed.
 */
export async function runForReader(user: User, id: string): Promise<{ run: Run; reader: RunReader; hiddenVisible: boolean }> {
  const run = await findRun(id);
  if (!run) throw new ApiError(404, 'No such run.');
  const drill = run.drillId ? await findDrill(run.drillId, { includeDeleted: true }) : null;
  if (user.role === 'admin') return { run, reader: 'admin', hiddenVisible: true };
  if (drill && drill.trainerId === user.id) return { run, reader: 'trainer', hiddenVisible: true };
  if (run.userId !== user.id) throw new ApiError(404, 'No such run.');
  if (run.mode === 'practice') return { run, reader: 'owner', hiddenVisible: true };
  const assignment = run.assignmentId ? await findAssignment(run.assignmentId) : null;
  const closed = assignment !== null && Date.now() > Date.parse(assignment.closesAt);
  return { run, reader: 'owner', hiddenVisible: closed };
}

/** A run as its reader may see it: a student sees the grade but not the breakdown's rule internals until the drill closes. */
export function runView(run: Run, hiddenVisible: boolean) {
  const base = {
    id: run.id,
    userId: run.userId,
    userName: run.userName,
    mode: run.mode,
    drillId: run.drillId,
    assignmentId: run.assignmentId,
    cellId: run.cellId,
    cellVersion: run.cellVersion,
    status: run.status,
    startedAt: run.startedAt,
    submittedAt: run.submittedAt,
    endedMs: run.endedMs,
    lastSeq: run.lastSeq,
    untilMs: run.untilMs,
    diagnosis: run.diagnosis,
    grade: run.overrideGrade ?? run.grade,
    computedGrade: run.grade,
    overridden: run.overrideGrade !== null,
    overrideReason: run.overrideReason,
    traceHash: run.traceHash,
  };
  return hiddenVisible ? { ...base, seed: run.seed, breakdown: run.breakdown } : { ...base, breakdown: null };
}
