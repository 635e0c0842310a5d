/**
 * The cell holds wiring readings while nothing can change them and holds back controller
 * refreshes that would only let time pass. These checks pin the cases where that must not
 * show: a reading taken between scans, and the time a wait step has counted.
 */
import { describe, expect, it } from 'vitest';
import { createCell, type Cell } from './cell';
import { pickAndPlaceCell } from '@/simulator/demo/pick-and-place';
import { starterCell } from '@/simulator/demo/starter';

function make(doc: unknown): Cell {
  const r = createCell(doc);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

function lamp(cell: Cell): number {
  const r = cell.readSignal('dev.running.lamp0');
  if (!r.ok) throw new Error('no lamp signal');
  return Number(r.value);
}

describe('held wiring readings', () => {
  it('a lamp follows its PLC output again one scan after an unforce', () => {
    const cell = make(starterCell);
    // Start held: the run coil %QX0.0 is on whatever the seal-in contact reads (common practice: start/stop seal-in circuit).
    cell.apply({ type: 'press', device: 'start' });
    cell.advance(30);
    expect(lamp(cell)).toBe(1);
    // Forced to the value the logic writes anyway: nothing visible changes while it holds.
    cell.apply({ type: 'force', target: '%QX0.0', value: 1 });
    cell.advance(50);
    expect(lamp(cell)).toBe(1);
    // Unforcing clears the address until the logic writes it again (see the force event) ...
    cell.apply({ type: 'unforce', target: '%QX0.0' });
    expect(lamp(cell)).toBe(0);
    // ... which the next scan does, 10 ms later (the starter sheet's scanPeriodMs). It writes the
    // byte value the scans before the unforce left, and the lamp must still read it anew.
    cell.advance(10);
    expect(lamp(cell)).toBe(1);
    cell.apply({ type: 'release', device: 'start' });
    cell.advance(30);
    expect(lamp(cell)).toBe(1);
    cell.dispose();
  });
});

describe('held-back controller refreshes', () => {
  it('a wait step counts every refresh period, held back or not', () => {
    const cell = make(pickAndPlaceCell);
    cell.advance(2000);
    cell.apply({ type: 'set-field', device: 'part', active: true });
    cell.apply({ type: 'press', device: 'start' });
    cell.advance(100);
    cell.apply({ type: 'release', device: 'start' });
    // Step 4 of the demo routine waits for the gripper-closed feedback (gripper travel 300 ms).
    let guard = 0;
    while (cell.snapshot().controller.pc !== 4) {
      cell.advance(1);
      if (++guard > 20_000) throw new Error('the routine never reached its gripper wait');
    }
    const refresh = 20; // the demo controller's ioRefreshMs
    const seen: number[] = [];
    for (let k = 0; k < 5; k++) {
      cell.advance(refresh);
      const c = cell.snapshot().controller;
      if (c.pc !== 4) break;
      seen.push(c.stepElapsedMs);
    }
    expect(seen.length).toBeGreaterThanOrEqual(3);
    for (let k = 1; k < seen.length; k++) expect(seen[k] - seen[k - 1]).toBe(refresh);
    cell.dispose();
  });
});
