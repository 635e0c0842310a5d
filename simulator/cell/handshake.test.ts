import { describe, expect, it } from 'vitest';
import { createCell, type Cell } from './cell';
import { pickAndPlaceCell } from '@/simulator/demo/pick-and-place';
import { brakingDistance, pathLength } from '@/simulator/controller/motion';

function make(overrides: { stopCategory?: 0 | 1 } = {}): Cell {
  const doc = structuredClone(pickAndPlaceCell);
  if (overrides.stopCategory !== undefined) doc.controller.stopCategory = overrides.stopCategory;
  const r = createCell(doc);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

function ok<T>(r: { ok: boolean; errors?: unknown } & T): void {
  expect(r.ok, JSON.stringify(r.errors)).toBe(true);
}

function press(cell: Cell, device: string, ms = 60): void {
  ok(cell.apply({ type: 'press', device }));
  ok(cell.advance(ms));
  ok(cell.apply({ type: 'release', device }));
}

function state(cell: Cell): string {
  return cell.snapshot().controller.state;
}

function arm(cell: Cell): number[] {
  return cell.snapshot().arm.pose;
}

/** Boots the demo cell, puts a part at the pick station and starts a cycle. */
function startCycle(cell: Cell): void {
  ok(cell.advance(2000)); // boot time 1500 ms
  expect(state(cell)).toBe('ready');
  ok(cell.apply({ type: 'set-field', device: 'part', active: true }));
  ok(cell.advance(100));
  press(cell, 'start');
  ok(cell.advance(40));
  expect(state(cell)).toBe('cycling');
}

describe('demo cell handshake end to end', () => {
  it('start → cycle completes → back to ready with cycle done pulsed', () => {
    const cell = make();
    startCycle(cell);
    let sawDone = false;
    for (let i = 0; i < 200 && cell.snapshot().controller.cyclesCompleted === 0; i++) {
      ok(cell.advance(100));
      if (cell.snapshot().controller.handshake.cycleDone) sawDone = true;
    }
    const s = cell.snapshot();
    expect(s.controller.cyclesCompleted).toBe(1);
    expect(s.controller.alarms).toEqual([]);
    expect(s.controller.handshake.cycleDone || sawDone).toBe(true);
    expect(s.controller.state).toBe('ready');
    // Home pose of the demo is (0, 0.4); the routine ends there.
    expect(pathLength(s.arm.pose, [0, 0.4])).toBeLessThan(1e-9);
    expect(s.controller.handshake.atHome).toBe(true);
    // The PLC sees the robot's outputs over the hardwired link.
    expect(s.plc.addresses['%IX1.0'].value).toBe(1); // ready
    expect(s.plc.addresses['%IX1.1'].value).toBe(1); // at home
  });

  it('e-stop mid-move, category 1: brakes at the move deceleration, then power off; reset does not restart; start again works', () => {
    const cell = make({ stopCategory: 1 });
    startCycle(cell);
    ok(cell.advance(700)); // first move home → above pick: 0.51 m at 0.5 m/s, cruising after 0.5 s
    expect(cell.snapshot().arm.moving).toBe(true);
    expect(cell.snapshot().arm.speed).toBeCloseTo(0.5, 6);
    const before = arm(cell);
    ok(cell.apply({ type: 'press', device: 'estop' }));
    ok(cell.advance(1500));
    const s = cell.snapshot();
    expect(s.controller.state).toBe('eStopped');
    expect(s.controller.detail).toBe('halted');
    expect(s.arm.moving).toBe(false);
    expect(s.controller.servoOn).toBe(false);
    // Category 1 (IEC 60204-1 §9.2.2): controlled stop. From 0.5 m/s at 1 m/s² the brake takes
    // v²/(2a) = 0.125 m; the e-stop is read at the next I/O refresh (≤ 20 ms at 0.5 m/s = 0.01 m).
    const travelled = pathLength(before, s.arm.pose);
    expect(travelled).toBeGreaterThanOrEqual(brakingDistance(0.5, 1) - 1e-9);
    expect(travelled).toBeLessThanOrEqual(brakingDistance(0.5, 1) + 0.5 * 0.02 + 1e-9);
    expect(s.devices.find((d) => d.id === 'stack')?.lamps?.[0]).toBe(true); // red tier lit

    // Releasing the e-stop alone restarts nothing (ISO 13850: reset required).
    ok(cell.apply({ type: 'release', device: 'estop' }));
    ok(cell.advance(500));
    expect(state(cell)).toBe('eStopped');

    // Reset while start is held: the controller becomes ready but must not move (ISO 13850 §4.1.3).
    ok(cell.apply({ type: 'press', device: 'start' }));
    ok(cell.advance(100));
    press(cell, 'reset');
    const held = arm(cell);
    ok(cell.advance(2000));
    expect(state(cell)).toBe('ready');
    expect(arm(cell)).toEqual(held);
    ok(cell.apply({ type: 'release', device: 'start' }));
    ok(cell.advance(100));

    // A fresh start resumes the interrupted cycle and completes it.
    press(cell, 'start');
    ok(cell.advance(60));
    expect(state(cell)).toBe('cycling');
    for (let i = 0; i < 200 && cell.snapshot().controller.cyclesCompleted === 0; i++) ok(cell.advance(100));
    expect(cell.snapshot().controller.cyclesCompleted).toBe(1);
  });

  it('e-stop mid-move, category 0: motion stops at once and power is removed', () => {
    const cell = make({ stopCategory: 0 });
    startCycle(cell);
    ok(cell.advance(700));
    const before = arm(cell);
    ok(cell.apply({ type: 'press', device: 'estop' }));
    ok(cell.advance(20)); // one I/O refresh
    const s = cell.snapshot();
    expect(s.controller.state).toBe('eStopped');
    expect(s.controller.servoOn).toBe(false);
    expect(s.arm.moving).toBe(false);
    // Category 0: no braking ramp; at most the travel until the e-stop is read (0.5 m/s × 20 ms).
    expect(pathLength(before, s.arm.pose)).toBeLessThanOrEqual(0.5 * 0.02 + 1e-9);
    const stopped = arm(cell);
    ok(cell.advance(1000));
    expect(arm(cell)).toEqual(stopped);
  });

  it('guard opened mid-cycle holds the robot until the guard is closed and start pressed', () => {
    const cell = make();
    startCycle(cell);
    ok(cell.advance(700));
    ok(cell.apply({ type: 'set-field', device: 'guard', active: false }));
    ok(cell.advance(1000));
    let s = cell.snapshot();
    expect(s.controller.state).toBe('holding');
    expect(s.controller.holdReason).toBe('guard');
    expect(s.arm.moving).toBe(false);
    expect(s.devices.find((d) => d.id === 'stack')?.lamps?.[1]).toBe(true); // yellow tier
    const held = arm(cell);
    // Start with the guard open is refused (PLC permissive and controller guard both block it).
    press(cell, 'start');
    ok(cell.advance(500));
    expect(state(cell)).toBe('holding');
    expect(arm(cell)).toEqual(held);
    // Closing the guard alone does not resume motion.
    ok(cell.apply({ type: 'set-field', device: 'guard', active: true }));
    ok(cell.advance(500));
    expect(state(cell)).toBe('holding');
    expect(arm(cell)).toEqual(held);
    press(cell, 'start');
    ok(cell.advance(100));
    s = cell.snapshot();
    expect(s.controller.state).toBe('cycling');
    expect(s.arm.moving).toBe(true);
    for (let i = 0; i < 200 && cell.snapshot().controller.cyclesCompleted === 0; i++) ok(cell.advance(100));
    expect(cell.snapshot().controller.cyclesCompleted).toBe(1);
  });

  it('the robot does not start with the guard open or the e-stop chain broken', () => {
    const cell = make();
    ok(cell.advance(2000));
    ok(cell.apply({ type: 'set-field', device: 'part', active: true }));
    ok(cell.apply({ type: 'set-field', device: 'guard', active: false }));
    ok(cell.advance(100));
    press(cell, 'start');
    ok(cell.advance(500));
    expect(state(cell)).toBe('ready');
    expect(cell.snapshot().arm.moving).toBe(false);
    ok(cell.apply({ type: 'set-field', device: 'guard', active: true }));
    ok(cell.apply({ type: 'press', device: 'estop' }));
    ok(cell.advance(100));
    press(cell, 'start');
    ok(cell.advance(500));
    expect(state(cell)).toBe('eStopped');
    expect(cell.snapshot().arm.moving).toBe(false);
  });

  it('the recipe number word selects the place pose (recipe 2 → place 2)', () => {
    const cell = make();
    ok(cell.apply({ type: 'set-selector', device: 'recipe', position: 1 }));
    startCycle(cell);
    let reachedPlace2 = false;
    for (let i = 0; i < 300 && cell.snapshot().controller.cyclesCompleted === 0; i++) {
      ok(cell.advance(50));
      if (pathLength(cell.snapshot().arm.pose, [-0.4, 0.35]) < 1e-9) reachedPlace2 = true;
    }
    expect(cell.snapshot().controller.points.find((p) => p.ref === 'WI1')?.value).toBe(2);
    expect(reachedPlace2).toBe(true);
  });
});
