/**
 * A counterexample, turned into logged events, replays on a whole cell (createCell) and
 * shows the violation in the cell's own trace at the scan the prover named — checked with
 * the engine's trace rules, which share no code with the prover.
 */
import { describe, expect, it } from 'vitest';
import { createCell } from '@/simulator/cell/cell';
import { checkRules } from '@/simulator/trace/rules';
import { replay } from '@/simulator/trace/replay';
import { counterexampleEvents, counterexampleFailsAtMs } from './counterexample-events';
import { proveRules, type Counterexample } from './prove';
import { cellWithSheet, estopWiredNo, guardBypassedByLatch } from './test-cells';

function counterexample(document: unknown, rule: unknown): Counterexample {
  const r = proveRules(document, [rule]);
  if (!r.ok || r.value[0].status !== 'violated') throw new Error(`expected a violation: ${JSON.stringify(r)}`);
  return r.value[0].counterexample;
}

describe('counterexample events', () => {
  const cell = cellWithSheet(guardBypassedByLatch);
  const rule = { id: 'guard', title: 'No start request with the guard open', kind: 'never', what: { signal: '%QX0.1', value: 'on' }, while: { signal: '%IX0.2', value: 'off' } };

  it('forces every input for scan 0 at 0 ms, then only the changes, one scan period apart', () => {
    const cex = counterexample(cell, rule);
    const events = counterexampleEvents(cex, cell as { plc: { sheet: { scanPeriodMs: number } } });
    // Scan 0: start on, stop input off, guard shut; scan 1: start off, stop input on, guard open (prove.test.ts).
    expect(events).toEqual([
      { t: 0, event: { type: 'force', target: '%IX0.0', value: 1 } },
      { t: 0, event: { type: 'force', target: '%IX0.2', value: 1 } },
      { t: 0, event: { type: 'force', target: '%IX0.1', value: 0 } },
      { t: 10, event: { type: 'force', target: '%IX0.0', value: 0 } },
      { t: 10, event: { type: 'force', target: '%IX0.2', value: 0 } },
      { t: 10, event: { type: 'force', target: '%IX0.1', value: 1 } },
    ]);
    // The starter cell scans every 10 ms (simulator/demo/starter.ts); scan 1 runs at 20 ms.
    expect(counterexampleFailsAtMs(cex, cell as { plc: { sheet: { scanPeriodMs: number } } })).toBe(20);
  });

  it('replays through createCell: after every scan the rule\'s signals are the counterexample\'s, and the last breaks the rule', () => {
    const cex = counterexample(cell, rule);
    const events = counterexampleEvents(cex);
    const made = createCell(cell, { trace: ['plc.%QX0.1', 'plc.%IX0.2'] });
    if (!made.ok) throw new Error(JSON.stringify(made.errors));
    const c = made.value;
    const period = cex.scanPeriodMs;
    let next = 0;
    cex.scans.forEach((scan, k) => {
      // Apply the forces logged up to this scan's input time (k · P), then run to its scan at (k + 1) · P.
      while (next < events.length && events[next].t <= k * period) {
        expect(c.advance(events[next].t - c.timeMs).ok).toBe(true);
        expect(c.apply(events[next].event).ok).toBe(true);
        next++;
      }
      c.advance((k + 1) * period - c.timeMs);
      for (const [signal, value] of Object.entries(scan.signals)) expect(c.readSignal(`plc.${signal}`), `scan ${k} ${signal}`).toEqual({ ok: true, value: value ? 1 : 0 });
    });
    expect(c.timeMs).toBe(counterexampleFailsAtMs(cex));
    // The engine's own trace rule sees the break. (A trace samples inputs as they change between
    // scans, so it may see the input half of a break before the PLC has scanned it; the proof
    // pairs each scan's outputs with the inputs that scan read.)
    const checked = checkRules(c.trace(), [
      { id: 'guard', kind: 'never', p: { all: [{ signal: 'plc.%QX0.1', op: '==', value: 1 }, { signal: 'plc.%IX0.2', op: '==', value: 0 }] } },
    ]);
    expect(checked.ok && checked.value[0].status).toBe('fail');
    if (checked.ok) expect(checked.value[0].violation?.timeMs).toBeLessThanOrEqual(counterexampleFailsAtMs(cex));
    expect(c.readSignal('plc.%QX0.1')).toEqual({ ok: true, value: 1 });
    expect(c.readSignal('plc.%IX0.2')).toEqual({ ok: true, value: 0 });
    c.dispose();
  });

  it('replays as a logged event list (the headless runner and the server use replay)', () => {
    const cellNo = cellWithSheet(estopWiredNo);
    const cex = counterexample(cellNo, { id: 'estop', title: '', kind: 'only-if', what: { signal: '%QX0.1', value: 'on' }, requires: [{ signal: '%IX0.3', value: 'on' }] });
    const failsAt = counterexampleFailsAtMs(cex);
    const r = replay(cellNo, counterexampleEvents(cex), { trace: ['plc.%QX0.1', 'plc.%IX0.3'], untilMs: failsAt });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const checked = checkRules(r.value.trace, [
      { id: 'estop', kind: 'never', p: { all: [{ signal: 'plc.%QX0.1', op: '==', value: 1 }, { signal: 'plc.%IX0.3', op: '==', value: 0 }] } },
    ]);
    expect(checked.ok && checked.value[0].violation?.timeMs).toBe(failsAt);
  });
});
