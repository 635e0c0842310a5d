/**
 * Compact traces: for each chosen signal, a sample only when its value changes.
 * A trace is plain JSON: `signals` names, `samples` as `[timeMs, signalIndex, value]`
 * in time order, and `endMs`, the cell time the trace covers up to.
 */
import type { SignalValue } from './predicate';
import { fnv1a64 } from './hash';

/** A compact, change-only trace. */
export type Trace = { signals: string[]; samples: [number, number, SignalValue][]; endMs: number };

/** Records samples of a fixed list of signals. */
export type TraceRecorder = {
  /** Reads every signal and records those that changed (all of them on the first call). */
  sample(timeMs: number): void;
  /** The trace so far, up to `endMs`. */
  trace(endMs: number): Trace;
};

/** Creates a recorder over `names`, read through `readers` (same order). */
export function createTraceRecorder(names: string[], readers: (() => SignalValue)[]): TraceRecorder {
  const last: (SignalValue | undefined)[] = names.map(() => undefined);
  const samples: [number, number, SignalValue][] = [];
  return {
    sample(t) {
      for (let i = 0; i < readers.length; i++) {
        const v = readers[i]();
        if (v !== last[i]) {
          last[i] = v;
          samples.push([t, i, v]);
        }
      }
    },
    trace(endMs) {
      return { signals: [...names], samples: samples.map((s) => [s[0], s[1], s[2]] as [number, number, SignalValue]), endMs };
    },
  };
}

/**
 * Stable hash of a trace (FNV-1a 64 of its canonical JSON). Two runs with the same document,
 * event log and seed give the same hash.
 */
export function hashTrace(trace: Trace): string {
  return fnv1a64(JSON.stringify({ signals: trace.signals, samples: trace.samples, endMs: trace.endMs }));
}

/** The value of every signal at time `t` (after all samples at `t`), from a trace. */
export function valuesAt(trace: Trace, t: number): Record<string, SignalValue | null> {
  const out: Record<string, SignalValue | null> = {};
  for (const s of trace.signals) out[s] = null;
  for (const [ts, i, v] of trace.samples) {
    if (ts > t) break;
    out[trace.signals[i]] = v;
  }
  return out;
}
