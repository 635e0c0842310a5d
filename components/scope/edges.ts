import type { SignalHistory } from './scope-recorder';

/** Times at which a signal changes value (its first recorded value is not an edge). */
export function edgeTimes(history: SignalHistory): number[] {
  const out: number[] = [];
  for (let i = 1; i < history.length; i++) if (history[i].v !== history[i - 1].v) out.push(history[i].t);
  return out;
}

/** The edge of any of `histories` nearest to `t` within `tolerance` ms, or `t` itself when none is that close. */
export function snapToEdge(histories: SignalHistory[], t: number, tolerance: number): number {
  let best = t;
  let bestDist = tolerance;
  for (const h of histories) {
    for (const e of edgeTimes(h)) {
      const d = Math.abs(e - t);
      if (d <= bestDist) {
        best = e;
        bestDist = d;
      }
    }
  }
  return best;
}
