import { describe, expect, it } from 'vitest';
import { createActor } from 'xstate';
import { controllerMachine } from './controller.machine';
import type { ControllerConfig } from '@/simulator/schema/cell-document';

// The machine has no timers: time only passes through TICK events (explicit time in context),
// so the test is its own clock.
const config: ControllerConfig = {
  axes: 1,
  bootMs: 100,
  ioRefreshMs: 10,
  stopCategory: 1,
  homePose: 'home',
  positionTolerance: 0.001,
  cycleDonePulseMs: 50,
  modules: [],
  pointMap: [],
  staged: null,
  handshake: { inputs: { start: 'DI1', faultReset: 'DI2', estopHealthy: 'DI3', guardClosed: 'DI4' }, outputs: {} },
  routine: [
    { kind: 'move', pose: 'far' },
    { kind: 'wait', condition: { point: 'DI5', op: '==', value: 1 }, timeoutMs: 200, alarm: 'no confirm' },
    { kind: 'move', pose: 'home' },
  ],
  poses: [
    { id: 'home', coordinates: [0], speed: 1, accel: 1 },
    { id: 'far', coordinates: [1], speed: 0.5, accel: 1 },
  ],
};

function rig(cfg: ControllerConfig = config) {
  const actor = createActor(controllerMachine, { input: { config: cfg } }).start();
  const inputs: Record<string, number> = { DI1: 0, DI2: 0, DI3: 1, DI4: 1, DI5: 0 };
  const tick = (ms: number) => {
    for (let t = 0; t < ms; t += 10) actor.send({ type: 'TICK', dt: 10, inputs: { ...inputs }, hardware: [] });
  };
  const state = () => {
    const v = actor.getSnapshot().value;
    return typeof v === 'string' ? v : Object.keys(v)[0];
  };
  return { actor, inputs, tick, state, ctx: () => actor.getSnapshot().context };
}

describe('controller machine', () => {
  it('boots for bootMs, then is ready; a start edge starts the routine', () => {
    const r = rig();
    expect(r.state()).toBe('off');
    r.actor.send({ type: 'POWER_ON' });
    expect(r.state()).toBe('booting');
    r.tick(90);
    expect(r.state()).toBe('booting');
    r.tick(10);
    expect(r.state()).toBe('ready');
    r.inputs.DI1 = 1;
    r.tick(10);
    expect(r.state()).toBe('cycling');
  });

  it('a move takes its trapezoidal time: d = 1, v = 0.5, a = 1 → 2.5 s (Modern Robotics ch. 9)', () => {
    const r = rig();
    r.actor.send({ type: 'POWER_ON' });
    r.tick(100);
    r.inputs.DI1 = 1;
    r.tick(10); // start edge → cycling
    // The first cycling refresh starts the move; 250 refreshes of 10 ms give 2.5 s of motion.
    r.tick(2490);
    expect(r.ctx().pc).toBe(0);
    r.tick(10);
    expect(r.ctx().pc).toBe(1);
    expect(r.ctx().pose[0]).toBe(1);
  });

  it('a wait past its timeout raises its alarm; fault reset clears it and start retries the step', () => {
    const r = rig();
    r.actor.send({ type: 'POWER_ON' });
    r.tick(100);
    r.inputs.DI1 = 1;
    r.tick(2600);
    expect(r.ctx().pc).toBe(1);
    r.tick(200);
    expect(r.state()).toBe('faulted');
    expect(r.ctx().alarms.map((a) => a.message)).toEqual(['no confirm']);
    r.inputs.DI2 = 1;
    r.tick(10);
    expect(r.state()).toBe('ready');
    expect(r.ctx().alarms).toEqual([]);
    // Start is still held from before: no new edge, no restart.
    r.tick(100);
    expect(r.state()).toBe('ready');
    r.inputs.DI1 = 0;
    r.tick(10);
    r.inputs.DI1 = 1;
    r.inputs.DI5 = 1;
    r.tick(10);
    expect(r.state()).toBe('cycling');
    r.tick(10); // the routine runs from the next refresh: the wait now passes at once
    expect(r.ctx().pc).toBe(2);
  });

  it('e-stop needs the chain healthy and a reset edge, and never restarts motion', () => {
    const r = rig();
    r.actor.send({ type: 'POWER_ON' });
    r.tick(100);
    r.inputs.DI1 = 1;
    r.tick(1000);
    expect(r.ctx().speed).toBeCloseTo(0.5, 9);
    r.inputs.DI3 = 0;
    r.tick(10);
    expect(r.state()).toBe('eStopped');
    r.tick(1000); // category 1: brakes over 0.5 s, then power off
    expect(r.ctx().motion).toBeNull();
    expect(r.ctx().servoOn).toBe(false);
    r.inputs.DI2 = 1; // reset with the chain still broken: refused
    r.tick(10);
    expect(r.state()).toBe('eStopped');
    r.inputs.DI2 = 0;
    r.inputs.DI3 = 1;
    r.tick(100);
    expect(r.state()).toBe('eStopped');
    r.inputs.DI2 = 1;
    r.tick(10);
    expect(r.state()).toBe('ready');
    const pose = r.ctx().pose[0];
    r.tick(500);
    expect(r.ctx().pose[0]).toBe(pose);
  });

  it('guard opened while cycling holds; restart and power off are always accepted', () => {
    const r = rig();
    r.actor.send({ type: 'POWER_ON' });
    r.tick(100);
    r.inputs.DI1 = 1;
    r.tick(500);
    r.inputs.DI4 = 0;
    r.tick(10);
    expect(r.state()).toBe('holding');
    expect(r.ctx().holdReason).toBe('guard');
    r.actor.send({ type: 'RESTART' });
    expect(r.state()).toBe('booting');
    expect(r.ctx().pc).toBe(0);
    r.actor.send({ type: 'POWER_OFF' });
    expect(r.state()).toBe('off');
  });
});

describe('controller machine: servo power on entering a stopping state', () => {
  // The cell sends no TICK while an idle controller's inputs stay the same (it holds the
  // refresh back), so whatever a state does about servo power at rest must happen on entry.
  // Servo power off once at rest in stopped/faulted/e-stopped: IEC 60204-1 §9.2.2 (stop
  // categories 0 and 1 end with power removed once the machine has stopped).
  const withStop: ControllerConfig = { ...config, handshake: { ...config.handshake, inputs: { ...config.handshake.inputs, stop: 'DI6' } } };

  function readyRig(cfg: ControllerConfig) {
    const actor = createActor(controllerMachine, { input: { config: cfg } }).start();
    const inputs: Record<string, number> = { DI1: 0, DI2: 0, DI3: 1, DI4: 1, DI5: 0, DI6: 0 };
    const refresh = (hardware: string[] = []) => actor.send({ type: 'TICK', dt: 10, inputs: { ...inputs }, hardware });
    const state = () => {
      const v = actor.getSnapshot().value;
      return typeof v === 'string' ? v : Object.keys(v)[0];
    };
    actor.send({ type: 'POWER_ON' });
    for (let t = 0; t < 100; t += 10) refresh();
    return { actor, inputs, refresh, state, ctx: () => actor.getSnapshot().context };
  }

  it('a stop request at rest drops servo power in the refresh that enters stopped', () => {
    const r = readyRig(withStop);
    expect(r.state()).toBe('ready');
    expect(r.ctx().servoOn).toBe(true);
    r.inputs.DI6 = 1;
    r.refresh();
    expect(r.state()).toBe('stopped');
    // Already at rest: power goes on entry, with no further TICK (the cell holds idle refreshes back).
    expect(r.ctx().servoOn).toBe(false);
    // Releasing the stop makes the controller ready again, with servo power back on.
    r.inputs.DI6 = 0;
    r.refresh();
    expect(r.state()).toBe('ready');
    expect(r.ctx().servoOn).toBe(true);
  });

  it('a fault at rest drops servo power in the refresh that enters faulted', () => {
    const r = readyRig(withStop);
    r.refresh(['module R0.S1 lost']);
    expect(r.state()).toBe('faulted');
    expect(r.ctx().servoOn).toBe(false);
  });

  it('a fault mid-move keeps servo power while braking and drops it once at rest', () => {
    const r = readyRig(withStop);
    r.inputs.DI1 = 1;
    r.refresh(); // start edge → cycling
    for (let t = 0; t < 1000; t += 10) r.refresh();
    expect(r.ctx().speed).toBeCloseTo(0.5, 9); // pose 'far': cruising at 0.5 m/s after 0.5 s at 1 m/s²
    r.refresh(['module R0.S1 lost']);
    expect(r.state()).toBe('faulted');
    expect(r.ctx().motion).not.toBeNull();
    expect(r.ctx().servoOn).toBe(true);
    // Braking from 0.5 m/s at 1 m/s² takes v/a = 0.5 s (constant deceleration, common practice).
    for (let t = 0; t < 600; t += 10) r.refresh(['module R0.S1 lost']);
    expect(r.ctx().motion).toBeNull();
    expect(r.ctx().servoOn).toBe(false);
  });

  it('an e-stop at rest drops servo power at once, whatever the stop category', () => {
    for (const stopCategory of [0, 1] as const) {
      const r = readyRig({ ...withStop, stopCategory });
      r.inputs.DI3 = 0;
      r.refresh();
      expect(r.state()).toBe('eStopped');
      expect(r.ctx().servoOn).toBe(false);
    }
  });
});

describe('deciding on read inputs', () => {
  // The cyclic model of IEC 61131-3 (inputs are read, then the program decides, then outputs
  // are written; from memory of the standard's program-execution description): a controller
  // decides nothing on inputs it has not read yet.
  it('with a boot time of 0 the controller powers up into stopped/ready, not e-stopped, once its first refresh reads a healthy chain', () => {
    const r = rig({ ...config, bootMs: 0 });
    r.actor.send({ type: 'POWER_ON' });
    expect(r.state()).toBe('booting'); // no inputs read yet: no decision
    r.tick(10);
    expect(r.state()).toBe('ready');
    expect(r.ctx().alarms).toEqual([]);
  });

  it('with a boot time of 0 and a broken chain at the first read, it e-stops then (and only then)', () => {
    const r = rig({ ...config, bootMs: 0 });
    r.inputs.DI3 = 0;
    r.actor.send({ type: 'POWER_ON' });
    expect(r.state()).toBe('booting');
    r.tick(10);
    expect(r.state()).toBe('eStopped');
  });
});

describe('RELOAD_ROUTINE (a downloaded routine)', () => {
  const shorter = { ...config, routine: [{ kind: 'move' as const, pose: 'far' }] };

  it('from cycling: the move halts where the arm is, the routine is at step 0, the controller stops and needs a new start edge', () => {
    const r = rig();
    r.actor.send({ type: 'POWER_ON' });
    r.tick(100);
    r.inputs.DI1 = 1;
    r.tick(500);
    expect(r.state()).toBe('cycling');
    const pose = r.ctx().pose[0];
    expect(pose).toBeGreaterThan(0);
    r.actor.send({ type: 'RELOAD_ROUTINE', config: shorter });
    expect(r.state()).toBe('stopped');
    expect(r.ctx()).toMatchObject({ pc: 0, motion: null, speed: 0, servoOn: false, outputs: {}, pulses: [] });
    expect(r.ctx().pose[0]).toBe(pose);
    expect(r.ctx().config.routine).toHaveLength(1);
    r.tick(100); // start still held: no edge
    expect(r.state()).toBe('ready');
    r.inputs.DI1 = 0;
    r.tick(10);
    r.inputs.DI1 = 1;
    r.tick(10);
    expect(r.state()).toBe('cycling');
  });

  it('e-stopped stays e-stopped (halted); faulted and off stay where they are', () => {
    const e = rig();
    e.actor.send({ type: 'POWER_ON' });
    e.tick(100);
    e.inputs.DI3 = 0;
    e.tick(10);
    expect(e.actor.getSnapshot().value).toEqual({ eStopped: 'halted' });
    e.actor.send({ type: 'RELOAD_ROUTINE', config: shorter });
    expect(e.actor.getSnapshot().value).toEqual({ eStopped: 'halted' });
    expect(e.ctx().servoOn).toBe(false);

    const f = rig();
    f.actor.send({ type: 'POWER_ON' });
    f.tick(100);
    f.actor.send({ type: 'TICK', dt: 10, inputs: { ...f.inputs }, hardware: ['module lost'] });
    expect(f.state()).toBe('faulted');
    f.actor.send({ type: 'RELOAD_ROUTINE', config: shorter });
    expect(f.state()).toBe('faulted');
    expect(f.ctx().pc).toBe(0);

    const o = rig();
    o.actor.send({ type: 'RELOAD_ROUTINE', config: shorter });
    expect(o.state()).toBe('off');
    expect(o.ctx().config.routine).toHaveLength(1);
  });
});

