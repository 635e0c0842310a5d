/**
 * Servo power when the controller stops at rest. The cell holds back controller refreshes
 * that would only let time pass, so a stopped, idle controller gets no refresh until an input
 * changes; servo power must still drop as the controller enters the stopping state, and the
 * snapshot and the trace must say the same.
 */
import { describe, expect, it } from 'vitest';
import { createCell, type Cell } from './cell';
import { pickAndPlaceCell } from '@/simulator/demo/pick-and-place';
import type { SignalValue } from '@/simulator/trace/predicate';

function make(): Cell {
  const r = createCell(structuredClone(pickAndPlaceCell), { trace: ['ctl.state', 'ctl.servo'] });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

function ok(r: { ok: boolean; errors?: unknown }): void {
  expect(r.ok, JSON.stringify(r.errors)).toBe(true);
}

/** The last traced value of `signal` at or before `t`. */
function tracedAt(cell: Cell, signal: string, t: number): SignalValue | undefined {
  const trace = cell.trace();
  const idx = trace.signals.indexOf(signal);
  let value: SignalValue | undefined;
  for (const [time, i, v] of trace.samples) if (i === idx && time <= t) value = v;
  return value;
}

describe('servo power on a stop at rest', () => {
  it('a held stop request drops servo power on entering stopped, in snapshot and trace alike', () => {
    const cell = make();
    ok(cell.advance(2000)); // the demo controller boots in 1500 ms
    expect(cell.snapshot().controller.state).toBe('ready');
    expect(cell.snapshot().controller.servoOn).toBe(true);
    // Servo power off once stopped at rest (IEC 60204-1 §9.2.2, stop categories 0 and 1).
    ok(cell.apply({ type: 'press', device: 'stop' }));
    ok(cell.advance(500));
    const s = cell.snapshot();
    expect(s.controller.state).toBe('stopped');
    expect(s.arm.moving).toBe(false);
    expect(s.controller.servoOn).toBe(false);
    expect(tracedAt(cell, 'ctl.servo', cell.timeMs)).toBe(0);
    // Power dropped with the state change itself, not at some later refresh.
    const trace = cell.trace();
    const stateIdx = trace.signals.indexOf('ctl.state');
    const servoIdx = trace.signals.indexOf('ctl.servo');
    const stoppedAt = trace.samples.find(([, i, v]) => i === stateIdx && v === 'stopped')?.[0];
    const servoOffAt = trace.samples.filter(([, i, v]) => i === servoIdx && v === 0).at(-1)?.[0];
    expect(stoppedAt).toBeDefined();
    expect(servoOffAt).toBe(stoppedAt);
    // Releasing the stop: ready again with servo power on.
    ok(cell.apply({ type: 'release', device: 'stop' }));
    ok(cell.advance(200));
    expect(cell.snapshot().controller.state).toBe('ready');
    expect(cell.snapshot().controller.servoOn).toBe(true);
    expect(tracedAt(cell, 'ctl.servo', cell.timeMs)).toBe(1);
    cell.dispose();
  });
});
