/**
 * Compact traces: for each chosen signal, a sample only when its value changes.
 * A trace is plain JSON: `signals` names, `samples` as `[timeMs, signalIndex, value]`
 * in time order, and `endMs`, the cell time the trace covers up to.
 */
import type { SignalValue } from './predicate';
import { fnv1a64 } from './hash';

/** One sample of a trace: cell time (ms), index of the signal in `signals`, its new value. */
export type TraceSample = [number, number, SignalValue];

/** A compact, change-only trace. */
export type Trace = { signals: string[]; samples: TraceSample[]; endMs: number };

/** Records samples of a fixed list of signals. */
export type TraceRecorder = {
  /** Reads every signal and records those that changed (all of them on the first call). */
  sample(timeMs: number): void;
  /** The trace so far, up to `endMs`. */
  trace(endMs: number): Trace;
  /** Samples recorded from index `from` on (copies of those only), and the index after the last. */
  since(from: number): { samples: TraceSample[]; next: number };
};

/** Creates a recorder over `names`, read through `readers` (same order). */
export function createTraceRecorder(names: string[], readers: (() => SignalValue)[]): TraceRecorder {
  const last: (SignalValue | undefined)[] = names.map(() => undefined);
  const samples: TraceSample[] = [];
  const copy = (s: TraceSample): TraceSample => [s[0], s[1], s[2]];
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
      return { signals: [...names], samples: samples.map(copy), endMs };
    },
    since(from) {
      const start = Math.max(0, Math.min(Math.trunc(from) || 0, samples.length));
      return { samples: samples.slice(start).map(copy), next: samples.length };
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
