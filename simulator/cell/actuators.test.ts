import { describe, expect, it } from 'vitest';
import { createCell } from './cell';
import { starterCell } from '@/simulator/demo/starter';
import { replay } from '@/simulator/trace/replay';
import { pickAndPlaceCell } from '@/simulator/demo/pick-and-place';
import { createCell as make } from './cell';
import { hashTrace } from '@/simulator/trace/trace';

/** The starter cell plus a vacuum cup and a conveyor driven by PLC outputs, feedback to inputs. */
function rig(faults: unknown[] = []) {
  const doc = structuredClone(starterCell) as typeof starterCell & { field: unknown[]; wiring: unknown[] };
  doc.field.push({ id: 'cup', type: 'vacuum-cup', label: 'Cup', buildMs: 150, releaseMs: 80 }, { id: 'belt', type: 'conveyor', label: 'Belt', speed: 0.2 });
  doc.wiring.push(
    { id: 'w-valve', from: { plc: '%QX0.1' }, to: { device: 'cup', terminal: 'valve' } },
    { id: 'w-vac', from: { device: 'cup', terminal: 'switch' }, to: { plc: '%IX0.3' } },
    { id: 'w-run', from: { plc: '%QX0.2' }, to: { device: 'belt', terminal: 'run' } },
    { id: 'w-belt', from: { device: 'belt', terminal: 'running' }, to: { plc: '%IX0.4' } },
  );
  const r = createCell(doc, { faults, trace: ['plc.%IX0.3', 'plc.%IX0.4'] });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

describe('actuators with travel time and feedback', () => {
  it('a vacuum cup reports vacuum buildMs after the valve opens and drops releaseMs after it closes', () => {
    const c = rig();
    c.apply({ type: 'force', target: '%QX0.1', value: 1 });
    c.advance(300);
    c.apply({ type: 'unforce', target: '%QX0.1' });
    c.advance(300);
    const on = c.trace().samples.filter((s) => s[1] === 0);
    // Valve on at 0 ms; the switch is seen at the first scan at or after 150 ms (scan 10 ms).
    // Unforced at 300 ms (the valve output returns to 0 at once); the switch drops 80 ms later.
    expect(on.map((s) => [s[0], s[2]])).toEqual([
      [0, 0],
      [150, 1],
      [380, 0],
    ]);
  });

  it('a slow-actuator card stretches the conveyor run-up by its factor', () => {
    const normal = rig();
    normal.apply({ type: 'force', target: '%QX0.2', value: 1 });
    normal.advance(1000);
    const slow = rig([{ id: 's', kind: 'slow-actuator', device: 'belt', factor: 3 }]);
    slow.apply({ type: 'force', target: '%QX0.2', value: 1 });
    slow.advance(1000);
    const rise = (t: ReturnType<typeof normal.trace>) => t.samples.find((s) => s[1] === 1 && s[2] === 1)?.[0];
    expect(rise(normal.trace())).toBe(200); // conveyor run-up 200 ms (engine constant)
    expect(rise(slow.trace())).toBe(600); // three times as long
  });
});

describe('reading a cell never changes it', () => {
  it('taking a snapshot every millisecond gives the same trace hash as not looking', () => {
    const events = [
      { t: 2000, event: { type: 'set-field', device: 'part', active: true } },
      { t: 2100, event: { type: 'press', device: 'start' } },
      { t: 2160, event: { type: 'release', device: 'start' } },
    ];
    const signals = ['ctl.state', 'arm.0', 'arm.1', 'dev.gripper.closed', 'dev.gripper.open', 'plc.%IX1.4'];
    const quiet = replay(pickAndPlaceCell, events, { trace: signals, untilMs: 12_000 });
    if (!quiet.ok) throw new Error('replay');
    const r = make(pickAndPlaceCell, { trace: signals });
    if (!r.ok) throw new Error('cell');
    const c = r.value;
    let i = 0;
    while (c.timeMs < 12_000) {
      const next = events[i];
      if (next && next.t === c.timeMs) {
        c.apply(next.event);
        i++;
        continue;
      }
      c.snapshot();
      c.advance(1);
    }
    expect(hashTrace(c.trace())).toBe(quiet.value.hash);
  });
});
