import 'server-only';
import { randomInt } from 'node:crypto';
import { ApiError } from '@/lib/api/errors';
import { getVersion } from '@/db/cells';
import { findAssignment, findDrill, type Assignment, type Drill } from '@/db/drills';
import { findBatchByKey, findRun, insertBatch, listBatches, submitRun, type Run } from '@/db/runs';
import type { User } from '@/db/users';
import { runForOwner } from './access';
import { buildCell, applyLog, gradeSignals, replayRun, type RunContext } from './engine';
import { gradeRun, type GradeResult } from './grade';
import { evictLiveRun, getLiveRun, putLiveRun, withRunLock, type LiveRun } from './live-runs';
import { eventProblems, timeProblems } from './policy';
import { isHiddenSignal, sanitiseSnapshot, sanitiseTrace, type SanitisedSnapshot } from './sanitise';
import type { BatchInput, Diagnosis } from '@/lib/schemas/runs';
import { hashTrace, type CellSnapshot, type LoggedEvent, type Trace } from '@/simulator';

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

/** Every stored event of a run, in order, and the cell time the last batch reached. */
export async function storedLog(runId: string): Promise<{ events: LoggedEvent[]; untilMs: number; lastSeq: number }> {
  const batches = await listBatches(runId);
  const events: LoggedEvent[] = [];
  for (const b of batches) for (const e of b.events) events.push(e);
  const last = batches[batches.length - 1];
  return { events, untilMs: last?.untilMs ?? 0, lastSeq: last?.seq ?? 0 };
}

/**
 * A cached run's setup, plus the run row as read when its cell was built: its owner, mode, cell
 * and drill never change, so a batch of a cached run needs no read of the run (see runForBatch).
 */
type LiveSetup = RunSetup & { run: Run };

/**
 * The run's live cell: from the cache, else rebuilt from the stored log. The cache entry also
 * keeps the run's setup and stored end, so a batch needs no reads beyond the session check and
 * its insert; a cache made stale by another server process (or a status that changed since the
 * run was read) is caught by the insert's own checks.
 */
async function liveCell(run: Run): Promise<LiveRun<LiveSetup>> {
  const hit = getLiveRun(run.id) as LiveRun<LiveSetup> | undefined;
  if (hit) return hit;
  const setup = await runSetup(run);
  const log = await storedLog(run.id);
  const made = replayRun({ ...setup.context, trace: [] }, log.events, log.untilMs);
  if (!made.ok) throw new Error(`run ${run.id} does not replay: ${JSON.stringify(made.errors.slice(0, 3))}`);
  const live: LiveRun<LiveSetup> = { cell: made.value, lastSeq: log.lastSeq, untilMs: log.untilMs, setup: { ...setup, run } };
  putLiveRun(run.id, live);
  return live;
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
    await withRunLock(run.id, () => liveCell(run));
  } catch {
    // Left to the batch path (see above).
  }
}

/**
 * The run a batch is for, if the user owns it (anybody else gets 404). A run whose cell is
 * cached comes from the cache: who owns it and what it runs never change, so the batch path
 * reads the database only for the session and the insert. Its changing fields (status,
 * lastSeq, untilMs) may be stale; appendBatch's insert checks them against the database.
 */
export async function runForBatch(user: User, id: string): Promise<Run> {
  const hit = getLiveRun(id) as LiveRun<LiveSetup> | undefined;
  if (!hit) return runForOwner(user, id);
  if (hit.setup.run.userId !== user.id) throw new ApiError(404, 'No such run.');
  return hit.setup.run;
}

/** The rebuilt snapshot of a run from its stored log alone (no cache): the reference the cache must match. */
export async function uncachedSnapshot(run: Run, atMs?: number): Promise<CellSnapshot> {
  const setup = await runSetup(run);
  const log = await storedLog(run.id);
  const made = replayRun({ ...setup.context, trace: [] }, log.events, Math.max(atMs ?? 0, log.untilMs));
  if (!made.ok) throw new Error('run does not replay');
  try {
    return made.value.snapshot();
  } finally {
    made.value.dispose();
  }
}

export type BatchAnswer = { seq: number; untilMs: number; eventCount: number; duplicate: boolean };

/**
 * Stores one batch of a run's event log, once. A repeated key answers as the first time did;
 * a gap in `seq` is a 409 naming the expected seq; events the run may not log, or that the
 * engine rejects, are a 422 and nothing is stored (the cell, half-applied, is dropped from
 * the cache and rebuilt from the log on the next request).
 */
export function appendBatch(run: Run, input: BatchInput): Promise<BatchAnswer> {
  return withRunLock(run.id, async () => {
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
    let live = await liveCell(run);
    // A cell cached by a view of a submitted run knows it is submitted (that never reverts).
    if (live.setup.run.status !== 'active') return refuseSubmitted();
    if (input.seq !== live.lastSeq + 1) {
      // A retry of a stored batch, or a client that lost track; another process may also have
      // stored batches this cache has not seen, so check against the database before refusing.
      const again = await duplicate();
      if (again) return again;
      evictLiveRun(run.id);
      live = await liveCell(run);
      if (input.seq !== live.lastSeq + 1) throw new ApiError(409, `Expected batch ${live.lastSeq + 1}.`, { seq: [`expected ${live.lastSeq + 1}`] });
    }
    const setup = live.setup;
    const fields = {
      ...timeProblems(input.events, input.untilMs, live.untilMs, setup.timeLimitMs),
      ...eventProblems(run.mode, setup.drill?.permissions ?? null, input.events),
    };
    if (Object.keys(fields).length > 0) throw new ApiError(422, 'Some events cannot be logged.', fields);
    if (run.mode === 'drill' && setup.assignment && Date.now() > Date.parse(setup.assignment.closesAt)) {
      throw new ApiError(403, 'This drill has closed.');
    }
    // A view may have run the cell past the stored end; an event before that point needs the
    // cell as the log has it, so rebuild from the log (the log, not the cache, is the truth).
    const firstT = input.events[0]?.t ?? input.untilMs;
    // Under heavy churn the cache may have evicted (and disposed) this cell while we awaited.
    if (getLiveRun(run.id) !== live || live.cell.timeMs > firstT) {
      evictLiveRun(run.id);
      live = await liveCell(run);
    }
    const applied = applyLog(live.cell, input.events, input.untilMs);
    if (!applied.ok) {
      evictLiveRun(run.id);
      const out: Record<string, string[]> = {};
      for (const p of applied.errors) (out[p.path.join('.')] ??= []).push(p.message);
      throw new ApiError(422, 'The cell rejected an event.', out);
    }
    const stored = await insertBatch(run.id, { seq: input.seq, key: input.key, untilMs: input.untilMs, events: input.events });
    if (!stored.ok) {
      evictLiveRun(run.id);
      const again = await duplicate();
      if (again) return again;
      if (stored.reason === 'submitted') throw new ApiError(409, 'This run has been submitted; it takes no more events.');
      if (stored.reason === 'missing') throw new ApiError(404, 'No such run.');
      if (stored.reason === 'gap') throw new ApiError(409, `Expected batch ${stored.expectedSeq}.`, { seq: [`expected ${stored.expectedSeq}`] });
      throw new ApiError(409, 'Another batch took this sequence number; fetch the run and continue from its last batch.');
    }
    live.lastSeq = input.seq;
    live.untilMs = input.untilMs;
    live.setup.run.lastSeq = input.seq;
    live.setup.run.untilMs = input.untilMs;
    return { seq: input.seq, untilMs: input.untilMs, eventCount: input.events.length, duplicate: false };
  });
}

/**
 * The run's cell at `t` (never before its stored end, never past the drill's time limit) as
 * the student may see it: a drill run's snapshot is sanitised.
 */
export function viewRun(run: Run, t: number | undefined): Promise<{ snapshot: SanitisedSnapshot | CellSnapshot; timeLimitMs: number | null }> {
  return withRunLock(run.id, async () => {
    const live = await liveCell(run);
    const setup = live.setup;
    let target = Math.max(t ?? 0, live.untilMs);
    if (setup.timeLimitMs !== null) target = Math.min(target, setup.timeLimitMs);
    if (target > live.cell.timeMs) {
      const a = live.cell.advance(target - live.cell.timeMs);
      if (!a.ok) throw new ApiError(422, 'The cell cannot run to that time.', { t: a.errors.map((p) => p.message) });
    }
    const snap = live.cell.snapshot();
    return { snapshot: run.mode === 'drill' ? sanitiseSnapshot(snap) : snap, timeLimitMs: setup.timeLimitMs };
  });
}

/** The grade of a run from its stored log (used on submit and to check stored grades). */
export async function regrade(run: Run, diagnosis: Diagnosis | null, endedMs: number): Promise<GradeResult | { grade: null; breakdown: null; traceHash: string }> {
  const setup = await runSetup(run);
  const log = await storedLog(run.id);
  if (setup.drill) {
    const r = gradeRun({
      context: setup.context,
      events: log.events,
      endedMs,
      rules: setup.drill.rules,
      answer: setup.drill.answer,
      diagnosisWeight: setup.drill.diagnosisWeight,
      diagnosis,
    });
    if (!r.ok) throw new Error(`run ${run.id} does not grade: ${JSON.stringify(r.errors.slice(0, 3))}`);
    return r.value;
  }
  const made = replayRun({ ...setup.context, trace: gradeSignals([]) }, log.events, endedMs);
  if (!made.ok) throw new Error(`run ${run.id} does not replay`);
  try {
    return { grade: null, breakdown: null, traceHash: hashTrace(made.value.trace()) };
  } finally {
    made.value.dispose();
  }
}

/**
 * Submits a run: a drill run needs a diagnosis and an open drill; the grade comes from the
 * server's own re-simulation. A second submit (or one racing the first) is a 409 and changes nothing.
 */
export function submit(run: Run, diagnosis: Diagnosis | null): Promise<Run> {
  return withRunLock(run.id, async () => {
    const fresh = (await findRun(run.id))!;
    if (fresh.status !== 'active') throw new ApiError(409, 'This run has already been submitted.');
    const setup = await runSetup(fresh);
    if (fresh.mode === 'drill') {
      if (!diagnosis) throw new ApiError(422, 'Give your diagnosis.', { diagnosis: ['Say which fault and where.'] });
      if (setup.assignment && Date.now() > Date.parse(setup.assignment.closesAt)) throw new ApiError(403, 'This drill has closed; the run can no longer be submitted.');
    }
    const endedMs = setup.timeLimitMs !== null ? Math.min(fresh.untilMs, setup.timeLimitMs) : fresh.untilMs;
    const result = await regrade(fresh, fresh.mode === 'drill' ? diagnosis : null, endedMs);
    const done = await submitRun(fresh.id, { endedMs, diagnosis: fresh.mode === 'drill' ? diagnosis : null, grade: result.grade, breakdown: result.breakdown, traceHash: result.traceHash });
    if (!done) throw new ApiError(409, 'This run has already been submitted.');
    evictLiveRun(fresh.id);
    return (await findRun(fresh.id))!;
  });
}

/** Signals a replay shows: everything a technician could observe (not the free-running clock), plus the hidden ones when allowed. */
export function displaySignals(names: string[], hidden: string[]): string[] {
  const shown = names.filter((n) => n !== 'time' && !isHiddenSignal(n));
  for (const h of hidden) if (!shown.includes(h)) shown.push(h);
  return shown;
}

/** The run's trace re-simulated from its log, over the display signals; hidden signals only when allowed. */
export async function replayTrace(run: Run, includeHidden: boolean): Promise<Trace> {
  const setup = await runSetup(run);
  const log = await storedLog(run.id);
  const probe = buildCell({ ...setup.context, trace: [] });
  if (!probe.ok) throw new Error('run does not build');
  const names = probe.value.signalNames();
  probe.value.dispose();
  const hidden = includeHidden && setup.drill ? [...setup.drill.faults.map((f) => `fault.${f.id}`), ...gradeSignals(setup.drill.rules.map((w) => w.rule))] : [];
  const endMs = run.endedMs ?? log.untilMs;
  const made = replayRun({ ...setup.context, trace: displaySignals(names, hidden) }, log.events, endMs);
  if (!made.ok) throw new Error('run does not replay');
  try {
    const trace = made.value.trace();
    return includeHidden ? trace : sanitiseTrace(trace);
  } finally {
    made.value.dispose();
  }
}
