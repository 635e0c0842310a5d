/**
 * A counterexample as the engine's own event log, so the app can open it in the workspace
 * and play it on the scope: the %IX points are forced to each scan's inputs.
 *
 * Timing (docs/engine.md, "Clock"): the PLC scans at every multiple of its period from
 * one period on, and an event applies between instants. So scan k runs at (k + 1) · P,
 * and a force logged at k · P — after the scan at that instant — is what scan k reads.
 * Scan 0's inputs are all forced at 0 ms (off ones too, so the wiring cannot interfere);
 * later scans force only the points that change. The forces stay on at the end, so the
 * workspace shows the broken state; the rule is broken after the scan at
 * (failsAtScan + 1) · P. On the scope an input changes between scans, as on a real PLC,
 * and the outputs answer at the next scan: the proof pairs each scan's outputs with the
 * inputs that scan read, so a trace rule over the same signals may see an input's half of
 * the break up to one period before that scan.
 */
import type { LoggedEvent } from '@/simulator/cell/events';
import type { Counterexample } from './prove';

/** The cell time (ms) of the scan after which the rule is broken. */
export function counterexampleFailsAtMs(cex: Counterexample, document?: { plc: { sheet: { scanPeriodMs: number } } }): number {
  const period = document?.plc.sheet.scanPeriodMs ?? cex.scanPeriodMs;
  return (cex.failsAtScan + 1) * period;
}

/**
 * The logged events that replay a counterexample on a cell (forces of its %IX points at
 * the scan times). Use the cell document the proof ran on: its sheet's scan period sets
 * the times.
 */
export function counterexampleEvents(cex: Counterexample, document?: { plc: { sheet: { scanPeriodMs: number } } }): LoggedEvent[] {
  const period = document?.plc.sheet.scanPeriodMs ?? cex.scanPeriodMs;
  const events: LoggedEvent[] = [];
  let last: Record<string, boolean> = {};
  cex.scans.forEach((scan, k) => {
    for (const target of cex.inputs) {
      const on = scan.inputs[target] ?? false;
      if (k > 0 && last[target] === on) continue;
      events.push({ t: k * period, event: { type: 'force', target, value: on ? 1 : 0 } });
    }
    last = scan.inputs;
  });
  return events;
}
