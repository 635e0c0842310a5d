import { describe, expect, it } from 'vitest';
import { createCell, type Cell } from '@/simulator/cell/cell';
import { pickAndPlaceCell } from '@/simulator/demo/pick-and-place';
import { starterCell } from '@/simulator/demo/starter';
import { FAULT_KINDS } from './fault-card';

function cellOf(doc: unknown, faults: unknown[] = []): Cell {
  const r = createCell(doc, { faults });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}
function sig(cell: Cell, name: string): number | string {
  const r = cell.readSignal(name);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}
function must(r: { ok: boolean; errors?: unknown }): void {
  expect(r.ok, JSON.stringify(r.errors)).toBe(true);
}
const demo = () => cellOf(pickAndPlaceCell);

describe('fault cards produce the symptom a technician would see', () => {
  it('covers every fault kind in this file', () => {
    expect(FAULT_KINDS).toHaveLength(15);
  });

  it('stuck-on: a part sensor reads a part that is not there (LED lit, input on)', () => {
    const c = demo();
    must(c.apply({ type: 'inject-fault', fault: { id: 'f1', kind: 'stuck-on', device: 'part' } }));
    must(c.advance(20));
    expect(sig(c, 'dev.part.active')).toBe(0);
    expect(sig(c, 'dev.part.led')).toBe(1);
    expect(sig(c, 'plc.%IX0.5')).toBe(1);
  });

  it('stuck-off: a part sensor misses a part that is there (LED dark, input off)', () => {
    const c = demo();
    must(c.apply({ type: 'set-field', device: 'part', active: true }));
    must(c.apply({ type: 'inject-fault', fault: { id: 'f1', kind: 'stuck-off', device: 'part' } }));
    must(c.advance(20));
    expect(sig(c, 'dev.part.led')).toBe(0);
    expect(sig(c, 'plc.%IX0.5')).toBe(0);
  });

  it('open wire on the NC stop circuit reads as stop: the PLC requests a stop and the robot is not ready', () => {
    // NC stop circuits fail to "stop" on a broken wire (IEC 60947-5-1 Annex K; common practice).
    const c = demo();
    must(c.advance(2000));
    expect(sig(c, 'ctl.state')).toBe('ready');
    must(c.apply({ type: 'inject-fault', fault: { id: 'f1', kind: 'open-wire', row: 'w-stop' } }));
    must(c.advance(60));
    expect(sig(c, 'dev.stop.pressed')).toBe(0);
    expect(sig(c, 'wire.w-stop')).toBe(0);
    expect(sig(c, 'plc.%IX0.1')).toBe(0);
    expect(sig(c, 'plc.%QX0.1')).toBe(1);
    expect(sig(c, 'ctl.state')).toBe('stopped');
    expect(c.snapshot().wires.find((w) => w.id === 'w-stop')?.faults).toEqual(['f1']);
  });

  it('short to +24 V on a sinking input reads on with the sensor dark', () => {
    const c = demo();
    must(c.apply({ type: 'inject-fault', fault: { id: 'f1', kind: 'short-24v', row: 'w-part' } }));
    must(c.advance(20));
    expect(sig(c, 'dev.part.led')).toBe(0);
    expect(sig(c, 'wire.w-part')).toBe(24);
    expect(sig(c, 'plc.%IX0.5')).toBe(1);
  });

  it('short to 0 V on the guard circuit reads as guard open', () => {
    const c = demo();
    must(c.apply({ type: 'inject-fault', fault: { id: 'f1', kind: 'short-0v', row: 'w-guard' } }));
    must(c.advance(20));
    expect(sig(c, 'dev.guard.active')).toBe(1);
    expect(sig(c, 'plc.%IX0.4')).toBe(0);
    expect(sig(c, 'dev.stack.lamp1')).toBe(1); // yellow: guard reads open
  });

  it('chatter: the input flickers while the sensor is steady, identically for the same seed', () => {
    const run = () => {
      const r = createCell(pickAndPlaceCell, { trace: ['plc.%IX0.5', 'dev.part.led'], faults: [{ id: 'f1', kind: 'chatter', row: 'w-part', periodMs: 20, probability: 0.5 }] });
      if (!r.ok) throw new Error('cell');
      const c = r.value;
      must(c.apply({ type: 'set-field', device: 'part', active: true }));
      must(c.advance(2000));
      return c.trace();
    };
    const t = run();
    const input = t.samples.filter((s) => s[1] === 0);
    const led = t.samples.filter((s) => s[1] === 1);
    expect(led.length).toBe(2); // initial 0, then on once
    expect(input.filter((s) => s[2] === 1).length).toBeGreaterThan(3);
    expect(input.filter((s) => s[2] === 0).length).toBeGreaterThan(3);
    expect(run()).toEqual(t);
  });

  it('swapped wires: pressing start drives the reset input and the other way round', () => {
    const c = demo();
    must(c.apply({ type: 'inject-fault', fault: { id: 'f1', kind: 'swapped-wires', rows: ['w-start', 'w-reset'] } }));
    must(c.apply({ type: 'press', device: 'start' }));
    must(c.advance(20));
    expect(sig(c, 'plc.%IX0.0')).toBe(0);
    expect(sig(c, 'plc.%IX0.3')).toBe(1);
  });

  it('dead PLC input module: every point drops and the module reports a fault', () => {
    const c = demo();
    must(c.advance(20));
    expect(sig(c, 'plc.%IX0.1')).toBe(1); // NC stop healthy
    must(c.apply({ type: 'inject-fault', fault: { id: 'f1', kind: 'dead-module', module: 'plc-di0' } }));
    must(c.advance(20));
    const s = c.snapshot();
    expect(s.plc.image.I.every((b) => b === 0)).toBe(true);
    expect(s.plc.moduleFaults).toEqual(['plc-di0']);
    expect(sig(c, 'plc.fault.plc-di0')).toBe(1);
  });

  it('dead controller module: its points drop and the controller faults with a module alarm', () => {
    const c = demo();
    must(c.advance(2000));
    must(c.apply({ type: 'inject-fault', fault: { id: 'f1', kind: 'dead-module', module: 'ctl-do' } }));
    must(c.advance(40));
    const s = c.snapshot();
    expect(s.controller.state).toBe('faulted');
    expect(s.controller.moduleFaults).toEqual(['ctl-do']);
    expect(s.controller.alarms.map((a) => a.message).join()).toContain('ctl-do');
    expect(sig(c, 'plc.%IX1.6')).toBe(0); // the fault output itself is on the dead module
    // Clearing the card is not enough: a fault reset is needed.
    must(c.apply({ type: 'clear-fault', id: 'f1' }));
    must(c.advance(100));
    expect(sig(c, 'ctl.state')).toBe('faulted');
    must(c.apply({ type: 'press', device: 'reset' }));
    must(c.advance(100));
    expect(sig(c, 'ctl.state')).toBe('ready');
  });

  it('link loss on a hardwired link: PLC signals stop reaching the controller', () => {
    const c = demo();
    must(c.advance(2000));
    expect(sig(c, 'ctl.DI4')).toBe(1); // guard closed passed on by the PLC
    must(c.apply({ type: 'inject-fault', fault: { id: 'f1', kind: 'link-loss' } }));
    must(c.advance(40));
    expect(sig(c, 'ctl.DI4')).toBe(0);
    expect(sig(c, 'plc.%IX1.0')).toBe(0); // and robot outputs stop reaching the PLC
    expect(sig(c, 'link.healthy')).toBe(0);
  });

  it('link loss on a fieldbus: after the watchdog the controller reports a link fault', () => {
    const doc = structuredClone(pickAndPlaceCell) as unknown as { link: unknown };
    doc.link = { kind: 'fieldbus', updatePeriodMs: 10, watchdogMs: 100 };
    const c = cellOf(doc);
    must(c.advance(2000));
    expect(sig(c, 'ctl.state')).toBe('ready');
    must(c.apply({ type: 'inject-fault', fault: { id: 'f1', kind: 'link-loss' } }));
    must(c.advance(60));
    expect(sig(c, 'link.healthy')).toBe(1); // within the watchdog time
    must(c.advance(100));
    expect(sig(c, 'link.healthy')).toBe(0);
    expect(sig(c, 'ctl.state')).toBe('faulted');
    expect(c.snapshot().controller.alarms.map((a) => a.message)).toContain('fieldbus link lost');
  });

  it('slow actuator: the gripper closes late and the routine wait times out with its alarm', () => {
    const c = cellOf(pickAndPlaceCell, [{ id: 'f1', kind: 'slow-actuator', device: 'gripper', factor: 10 }]);
    must(c.advance(2000));
    must(c.apply({ type: 'set-field', device: 'part', active: true }));
    must(c.advance(100));
    must(c.apply({ type: 'press', device: 'start' }));
    must(c.advance(60));
    must(c.apply({ type: 'release', device: 'start' }));
    must(c.advance(8000));
    const s = c.snapshot();
    expect(s.controller.state).toBe('faulted');
    expect(s.controller.alarms.map((a) => a.message)).toContain('Gripper did not close');
    expect(s.devices.find((d) => d.id === 'gripper')?.command).toBe(true);
  });

  it('analog drift: the displayed value creeps away from the dial', () => {
    const c = cellOf(starterCell);
    must(c.apply({ type: 'set-analog', device: 'speed', value: 50 }));
    must(c.advance(100));
    expect(sig(c, 'dev.speedShown.value')).toBe(50);
    // 4–20 mA over 0–100 %: 1 mA = 6.25 % (linear scaling, common practice). 0.5 mA/s for 4 s = 2 mA = 12.5 %.
    must(c.apply({ type: 'inject-fault', fault: { id: 'f1', kind: 'analog-drift', device: 'speed', ratePerS: 0.5 } }));
    must(c.advance(4000));
    expect(sig(c, 'wire.w-speed')).toBeCloseTo(14, 6);
    expect(sig(c, 'dev.speed.value')).toBe(50);
    // 14 mA on a 12-bit module: round(10/16 × 4095) = 2559 counts; 2559/4095 × 100 = 62.49 % → word 62
    // (linear scaling and 2^12 − 1 converter steps, common practice; worked from the formula).
    expect(sig(c, 'plc.%IW4')).toBe(2559);
    expect(sig(c, 'dev.speedShown.value')).toBe(62);
  });

  it('analog loss: 0 mA reads as a failed loop (NE 43) and the value drops', () => {
    const c = cellOf(starterCell);
    must(c.apply({ type: 'set-analog', device: 'speed', value: 75 }));
    must(c.apply({ type: 'inject-fault', fault: { id: 'f1', kind: 'analog-loss', device: 'speed' } }));
    must(c.advance(100));
    const w = c.snapshot().wires.find((x) => x.id === 'w-speed');
    expect(w?.level).toBe(0);
    expect(w?.loop).toBe('failed_low'); // NAMUR NE 43: ≤ 3.6 mA is a failure signal (from memory)
    expect(sig(c, 'dev.speedShown.value')).toBe(0); // clamped scaling of a below-range count
  });

  it('sensor type mismatch: the sensor LED lights but the input stays off', () => {
    // PNP sensor on a sinking input works; an NPN sensor on it never drives current (common practice).
    const c = demo();
    must(c.apply({ type: 'set-field', device: 'part', active: true }));
    must(c.advance(20));
    expect(sig(c, 'plc.%IX0.5')).toBe(1);
    must(c.apply({ type: 'inject-fault', fault: { id: 'f1', kind: 'sensor-type-mismatch', device: 'part' } }));
    must(c.advance(20));
    expect(sig(c, 'dev.part.led')).toBe(1);
    expect(sig(c, 'plc.%IX0.5')).toBe(0);
  });

  it('supply sag: the supply measures 12 V and a type 1 input wavers in its transition band (IEC 61131-2, from memory: ON from 15 V)', () => {
    const c = demo();
    must(c.apply({ type: 'press', device: 'start' }));
    must(c.advance(20));
    must(c.apply({ type: 'inject-fault', fault: { id: 'f1', kind: 'supply-sag', volts: 12 } }));
    must(c.advance(20));
    const s = c.snapshot();
    expect(s.supply.volts).toBe(12);
    expect(s.wires.find((w) => w.id === 'w-start')).toMatchObject({ level: 12, reading: 'undefined' });
    expect(sig(c, 'plc.%IX0.0')).toBe(1); // held in the band
  });

  it('sensor leakage: with the part gone a type 1 input keeps reading it (9 V in the transition band)', () => {
    const c = demo();
    must(c.apply({ type: 'inject-fault', fault: { id: 'f1', kind: 'sensor-leakage', device: 'part', leakMa: 1.5 } }));
    must(c.apply({ type: 'set-field', device: 'part', active: true }));
    must(c.advance(20));
    must(c.apply({ type: 'set-field', device: 'part', active: false }));
    must(c.advance(20));
    expect(sig(c, 'dev.part.led')).toBe(0);
    expect(c.snapshot().wires.find((w) => w.id === 'w-part')).toMatchObject({ level: 9, reading: 'undefined' });
    expect(sig(c, 'plc.%IX0.5')).toBe(1);
  });

  it('timed and triggered cards wait for their moment', () => {
    const c = demo();
    must(c.apply({ type: 'inject-fault', fault: { id: 'timed', kind: 'stuck-on', device: 'part', at: 500 } }));
    must(
      c.apply({
        type: 'inject-fault',
        fault: { id: 'trig', kind: 'open-wire', row: 'w-guard', when: { signal: 'ctl.state', op: '==', value: 'ready' } },
      }),
    );
    must(c.advance(400));
    expect(sig(c, 'fault.timed')).toBe(0);
    expect(sig(c, 'plc.%IX0.5')).toBe(0);
    must(c.advance(200));
    expect(sig(c, 'fault.timed')).toBe(1);
    expect(sig(c, 'plc.%IX0.5')).toBe(1);
    expect(sig(c, 'fault.trig')).toBe(0);
    must(c.advance(1500));
    expect(sig(c, 'fault.trig')).toBe(1);
  });

  it('a card naming something that does not exist is rejected with paths and changes nothing', () => {
    const c = demo();
    const r = c.apply({ type: 'inject-fault', fault: { id: 'bad', kind: 'slow-actuator', device: 'part', factor: 2 } });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]).toMatchObject({ code: 'wrong_device_type', path: ['device'] });
    const r2 = c.apply({ type: 'inject-fault', fault: { id: 'bad', kind: 'open-wire', row: 'nope', when: { signal: 'nosuch.thing', op: '==', value: 1 } } });
    expect(r2.ok).toBe(false);
    if (!r2.ok) expect(r2.errors.map((e) => e.code).sort()).toEqual(['unknown_row', 'unknown_signal']);
    expect(c.snapshot().faults).toEqual([]);
    expect(c.eventLog()).toEqual([]);
  });
});
