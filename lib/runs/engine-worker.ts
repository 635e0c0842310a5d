/**
 * The engine's worker thread: every server-side simulation runs here, never on a request's
 * event loop (lib/runs/engine-host.ts owns the threads and sends the tasks). Bundled on its
 * own by scripts/build-engine-worker.ts, so it imports only the engine and pure run helpers:
 * no database, no `server-only`, no Next.js.
 *
 * Two kinds of task:
 * - `live`: the live cells of runs in progress, cached in this thread (one thread owns a
 *   run: the host picks the thread from the run id). Only a cache: the host loads a missing
 *   or stale run from its stored log. Bounded by an estimate of memory, not by count.
 * - `grade`, `displayTrace`, `snapshotAt`: stateless replays of a whole log (on the heavy pool).
 *
 * Work is timed with this thread's clock against the budget the host sends: a live task
 * that runs out stops between simulated seconds and keeps what it did (the next request
 * goes on from there), so a far-ahead view or a long replay is spread over several requests
 * instead of holding the thread.
 */
import { setPriority } from 'node:os';
import type { CellSnapshot, LoggedEvent, Problem, Result, Trace } from '@/simulator';
import { applyLog, hashTrace, signalNamesOf, type Cell } from '@/simulator';
import { buildCell, gradeSignals, replayRun, type RunContext } from './engine';
import { gradeRun, type GradeInput, type GradeResult } from './grade';
import { displaySignals, sanitiseTrace } from './sanitise';

/** What the host sends to (re)build a run's live cell: its setup and its stored log. */
export interface LoadPayload {
  context: Omit<RunContext, 'trace'>;
  events: LoggedEvent[];
  /** Cell time the last stored batch reached. */
  untilMs: number;
  lastSeq: number;
  /** Download events already in the stored log. */
  downloads: number;
}

interface Common {
  runId: string;
  /** Wall-clock budget of this task in this thread, ms. */
  budgetMs: number;
  /** Memory this thread's live cells may take, bytes (estimated, see entryBytes). */
  cacheBytes: number;
  /** Set when the host sends the run's stored log: the thread rebuilds the cell from it. */
  load?: LoadPayload;
}

export type LiveTask =
  | (Common & { op: 'prepare' })
  | (Common & { op: 'append'; afterSeq: number; seq: number; events: LoggedEvent[]; untilMs: number; downloads: number; maxDownloads: number })
  | (Common & { op: 'view'; atLeastSeq: number; targetMs: number })
  | { op: 'evict'; runIds: string[] }
  /** The cached cell as it stands (tests and diagnostics): no load, no advance. */
  | { op: 'peek'; runId: string };

export type LiveOutcome =
  /** The thread has no current cell for the run: send the stored log. */
  | { kind: 'miss' }
  | { kind: 'ok'; timeMs: number; snapshot?: CellSnapshot; lastSeq?: number }
  | { kind: 'rejected'; problems: Problem[] }
  /** The budget ran out; what was done is kept. */
  | { kind: 'budget'; timeMs: number };

/** Every reply: the outcome, how long the thread worked, and runs it dropped to stay in its memory bound. */
export type LiveReply = LiveOutcome & { busyMs: number; evicted: string[] };

interface Entry {
  cell: Cell;
  lastSeq: number;
  downloads: number;
  bytes: number;
  /** A stored log still being replayed (a load that ran out of budget). */
  pending: { events: LoggedEvent[]; next: number; untilMs: number } | null;
}

const cache = new Map<string, Entry>();
let usedBytes = 0;
let evicted: string[] = [];

/**
 * Rough memory of a live cell: the compiled sheet, wiring tables and process image grow with
 * the document, the cell's own event log with the events. A fixed floor covers the engine's
 * per-cell structures. An estimate by design (a thread cannot measure one object's heap).
 */
export function entryBytes(documentChars: number, events: number): number {
  return 256 * 1024 + documentChars * 8 + events * 200;
}

function drop(runId: string, report: boolean): void {
  const e = cache.get(runId);
  if (!e) return;
  cache.delete(runId);
  usedBytes -= e.bytes;
  e.cell.dispose();
  if (report) evicted.push(runId);
}

function touch(runId: string, e: Entry): void {
  cache.delete(runId);
  cache.set(runId, e);
}

/** Drops least recently used cells (never `keep`) until the thread is inside its memory bound. */
function fit(limit: number, keep: string): void {
  for (const [id] of cache) {
    if (usedBytes <= limit) break;
    if (id !== keep) drop(id, true);
  }
}

function load(runId: string, p: LoadPayload, cacheBytes: number): Result<Entry, Problem> {
  drop(runId, false);
  const made = buildCell({ ...p.context, trace: [] });
  if (!made.ok) return made;
  const bytes = entryBytes(JSON.stringify(p.context.document).length, p.events.length);
  const entry: Entry = { cell: made.value, lastSeq: p.lastSeq, downloads: p.downloads, bytes, pending: { events: p.events, next: 0, untilMs: p.untilMs } };
  cache.set(runId, entry);
  usedBytes += bytes;
  fit(cacheBytes, runId);
  return { ok: true, value: entry };
}

/** Goes on replaying a stored log that an earlier task left unfinished; false when the budget ran out first. */
function catchUp(runId: string, e: Entry, stop: () => boolean): Result<boolean, Problem> {
  if (!e.pending) return { ok: true, value: true };
  const { events, next, untilMs } = e.pending;
  const r = applyLog(e.cell, events.slice(next), untilMs, stop);
  if (!r.ok) {
    // A stored log that no longer replays is a server fault; drop the cell so nothing half-built is used.
    drop(runId, false);
    return { ok: false, errors: r.errors };
  }
  if (r.value.stopped) {
    e.pending = { events, next: next + r.value.applied, untilMs };
    return { ok: true, value: false };
  }
  e.pending = null;
  return { ok: true, value: true };
}

function runLive(task: LiveTask, stop: () => boolean): LiveOutcome {
  if (task.op === 'evict') {
    for (const id of task.runIds) drop(id, false);
    return { kind: 'ok', timeMs: 0 };
  }
  if (task.op === 'peek') {
    const hit = cache.get(task.runId);
    return hit && !hit.pending ? { kind: 'ok', timeMs: hit.cell.timeMs, snapshot: hit.cell.snapshot(), lastSeq: hit.lastSeq } : { kind: 'miss' };
  }
  let e = cache.get(task.runId);
  if (task.load) {
    const made = load(task.runId, task.load, task.cacheBytes);
    if (!made.ok) return { kind: 'rejected', problems: made.errors };
    e = made.value;
  }
  if (!e) return { kind: 'miss' };
  touch(task.runId, e);
  const caught = catchUp(task.runId, e, stop);
  if (!caught.ok) return { kind: 'rejected', problems: caught.errors };
  if (!caught.value) return { kind: 'budget', timeMs: e.cell.timeMs };

  if (task.op === 'prepare') return { kind: 'ok', timeMs: e.cell.timeMs };

  if (task.op === 'view') {
    if (e.lastSeq < task.atLeastSeq) return { kind: 'miss' };
    const a = applyLog(e.cell, [], task.targetMs, stop);
    if (!a.ok) return { kind: 'rejected', problems: a.errors };
    if (a.value.stopped) return { kind: 'budget', timeMs: e.cell.timeMs };
    return { kind: 'ok', timeMs: e.cell.timeMs, snapshot: e.cell.snapshot() };
  }

  // append: the cell must be exactly at the stored log's end (or before the first new event).
  const firstT = task.events[0]?.t ?? task.untilMs;
  if (e.lastSeq !== task.afterSeq || e.cell.timeMs > firstT) return { kind: 'miss' };
  if (e.downloads + task.downloads > task.maxDownloads) {
    return { kind: 'rejected', problems: [{ path: ['events'], code: 'too_many_downloads', message: `A run may hold at most ${task.maxDownloads} downloads; it has ${e.downloads}.` }] };
  }
  const applied = applyLog(e.cell, task.events, task.untilMs, stop);
  if (!applied.ok || applied.value.stopped) {
    // Half-applied: the cell no longer matches any stored log.
    drop(task.runId, false);
    return applied.ok ? { kind: 'budget', timeMs: 0 } : { kind: 'rejected', problems: applied.errors };
  }
  e.lastSeq = task.seq;
  e.downloads += task.downloads;
  const grown = entryBytes(0, task.events.length);
  e.bytes += grown;
  usedBytes += grown;
  fit(task.cacheBytes, task.runId);
  return { kind: 'ok', timeMs: e.cell.timeMs };
}

let niced = false;

/**
 * Lowers this thread's scheduling priority once (Linux: setpriority on the calling thread, which
 * Node's os.setPriority(0, …) is), so on a busy machine the app's request loop (health checks,
 * sign-ins, pages) is scheduled before the simulation threads. Where it is not allowed, nothing
 * changes: budgets still bound the work.
 */
function yieldToRequests(): void {
  if (niced) return;
  niced = true;
  try {
    setPriority(0, 10);
  } catch {
    // Not permitted here: keep the default priority.
  }
}

/** Piscina task: one operation on a live run. */
export function live(task: LiveTask): LiveReply {
  yieldToRequests();
  const started = performance.now();
  const budget = 'budgetMs' in task ? task.budgetMs : Infinity;
  const stop = () => performance.now() - started > budget;
  const outcome = runLive(task, stop);
  const reply: LiveReply = { ...outcome, busyMs: performance.now() - started, evicted };
  evicted = [];
  return reply;
}

/** A grade to compute: a drill run's from its rules and diagnosis, a practice run's trace hash only. */
export type GradeTask =
  | { kind: 'drill'; input: GradeInput }
  | { kind: 'practice'; context: Omit<RunContext, 'trace'>; events: LoggedEvent[]; endedMs: number };

export type GradeTaskResult = GradeResult | { grade: null; breakdown: null; traceHash: string };

/** Piscina task: a run's grade (or a practice run's trace hash) from its whole log (lib/runs/grade.ts). */
export function grade(task: GradeTask): Result<GradeTaskResult, Problem> {
  yieldToRequests();
  if (task.kind === 'drill') return gradeRun(task.input);
  const made = replayRun({ ...task.context, trace: gradeSignals([]) }, task.events, task.endedMs);
  if (!made.ok) return made;
  try {
    return { ok: true, value: { grade: null, breakdown: null, traceHash: hashTrace(made.value.trace()) } };
  } finally {
    made.value.dispose();
  }
}

/**
 * Piscina task: the trace a replay shows, re-simulated from the whole log over every signal a
 * technician could observe, plus `hidden` ones (fault cards, rule signals) when allowed;
 * sanitised when not.
 */
export function displayTrace(input: { context: Omit<RunContext, 'trace'>; events: LoggedEvent[]; untilMs: number; hidden: string[]; includeHidden: boolean }): Result<Trace, Problem> {
  yieldToRequests();
  const names = signalNamesOf(input.context.document);
  if (!names.ok) return names;
  const made = replayRun({ ...input.context, trace: displaySignals(names.value, input.includeHidden ? input.hidden : []) }, input.events, input.untilMs);
  if (!made.ok) return made;
  try {
    const t = made.value.trace();
    return { ok: true, value: input.includeHidden ? t : sanitiseTrace(t) };
  } finally {
    made.value.dispose();
  }
}

/** Piscina task: the snapshot after replaying a whole log to `untilMs` (no cache involved). */
export function snapshotAt(input: { context: RunContext; events: LoggedEvent[]; untilMs: number }): Result<CellSnapshot, Problem> {
  yieldToRequests();
  const made = replayRun(input.context, input.events, input.untilMs);
  if (!made.ok) return made;
  try {
    return { ok: true, value: made.value.snapshot() };
  } finally {
    made.value.dispose();
  }
}
