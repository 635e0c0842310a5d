import 'server-only';
import { ApiError } from '@/lib/api/errors';
import type { User } from '@/db/users';
import { findDrill, hasUnclosedAssignmentFor } from '@/db/drills';
import { findRun, type Run } from '@/db/runs';
import { notClosedSince } from '@/lib/drills/assignment-window';

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
 * drill's fault cards, rules and breakdown may be shown: to the trainer and admins always, to
 * the student only once every assignment of that drill they could still attempt has closed
 * (the same drill may be assigned again, to this cohort or another of theirs).
 */
export async function runForReader(user: User, id: string): Promise<{ run: Run; reader: RunReader; hiddenVisible: boolean }> {
  const run = await findRun(id);
  if (!run) throw new ApiError(404, 'No such run.');
  const drill = run.drillId ? await findDrill(run.drillId, { includeDeleted: true }) : null;
  if (user.role === 'admin') return { run, reader: 'admin', hiddenVisible: true };
  if (drill && drill.trainerId === user.id) return { run, reader: 'trainer', hiddenVisible: true };
  if (run.userId !== user.id) throw new ApiError(404, 'No such run.');
  if (run.mode === 'practice') return { run, reader: 'owner', hiddenVisible: true };
  return { run, reader: 'owner', hiddenVisible: await drillSecretsVisibleToStudent(run.drillId, user.id) };
}

/**
 * A drill run whose grade the user may override: its drill's trainer or an admin. The run's
 * own student and practice runs get 404 (there is no grade of theirs to override), and a run
 * not yet submitted 409 (it has no grade yet).
 */
export async function runForGrader(user: User, id: string): Promise<{ run: Run; reader: RunReader }> {
  const { run, reader } = await runForReader(user, id);
  if (reader === 'owner' || run.mode !== 'drill') throw new ApiError(404, 'No such run.');
  if (run.status !== 'submitted') throw new ApiError(409, 'Only a submitted run has a grade to override.');
  return { run, reader };
}

/** The run as its owner may see it now: a practice run whole, a drill run's hidden parts only once drillSecretsVisibleToStudent allows. */
export async function ownerRunView(run: Run) {
  const visible = run.mode === 'practice' || (await drillSecretsVisibleToStudent(run.drillId, run.userId));
  return runView(run, visible);
}

/** Whether a student may see a drill's hidden parts: only when no assignment of it to any of their cohorts is still open or to come. */
export async function drillSecretsVisibleToStudent(drillId: string | null, userId: string): Promise<boolean> {
  if (!drillId) return false;
  return !(await hasUnclosedAssignmentFor(drillId, userId, notClosedSince()));
}

/**
 * A run as its reader may see it: a student sees the grade but not the breakdown's rule
 * internals until the drill's hidden parts may be shown (runForReader). The run's seed goes to
 * the drill's trainer and admins only, never to the student (a practice run's seed is chosen
 * by the student's own browser).
 */
export function runView(run: Run, hiddenVisible: boolean, reader: RunReader = 'owner') {
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
  const withBreakdown = { ...base, breakdown: hiddenVisible ? run.breakdown : null };
  return reader === 'owner' ? withBreakdown : { ...withBreakdown, seed: run.seed };
}
