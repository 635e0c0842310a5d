import 'server-only';
import { randomInt } from 'node:crypto';
import { ApiError, busy } from '@/lib/api/errors';
import { getVersion } from '@/db/cells';
import { findAssignment, findDrill, type Assignment, type Drill } from '@/db/drills';
import { findBatchByKey, findRun, insertBatch, listBatches, submitLocked, type Run, type StoredBatch } from '@/db/runs';
import type { User } from '@/db/users';
import { runForOwner } from './access';
import type { RunContext } from './engine';
import { evictLive, heavyTask, liveTask, resetEngineHost } from './engine-host';
import type { GradeTask, GradeTaskResult, LoadPayload } from './engine-worker';
import type { GradeResult } from './grade';
import { clearLiveMeta, forgetLiveMeta, getLiveMeta, putLiveMeta, withRunLock, type LiveMeta } from './live-runs';
import { allowedUntilMs, countDownloads, eventProblems, LIMITS, timeProblems } from './policy';
import { assignmentClosed } from '@/lib/drills/assignment-window';
import { gradeSignals } from './engine';
import { sanitiseSnapshot, type SanitisedSnapshot } from './sanitise';
import type { BatchInput, Diagnosis } from '@/lib/schemas/runs';
import type { CellSnapshot, LoggedEvent, Problem, Result, Trace } from '@/simulator';

/** What a run's simulation and its rules depend on, read from the database. */
export interface RunSetup {
  context: Omit<RunContext, 'trace'>;
  drill: Drill | null;
  assignment: Assignment | null;
  /** Cell time the run may reach; null for practice (the engine's own bound applies). */
  timeLimitMs: number | null;
}

/** A seed for a new run: any 32-bit value, stored on the run so its replay is exact. */
export function newSeed(): number {
  return randomInt(0, 0xffffffff);
}

export async function runSetup(run: Run): Promise<RunSetup> {
  const version = await getVersion(run.cellId, run.cellVersion);
  if (!version) throw new Error(`run ${run.id}: cell version ${run.cellId}@${run.cellVersion} is missing`);
  // A deleted drill keeps its runs gradeable and replayable.
  const drill = run.drillId ? await findDrill(run.drillId, { includeDeleted: true }) : null;
  const assignment = run.assignmentId ? await findAssignment(run.assignmentId) : null;
  return {
    context: { document: version.document, seed: run.seed, faults: drill?.faults ?? [] },
    drill,
    assignment,
    timeLimitMs: drill ? drill.timeLimitMs : null,
  };
}

function logOf(batches: readonly StoredBatch[]): { events: LoggedEvent[]; untilMs: number; lastSeq: number } {
  const events: LoggedEvent[] = [];
  for (const b of batches) for (const e of b.events) events.push(e);
  const last = batches[batches.length - 1];
  return { events, untilMs: last?.untilMs ?? 0, lastSeq: last?.seq ?? 0 };
}

/** Every stored event of a run, in order, and the cell time the last batch reached. */
export async function storedLog(runId: string): Promise<{ events: LoggedEvent[]; untilMs: number; lastSeq: number }> {
  return logOf(await listBatches(runId));
}

/**
 * What the app process keeps of a run in progress (live-runs.ts): the run row as read, its
 * setup without the cell document (the engine thread holds the cell), and the stored end.
 */
type LiveSetup = Omit<RunSetup, 'context'> & { run: Run };

async function liveMeta(run: Run): Promise<LiveMeta<LiveSetup>> {
  const hit = getLiveMeta(run.id) as LiveMeta<LiveSetup> | undefined;
  if (hit) return hit;
  const { context: _c, ...setup } = await runSetup(run);
  const meta: LiveMeta<LiveSetup> = { lastSeq: run.lastSeq, untilMs: run.untilMs, setup: { ...setup, run } };
  putLiveMeta(run.id, meta);
  return meta;
}

/** Another process stored batches this process has not seen: start over from the database. */
class StaleRun extends Error {}

/** The stored log the engine thread rebuilds a run's cell from; a log that moved past `meta` is a StaleRun. */
function loader(run: Run, meta: LiveMeta<LiveSetup>, mustMatch: boolean): () => Promise<LoadPayload> {
  return async () => {
    const setup = await runSetup(run);
    const log = await storedLog(run.id);
    if (mustMatch && log.lastSeq !== meta.lastSeq) throw new StaleRun();
    meta.lastSeq = Math.max(meta.lastSeq, log.lastSeq);
    meta.untilMs = Math.max(meta.untilMs, log.untilMs);
    return { context: setup.context, events: log.events, untilMs: log.untilMs, lastSeq: log.lastSeq, downloads: countDownloads(log.events) };
  };
}

function rejected(problems: Problem[], message: string): ApiError {
  const out: Record<string, string[]> = {};
  for (const p of problems) (out[p.path.join('.') || '_'] ??= []).push(p.message);
  return new ApiError(422, message, out);
}

/**
 * Builds an active run's live cell when the run starts or resumes, so its first batch does not
 * pay for building the cell (and replaying the log): a class starting a drill together would
 * otherwise send a burst of first batches that each build one. Only a cache: when building
 * fails here, the first batch rebuilds it and reports the error to the client.
 */
export async function prepareLiveRun(run: Run): Promise<void> {
  if (run.status !== 'active') return;
  try {
    await withRunLock(run.id, async () => {
      const meta = await liveMeta(run);
      await liveTask(run.userId, { op: 'prepare', runId: run.id }, loader(run, meta, false));
    });
  } catch {
    // Left to the batch path (see above).
  }
}

/**
 * The run a batch is for, if the user owns it (anybody else gets 404). A run this process
 * remembers comes from memory: who owns it and what it runs never change, so the batch path
 * reads the database only for the session and the insert. Its changing fields (status,
 * lastSeq, untilMs) may be stale; appendBatch's insert checks them against the database.
 */
export async function runForBatch(user: User, id: string): Promise<Run> {
  const hit = getLiveMeta(id) as LiveMeta<LiveSetup> | undefined;
  if (!hit) return runForOwner(user, id);
  if (hit.setup.run.userId !== user.id) throw new ApiError(404, 'No such run.');
  return hit.setup.run;
}

/** The snapshot of a run rebuilt from its stored log alone (no cache): the reference the cache must match. */
export async function uncachedSnapshot(run: Run, atMs?: number): Promise<CellSnapshot> {
  const setup = await runSetup(run);
  const log = await storedLog(run.id);
  const r = await heavyTask<Result<CellSnapshot, Problem>>('snapshotAt', { context: { ...setup.context, trace: [] }, events: log.events, untilMs: Math.max(atMs ?? 0, log.untilMs) });
  if (!r.ok) throw new Error('run does not replay');
  return r.value;
}

export type BatchAnswer = { seq: number; untilMs: number; eventCount: number; duplicate: boolean };

/**
 * Stores one batch of a run's event log, once. A repeated key answers as the first time did;
 * a gap in `seq` is a 409 naming the expected seq; events the run may not log, or that the
 * engine rejects, are a 422 and nothing is stored (the cell, half-applied, is dropped and
 * rebuilt from the log on the next request). A batch ahead of what the run's age allows is a
 * 429 with Retry-After (policy.ts, allowedUntilMs); engine work past its budget a 503.
 */
export function appendBatch(run: Run, input: BatchInput): Promise<BatchAnswer> {
  return withRunLock(run.id, async () => {
    try {
      return await appendOnce(run, input);
    } catch (err) {
      if (!(err instanceof StaleRun)) throw err;
      forgetLiveMeta(run.id);
      await evictLive(run.id);
      const fresh = await findRun(run.id);
      if (!fresh) throw new ApiError(404, 'No such run.');
      return appendOnce(fresh, input);
    }
  });
}

async function appendOnce(run: Run, input: BatchInput): Promise<BatchAnswer> {
  const duplicate = async (): Promise<BatchAnswer | null> => {
    const same = await findBatchByKey(run.id, input.key);
    return same ? { seq: same.seq, untilMs: same.untilMs, eventCount: same.events.length, duplicate: true } : null;
  };
  const refuseSubmitted = async (): Promise<BatchAnswer> => {
    const again = await duplicate();
    if (again) return again;
    throw new ApiError(409, 'This run has been submitted; it takes no more events.');
  };
  if (run.status !== 'active') return refuseSubmitted();
  let meta = await liveMeta(run);
  if (meta.setup.run.status !== 'active') return refuseSubmitted();
  if (input.seq !== meta.lastSeq + 1) {
    // A retry of a stored batch, or a client that lost track; another process may also have
    // stored batches this process has not seen, so check against the database before refusing.
    const again = await duplicate();
    if (again) return again;
    forgetLiveMeta(run.id);
    const fresh = (await findRun(run.id)) ?? run;
    meta = await liveMeta(fresh);
    if (fresh.status !== 'active') return refuseSubmitted();
    if (input.seq !== meta.lastSeq + 1) throw new ApiError(409, `Expected batch ${meta.lastSeq + 1}.`, { seq: [`expected ${meta.lastSeq + 1}`] });
  }
  const setup = meta.setup;
  const fields = {
    ...timeProblems(input.events, input.untilMs, meta.untilMs, setup.timeLimitMs),
    ...eventProblems(run.mode, setup.drill?.permissions ?? null, input.events),
  };
  if (Object.keys(fields).length > 0) throw new ApiError(422, 'Some events cannot be logged.', fields);
  if (run.mode === 'drill' && setup.assignment && assignmentClosed(setup.assignment)) {
    throw new ApiError(403, 'This drill has closed.');
  }
  const allowed = allowedUntilMs(run, Date.now());
  if (input.untilMs > allowed.untilMs) {
    const waitS = Math.ceil((input.untilMs - allowed.untilMs) / allowed.rate / 1000);
    throw new ApiError(429, `This run may be at most ${allowed.untilMs} ms ahead for now (its age × ${allowed.rate}, plus slack); send this batch again later.`, { untilMs: [`at most ${allowed.untilMs} for now`] }, { headers: { 'retry-after': String(Math.max(1, waitS)) } });
  }
  const out = await liveTask(
    run.userId,
    { op: 'append', runId: run.id, afterSeq: meta.lastSeq, seq: input.seq, events: input.events, untilMs: input.untilMs, downloads: countDownloads(input.events), maxDownloads: LIMITS.downloadsPerRun },
    loader(run, meta, true),
  );
  if (out.kind === 'budget') throw busy('The server could not simulate this batch within its budget; it will be retried.', 1);
  if (out.kind === 'rejected') throw rejected(out.problems, 'The cell rejected an event.');
  const stored = await insertBatch(run.id, { seq: input.seq, key: input.key, untilMs: input.untilMs, events: input.events });
  if (!stored.ok) {
    await evictLive(run.id);
    forgetLiveMeta(run.id);
    const again = await duplicate();
    if (again) return again;
    if (stored.reason === 'submitted') throw new ApiError(409, 'This run has been submitted; it takes no more events.');
    if (stored.reason === 'missing') throw new ApiError(404, 'No such run.');
    if (stored.reason === 'gap') throw new ApiError(409, `Expected batch ${stored.expectedSeq}.`, { seq: [`expected ${stored.expectedSeq}`] });
    throw new ApiError(409, 'Another batch took this sequence number; fetch the run and continue from its last batch.');
  }
  meta.lastSeq = input.seq;
  meta.untilMs = input.untilMs;
  meta.setup.run.lastSeq = input.seq;
  meta.setup.run.untilMs = input.untilMs;
  return { seq: input.seq, untilMs: input.untilMs, eventCount: input.events.length, duplicate: false };
}

/**
 * The run's cell at `t` (never before its stored end, never past the drill's time limit) as
 * the student may see it: a drill run's snapshot is sanitised. A `t` beyond what the run's age
 * allows is a 422; work past the engine's budget a 503 with Retry-After (the progress is kept,
 * so asking again goes on from there).
 */
export function viewRun(run: Run, t: number | undefined): Promise<{ snapshot: SanitisedSnapshot | CellSnapshot; timeLimitMs: number | null }> {
  return withRunLock(run.id, async () => {
    const meta = await liveMeta(run);
    const setup = meta.setup;
    let target = Math.max(t ?? 0, meta.untilMs);
    if (setup.timeLimitMs !== null) target = Math.min(target, setup.timeLimitMs);
    const allowed = allowedUntilMs(run, Date.now());
    if (target > Math.max(allowed.untilMs, meta.untilMs)) {
      throw new ApiError(422, `This run can be viewed up to ${allowed.untilMs} ms of cell time for now (its age × ${allowed.rate}, plus slack).`, { t: [`at most ${allowed.untilMs} for now`] });
    }
    const out = await liveTask(run.userId, { op: 'view', runId: run.id, atLeastSeq: meta.lastSeq, targetMs: target }, loader(run, meta, false));
    if (out.kind === 'budget') throw busy(`The server reached ${out.timeMs} ms of cell time within this request's budget; ask again to go on.`, 1);
    if (out.kind === 'rejected') throw rejected(out.problems, 'The cell cannot run to that time.');
    const snap = out.snapshot!;
    return { snapshot: run.mode === 'drill' ? sanitiseSnapshot(snap) : snap, timeLimitMs: setup.timeLimitMs };
  });
}

function gradeTask(setup: RunSetup, events: LoggedEvent[], diagnosis: Diagnosis | null, endedMs: number): GradeTask {
  if (setup.drill) {
    return {
      kind: 'drill',
      input: { context: setup.context, events, endedMs, rules: setup.drill.rules, answer: setup.drill.answer, diagnosisWeight: setup.drill.diagnosisWeight, diagnosis },
    };
  }
  return { kind: 'practice', context: setup.context, events, endedMs };
}

async function gradeOn(run: Run, setup: RunSetup, events: LoggedEvent[], diagnosis: Diagnosis | null, endedMs: number, userId?: string): Promise<GradeTaskResult> {
  const r = await heavyTask<Result<GradeTaskResult, Problem>>('grade', gradeTask(setup, events, diagnosis, endedMs), userId);
  if (!r.ok) throw new Error(`run ${run.id} does not grade: ${JSON.stringify(r.errors.slice(0, 3))}`);
  return r.value;
}

/** The grade of a run from its stored log (used on submit and to check stored grades). */
export async function regrade(run: Run, diagnosis: Diagnosis | null, endedMs: number): Promise<GradeResult | { grade: null; breakdown: null; traceHash: string }> {
  const setup = await runSetup(run);
  const log = await storedLog(run.id);
  return gradeOn(run, setup, log.events, diagnosis, endedMs);
}

/**
 * Submits a run: a drill run needs a diagnosis and an open drill; the grade comes from the
 * server's own re-simulation of the log as stored under the run row's lock (db/runs.ts,
 * submitLocked), so a late batch from another process cannot slip in between. A second submit
 * (or one racing the first) is a 409 and changes nothing.
 */
export function submit(run: Run, diagnosis: Diagnosis | null): Promise<Run> {
  return withRunLock(run.id, async () => {
    const done = await submitLocked(run.id, async (fresh, batches) => {
      const setup = await runSetup(fresh);
      if (fresh.mode === 'drill') {
        if (!diagnosis) throw new ApiError(422, 'Give your diagnosis.', { diagnosis: ['Say which fault and where.'] });
        if (setup.assignment && assignmentClosed(setup.assignment)) throw new ApiError(403, 'This drill has closed; the run can no longer be submitted.');
      }
      const log = logOf(batches);
      const endedMs = setup.timeLimitMs !== null ? Math.min(log.untilMs, setup.timeLimitMs) : log.untilMs;
      const given = fresh.mode === 'drill' ? diagnosis : null;
      const result = await gradeOn(fresh, setup, log.events, given, endedMs, fresh.userId);
      return { endedMs, diagnosis: given, grade: result.grade, breakdown: result.breakdown, traceHash: result.traceHash };
    });
    if (!done.ok && done.reason === 'missing') throw new ApiError(404, 'No such run.');
    if (!done.ok) throw new ApiError(409, 'This run has already been submitted.');
    forgetLiveMeta(run.id);
    await evictLive(run.id);
    return done.run;
  });
}

/** The run's trace re-simulated from its log, over the display signals; hidden signals only when allowed. */
export async function replayTrace(run: Run, includeHidden: boolean, userId?: string): Promise<Trace> {
  const setup = await runSetup(run);
  const log = await storedLog(run.id);
  const hidden = setup.drill ? [...setup.drill.faults.map((f) => `fault.${f.id}`), ...gradeSignals(setup.drill.rules.map((w) => w.rule))] : [];
  const endMs = run.endedMs ?? log.untilMs;
  const r = await heavyTask<Result<Trace, Problem>>('displayTrace', { context: setup.context, events: log.events, untilMs: endMs, hidden, includeHidden }, userId);
  if (!r.ok) throw new Error('run does not replay');
  return r.value;
}

/** Forgets every live run and stops the engine's threads: what a server restart does (tests prove nothing is lost). */
export async function restartEngine(): Promise<void> {
  clearLiveMeta();
  await resetEngineHost();
}
