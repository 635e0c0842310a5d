/**
 * Two traces of one scenario (base and proposal) side by side: each signal's history in both,
 * the intervals where they differ, and the signals worth showing first. Pure, for the
 * comparison scope and its tests.
 */
import type { Trace } from '@/simulator';

export type Value = number | string;
/** Changes of one signal, oldest first: the value holds from `t` until the next change. */
export type History = { t: number; v: Value }[];

/** Every signal's history in a trace (booleans as 0/1). */
export function histories(trace: Trace | null): Map<string, History> {
  const out = new Map<string, History>();
  if (!trace) return out;
  for (const [t, i, v] of trace.samples) {
    const name = trace.signals[i];
    if (name === undefined) continue;
    const h = out.get(name) ?? [];
    // Booleans read as 0/1 (older traces may hold them as true/false).
    const value: Value = typeof v === 'boolean' ? (v ? 1 : 0) : (v as Value);
    if (h.length > 0 && h[h.length - 1].t === t) h[h.length - 1] = { t, v: value };
    else if (h.length === 0 || h[h.length - 1].v !== value) h.push({ t, v: value });
    out.set(name, h);
  }
  return out;
}

/** The value a history holds at time t (undefined before its first sample). */
export function valueAt(h: History | undefined, t: number): Value | undefined {
  if (!h) return undefined;
  let v: Value | undefined;
  for (const s of h) {
    if (s.t > t) break;
    v = s.v;
  }
  return v;
}

/** The intervals [from, to) where two histories hold different values, up to `endMs`. */
export function differences(a: History | undefined, b: History | undefined, endMs: number): [number, number][] {
  const times = [...new Set([...(a ?? []).map((s) => s.t), ...(b ?? []).map((s) => s.t)])].filter((t) => t <= endMs).sort((x, y) => x - y);
  const out: [number, number][] = [];
  let from: number | null = null;
  for (let k = 0; k < times.length; k++) {
    const t = times[k];
    const differs = valueAt(a, t) !== valueAt(b, t);
    if (differs && from === null) from = t;
    if (!differs && from !== null) {
      out.push([from, t]);
      from = null;
    }
  }
  if (from !== null) out.push([from, endMs]);
  return out;
}

/**
 * The signals to show first: those that differ (earliest first difference first), then the
 * given preferred ones (the scenario's rule signals), up to `max`.
 */
export function signalsToShow(base: Map<string, History>, proposed: Map<string, History>, endMs: number, preferred: readonly string[], max = 8): string[] {
  const names = [...new Set([...base.keys(), ...proposed.keys()])];
  const differing = names
    .map((n) => ({ n, d: differences(base.get(n), proposed.get(n), endMs) }))
    .filter((x) => x.d.length > 0)
    .sort((x, y) => x.d[0][0] - y.d[0][0] || x.n.localeCompare(y.n))
    .map((x) => x.n);
  const out: string[] = [];
  for (const n of [...differing, ...preferred.filter((p) => names.includes(p))]) {
    if (!out.includes(n)) out.push(n);
    if (out.length >= max) break;
  }
  return out;
}

/** The earliest time any of `names` differs between the two, or null. */
export function firstDifference(base: Map<string, History>, proposed: Map<string, History>, endMs: number, names?: readonly string[]): number | null {
  let first: number | null = null;
  for (const n of names ?? [...new Set([...base.keys(), ...proposed.keys()])]) {
    const d = differences(base.get(n), proposed.get(n), endMs);
    if (d.length && (first === null || d[0][0] < first)) first = d[0][0];
  }
  return first;
}
