/**
 * Keeps the recent history of every PLC address and controller point for the scope, from the
 * engine's trace: each change with its exact cell time (every instant, every scan), so edge
 * times do not depend on how often the screen is drawn or on the run speed.
 */
import type { TraceChunk } from '@/components/workspace/engine-protocol';

/** Changes of one signal, oldest first: the value holds from `t` until the next change. */
export type SignalHistory = { t: number; v: number }[];

/** Cell time kept behind the newest instant (ms); older changes fall off, keeping the value in force. */
export const SCOPE_HISTORY_MS = 120_000;

/** What the scope draws: the histories by signal key (`%IX0.0`, `DI1`) and the time they run up to. */
export type ScopeData = { signals: string[]; histories: Map<string, SignalHistory>; endMs: number };

/** Applies a trace chunk to scope data (returns new data; the old value is left as it was). */
export function applyTraceChunk(data: ScopeData, chunk: TraceChunk): ScopeData {
  const signals = chunk.reset ? chunk.signals : data.signals;
  const histories = chunk.reset ? new Map<string, SignalHistory>() : new Map(data.histories);
  let endMs = chunk.reset ? 0 : data.endMs;
  const touched = new Set<string>();
  for (const [t, i, v] of chunk.samples) {
    const key = signals[i];
    if (key === undefined) continue;
    if (!touched.has(key)) {
      histories.set(key, [...(histories.get(key) ?? [])]);
      touched.add(key);
    }
    histories.get(key)!.push({ t, v });
    endMs = Math.max(endMs, t);
  }
  for (const key of touched) histories.set(key, trimHistory(histories.get(key)!, endMs - SCOPE_HISTORY_MS));
  return { signals, histories, endMs };
}

/** Drops changes before `from`, keeping the last one before it (the value in force at `from`). */
export function trimHistory(h: SignalHistory, from: number): SignalHistory {
  let first = 0;
  while (first + 1 < h.length && h[first + 1].t <= from) first++;
  return first === 0 ? h : h.slice(first);
}

export type ScopeRecorder = ReturnType<typeof createScopeRecorder>;

/** What the recorder listens to (the workspace store, through use-scope.ts): exact signal changes, and the time of each drawn snapshot. */
export type ScopeSource = {
  subscribeTrace(listener: (chunk: TraceChunk) => void): () => void;
  subscribeSnapshotTime(listener: (timeMs: number) => void): () => void;
};

/** Records from a scope source between `start()` and the function it returns. */
export function createScopeRecorder(source: ScopeSource) {
  let data: ScopeData = { signals: [], histories: new Map(), endMs: 0 };
  let version = 0;
  const listeners = new Set<() => void>();
  const notify = () => {
    version++;
    listeners.forEach((l) => l());
  };

  return {
    subscribe(listener: () => void) {
      listeners.add(listener);
      return () => void listeners.delete(listener);
    },
    getVersion: () => version,
    getData: () => data,
    /** Starts recording; returns the stop function (an effect's cleanup). */
    start: () => {
      const offTrace = source.subscribeTrace((chunk) => {
        data = applyTraceChunk(data, chunk);
      });
      // Redraw once per drawn snapshot, with the clock running up to the snapshot's time.
      const offSnap = source.subscribeSnapshotTime((timeMs) => {
        if (timeMs > data.endMs) data = { ...data, endMs: timeMs };
        notify();
      });
      return () => {
        offTrace();
        offSnap();
      };
    },
  };
}
