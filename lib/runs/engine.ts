/**
 * Building a run's cell and replaying its log: pure functions over the engine (no database),
 * shared by the live-run cache, the grader and the replay routes.
 */
import { createCell, ruleSignals, type Cell, type FaultCard, type LoggedEvent, type Problem, type Result, type Rule } from '@/simulator';

/** Everything a run's simulation depends on; the same context and log always give the same trace. */
export interface RunContext {
  document: unknown;
  seed: number;
  /** Hidden fault cards of the drill (empty for practice). */
  faults: FaultCard[];
  /** Signals recorded in the trace. */
  trace: string[];
}

/** Signals the grade's trace records: a few that every run has, then each rule's signals in order. */
export function gradeSignals(rules: readonly Rule[]): string[] {
  const out = ['ctl.state', 'ctl.cycles', 'arm.moving'];
  for (const r of rules) for (const s of ruleSignals(r)) if (!out.includes(s)) out.push(s);
  return out;
}

/** Creates the run's cell at time 0. */
export function buildCell(ctx: RunContext): Result<Cell, Problem> {
  return createCell(ctx.document, { seed: ctx.seed, faults: ctx.faults, trace: ctx.trace });
}

/** Cell time advanced at most per step while a stop condition is watched (one simulated second). */
export const ADVANCE_CHUNK_MS = 1000;

/** The problem code of work stopped by the caller's `stop` check (a budget ran out). */
export const STOPPED = 'stopped';

/**
 * Advances a cell to `untilMs` in steps of at most {@link ADVANCE_CHUNK_MS}, asking `stop`
 * between steps; stopped early, it returns a `stopped` problem and the cell stays where it got.
 */
export function advanceTo(cell: Cell, untilMs: number, stop?: () => boolean): Result<true, Problem> {
  while (cell.timeMs < untilMs) {
    if (stop?.()) return { ok: false, errors: [{ path: [], code: STOPPED, message: `stopped at ${cell.timeMs} ms` }] };
    const a = cell.advance(Math.min(ADVANCE_CHUNK_MS, untilMs - cell.timeMs));
    if (!a.ok) return a;
  }
  return { ok: true, value: true };
}

/**
 * Applies logged events to a cell at their times, then advances to `untilMs`. Events must not
 * be earlier than the cell's time. Returns the first problem with the index of its event.
 * With `stop`, the work is checked between events and every simulated second: when `stop`
 * says so, a `stopped` problem comes back with `applied` = the events already applied, so the
 * caller can go on from there later.
 */
export function applyLog(cell: Cell, events: readonly LoggedEvent[], untilMs: number, stop?: () => boolean): Result<true, Problem & { applied?: number }> {
  for (let i = 0; i < events.length; i++) {
    const e = events[i];
    if (e.t < cell.timeMs) return { ok: false, errors: [{ path: ['events', i, 't'], code: 'out_of_order', message: `event at ${e.t} ms is before the cell time ${cell.timeMs} ms` }] };
    const a = advanceTo(cell, e.t, stop);
    if (!a.ok) return { ok: false, errors: a.errors.map((p) => (p.code === STOPPED ? { ...p, applied: i } : { ...p, path: ['events', i, 't', ...p.path] })) };
    const r = cell.apply(e.event);
    if (!r.ok) return { ok: false, errors: r.errors.map((p) => ({ ...p, path: ['events', i, 'event', ...p.path] })) };
  }
  const a = advanceTo(cell, untilMs, stop);
  if (!a.ok) return { ok: false, errors: a.errors.map((p) => (p.code === STOPPED ? { ...p, applied: events.length } : p)) };
  return { ok: true, value: true };
}

/** A fresh cell with the whole log applied up to `untilMs` (the caller disposes it). */
export function replayRun(ctx: RunContext, events: readonly LoggedEvent[], untilMs: number): Result<Cell, Problem> {
  const made = buildCell(ctx);
  if (!made.ok) return made;
  const applied = applyLog(made.value, events, untilMs);
  if (!applied.ok) {
    made.value.dispose();
    return applied;
  }
  return made;
}
