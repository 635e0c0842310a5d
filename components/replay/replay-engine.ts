/**
 * Plays a stored run back in the browser: a local Cell built from the run's cell version (and,
 * where the reader may see them, the drill's fault cards and the run's seed) with the logged
 * events applied at their times. Forward moves advance the same cell; a move back rebuilds it
 * from time 0 (a cell's clock only runs forward), which the deterministic engine makes exact.
 */
import { applyLog, createCell, signalNamesOf, type Cell, type CellSnapshot, type FaultCard, type LoggedEvent, type Problem } from '@/simulator';
import { scopeName, scopeSignals, type TraceChunk } from '@/components/workspace/engine-protocol';

export type ReplaySource = {
  document: unknown;
  events: readonly LoggedEvent[];
  /** Cell time the run reached. */
  endMs: number;
  seed?: number;
  faults?: readonly FaultCard[];
};

export type Replay = {
  readonly timeMs: number;
  readonly endMs: number;
  /** Moves to cell time `t` (clamped to 0..endMs); returns the snapshot there and the scope samples since the last call. */
  seek(t: number): { snapshot: CellSnapshot; trace: TraceChunk };
  /** Cell time of the next logged event after `t`, or null. */
  nextEventAfter(t: number): number | null;
  /** Cell time of the last logged event before `t`, or null. */
  previousEventBefore(t: number): number | null;
  dispose(): void;
};

/**
 * Creates a replay of a run. Returns the problems when the run's cell does not build (a cell
 * version that no longer validates, say).
 */
export function createReplay(src: ReplaySource): { ok: true; value: Replay } | { ok: false; errors: Problem[] } {
  const options = (trace: string[]) => ({ trace, seed: src.seed, faults: src.faults ? [...src.faults] : [] });
  const names = signalNamesOf(src.document);
  if (!names.ok) return names;
  const signals = scopeSignals(names.value);
  const events = [...src.events].sort((a, b) => a.t - b.t);

  let cell: Cell;
  let next = 0;
  let traceSent = 0;
  let reset = true;
  const build = (): Problem[] | null => {
    const made = createCell(src.document, options(signals));
    if (!made.ok) return made.errors;
    cell = made.value;
    next = 0;
    traceSent = 0;
    reset = true;
    return null;
  };
  // The options (seed, fault cards) are checked here, once: a later rebuild makes the same cell.
  const built = build();
  if (built) return { ok: false, errors: built };

  const runTo = (t: number) => {
    let end = next;
    while (end < events.length && events[end].t <= t) end++;
    // The engine's replay loop, as the server's: events at their times, then on to t. A stored
    // event the cell refused live was never stored; one refused here (a log that no longer fits
    // its cell) is skipped and the rest applied, as it changed nothing.
    while (next < end) {
      const r = applyLog(cell, events.slice(next, end), t);
      if (r.ok) {
        next = end;
        break;
      }
      const at = r.errors[0]?.path[1];
      next += (typeof at === 'number' ? at : end - next - 1) + 1;
    }
    if (t > cell.timeMs) cell.advance(t - cell.timeMs);
  };

  const replay: Replay = {
    get timeMs() {
      return cell.timeMs;
    },
    endMs: src.endMs,
    seek(target) {
      const t = Math.max(0, Math.min(Math.floor(target), src.endMs));
      if (t < cell.timeMs) {
        cell.dispose();
        build();
      }
      runTo(t);
      const tr = cell.traceSince(traceSent);
      const fresh = tr.samples.map(([s, i, v]) => [s, i, typeof v === 'number' ? v : Number(v) || 0] as [number, number, number]);
      traceSent = tr.next;
      const chunk: TraceChunk = { reset, signals: reset ? signals.map(scopeName) : [], samples: fresh };
      reset = false;
      return { snapshot: cell.snapshot(), trace: chunk };
    },
    nextEventAfter(t) {
      return events.find((e) => e.t > t)?.t ?? null;
    },
    previousEventBefore(t) {
      for (let i = events.length - 1; i >= 0; i--) if (events[i].t < t) return events[i].t;
      return null;
    },
    dispose() {
      cell.dispose();
    },
  };
  return { ok: true, value: replay };
}
