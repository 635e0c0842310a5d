/**
 * Replaying an event log on a cell: the one loop the browser (replays, the workspace), the
 * server (live runs, grading, views) and the headless runner all use, so a run is rebuilt
 * from its inputs alone the same way everywhere — which is how the server re-grades a run
 * instead of trusting the client.
 */
import type { Problem, Result } from '@/simulator/shared/result';
import { createCell, type Cell, type CellOptions } from '@/simulator/cell/cell';
import type { CellSnapshot } from '@/simulator/cell/snapshot';
import { eventLogSchema, type LoggedEvent } from '@/simulator/cell/events';
import { zodProblems } from '@/simulator/schema/validate';
import { hashTrace, type Trace } from './trace';

/** Cell time advanced at most between two `stop` checks (one simulated second). */
const STOP_CHECK_MS = 1000;

/** How far {@link applyLog} got: events applied, and whether `stop` ended the work early. */
export type Applied = { applied: number; stopped: boolean };

function advanceTo(cell: Cell, untilMs: number, stop: (() => boolean) | undefined): Result<boolean, Problem> {
  if (!stop) {
    if (untilMs <= cell.timeMs) return { ok: true, value: false };
    const a = cell.advance(untilMs - cell.timeMs);
    return a.ok ? { ok: true, value: false } : a;
  }
  while (cell.timeMs < untilMs) {
    if (stop()) return { ok: true, value: true };
    const a = cell.advance(Math.min(STOP_CHECK_MS, untilMs - cell.timeMs));
    if (!a.ok) return a;
  }
  return { ok: true, value: false };
}

/**
 * Applies logged events to a cell at their times, then advances it to `untilMs` (a cell
 * already past `untilMs` stays where it is). Events must be in time order and not before the
 * cell's time. The first problem — an event out of order, a rejected event — ends the work
 * with its path (`['events', i, 't']`, `['events', i, 'event', …]`); the events before it stay
 * applied.
 *
 * With `stop`, the work is checked before every simulated second it advances: when `stop`
 * says so, it ends early with `stopped: true` and `applied` = the events applied so far, so
 * the caller (a budget running out) can go on from there later with the rest of the log.
 * Where the clock stops never changes the run: how time is sliced is not part of it.
 */
export function applyLog(cell: Cell, events: readonly LoggedEvent[], untilMs: number, stop?: () => boolean): Result<Applied, Problem> {
  for (let i = 0; i < events.length; i++) {
    const e = events[i];
    if (e.t < cell.timeMs) return { ok: false, errors: [{ path: ['events', i, 't'], code: 'out_of_order', message: `event at ${e.t} ms is before the cell time ${cell.timeMs} ms` }] };
    const a = advanceTo(cell, e.t, stop);
    if (!a.ok) return { ok: false, errors: a.errors.map((p) => ({ ...p, path: ['events', i, 't', ...p.path] })) };
    if (a.value) return { ok: true, value: { applied: i, stopped: true } };
    const r = cell.apply(e.event);
    if (!r.ok) return { ok: false, errors: r.errors.map((p) => ({ ...p, path: ['events', i, 'event', ...p.path] })) };
  }
  const a = advanceTo(cell, untilMs, stop);
  if (!a.ok) return a;
  return { ok: true, value: { applied: events.length, stopped: a.value } };
}

/** What a replay produces. */
export type ReplayResult = { trace: Trace; hash: string; snapshot: CellSnapshot; log: LoggedEvent[] };

/**
 * Creates a cell, applies each logged event at its time ({@link applyLog}), and runs on to
 * `untilMs` (or the last event's time). Events must be in time order. Any problem — document,
 * options, a malformed or rejected event — fails the replay with every problem and its path.
 */
export function replay(document: unknown, log: unknown, options: CellOptions & { untilMs?: number } = {}): Result<ReplayResult, Problem> {
  const parsed = eventLogSchema.safeParse(log);
  if (!parsed.success) return { ok: false, errors: zodProblems(parsed.error.issues, ['events']) };
  const events = parsed.data;
  const problems: Problem[] = [];
  events.forEach((e, i) => {
    if (i > 0 && e.t < events[i - 1].t) problems.push({ path: ['events', i, 't'], code: 'out_of_order', message: `event at ${e.t} ms comes after one at ${events[i - 1].t} ms` });
  });
  const until = options.untilMs ?? (events.length > 0 ? events[events.length - 1].t : 0);
  if (!Number.isInteger(until) || until < 0) problems.push({ path: ['untilMs'], code: 'negative_time', message: 'the run length must be a non-negative whole number of ms' });
  if (events.length > 0 && events[events.length - 1].t > until) problems.push({ path: ['untilMs'], code: 'too_short', message: `events run to ${events[events.length - 1].t} ms, past the end at ${until} ms` });
  if (problems.length > 0) return { ok: false, errors: problems };
  const made = createCell(document, options);
  if (!made.ok) return made;
  const cell = made.value;
  try {
    const applied = applyLog(cell, events, until);
    if (!applied.ok) return applied;
    const trace = cell.trace();
    return { ok: true, value: { trace, hash: hashTrace(trace), snapshot: cell.snapshot(), log: cell.eventLog() } };
  } finally {
    cell.dispose();
  }
}
