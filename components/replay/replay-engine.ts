/**
 * Plays a stored run back in the browser: a local Cell built from the run's cell version (and,
 * where the reader may see them, the drill's fault cards and the run's seed) with the logged
 * events applied at their times. Forward moves advance the same cell; a move back rebuilds it
 * from time 0 (a cell's clock only runs forward), which the deterministic engine makes exact.
 */
import { createCell, type Cell, type CellSnapshot, type FaultCard, type LoggedEvent, type Problem } from '@/simulator';
import type { TraceChunk } from '@/components/workspace/engine-protocol';

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

/** The scope's signals of a cell, as the worker names them (PLC addresses and controller points). */
function scopeSignals(cell: Cell): string[] {
  return cell.signalNames().filter((n) => n.startsWith('plc.%') || /^ctl\.[A-Z]{2}\d+$/.test(n));
}

/**
 * Creates a replay of a run. Returns the problems when the run's cell does not build (a cell
 * version that no longer validates, say).
 */
export function createReplay(src: ReplaySource): { ok: true; value: Replay } | { ok: false; errors: Problem[] } {
  const options = (trace: string[]) => ({ trace, seed: src.seed, faults: src.faults ? [...src.faults] : [] });
  const probe = createCell(src.document, options([]));
  if (!probe.ok) return probe;
  const signals = scopeSignals(probe.value);
  probe.value.dispose();
  const events = [...src.events].sort((a, b) => a.t - b.t);

  let cell: Cell;
  let next = 0;
  let traceSent = 0;
  let reset = true;
  const build = () => {
    const made = createCell(src.document, options(signals));
    if (!made.ok) throw new Error(made.errors.map((p) => p.message).join('; '));
    cell = made.value;
    next = 0;
    traceSent = 0;
    reset = true;
  };
  build();

  const runTo = (t: number) => {
    while (next < events.length && events[next].t <= t) {
      const e = events[next++];
      if (e.t > cell.timeMs) cell.advance(e.t - cell.timeMs);
      // A stored event the cell refused live was never stored; one refused here changes nothing either.
      cell.apply(e.event);
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
      const tr = cell.trace();
      const fresh = tr.samples.slice(traceSent).map(([s, i, v]) => [s, i, typeof v === 'number' ? v : Number(v) || 0] as [number, number, number]);
      traceSent = tr.samples.length;
      const chunk: TraceChunk = { reset, signals: reset ? signals.map((n) => n.replace(/^(plc|ctl)\./, '')) : [], samples: fresh };
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
