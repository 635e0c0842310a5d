/**
 * Replaying an event log on a document: the run is rebuilt from its inputs alone, which is
 * how the server re-grades a run instead of trusting the client.
 */
import type { Problem, Result } from '@/simulator/shared/result';
import { createCell, type CellOptions } from '@/simulator/cell/cell';
import type { CellSnapshot } from '@/simulator/cell/snapshot';
import { eventLogSchema, type LoggedEvent } from '@/simulator/cell/events';
import { zodProblems } from '@/simulator/schema/validate';
import { hashTrace, type Trace } from './trace';

/** What a replay produces. */
export type ReplayResult = { trace: Trace; hash: string; snapshot: CellSnapshot; log: LoggedEvent[] };

/**
 * Creates a cell, applies each logged event at its time, and runs on to `untilMs` (or the
 * last event's time). Events must be in time order. Any problem — document, options, a
 * malformed or rejected event — fails the replay with every problem and its path.
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
    for (let i = 0; i < events.length; i++) {
      const e = events[i];
      const a = cell.advance(e.t - cell.timeMs);
      if (!a.ok) return { ok: false, errors: a.errors.map((p) => ({ ...p, path: ['events', i, 't', ...p.path] })) };
      const r = cell.apply(e.event);
      if (!r.ok) return { ok: false, errors: r.errors.map((p) => ({ ...p, path: ['events', i, 'event', ...p.path] })) };
    }
    const a = cell.advance(until - cell.timeMs);
    if (!a.ok) return a;
    const trace = cell.trace();
    return { ok: true, value: { trace, hash: hashTrace(trace), snapshot: cell.snapshot(), log: cell.eventLog() } };
  } finally {
    cell.dispose();
  }
}
