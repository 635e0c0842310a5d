import { describe, expect, it } from 'vitest';
import { createCell } from './cell';
import { pickAndPlaceCell } from '@/simulator/demo/pick-and-place';
import { starterCell } from '@/simulator/demo/starter';
import type { CellSnapshot } from './snapshot';

function demo() {
  const r = createCell(pickAndPlaceCell);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

describe('cell API', () => {
  it('snapshots are plain serialisable data (a Web Worker can post them)', () => {
    const c = demo();
    c.advance(2500);
    c.apply({ type: 'force', target: '%IX0.5', value: 1 });
    c.apply({ type: 'inject-fault', fault: { id: 'f', kind: 'open-wire', row: 'w-guard' } });
    c.advance(100);
    const s = c.snapshot();
    expect(JSON.parse(JSON.stringify(s))).toEqual(s);
    expect(structuredClone(s)).toEqual(s);
    expect(s.plc.addresses['%IX0.5']).toEqual({ value: 1, forced: true });
    expect(s.forces).toEqual({ '%IX0.5': 1 });
    expect(s.wires).toHaveLength(pickAndPlaceCell.wiring.length);
    expect(s.plc.blockOutputs.startPermit).toBeDefined();
  });

  it('rejects bad events and bad times with typed errors and changes nothing', () => {
    const c = demo();
    c.advance(100);
    const before = JSON.stringify(c.snapshot());
    const bad: unknown[] = [
      null,
      { type: 'press' },
      { type: 'press', device: 'ghost' },
      { type: 'set-selector', device: 'start', position: 1 },
      { type: 'set-selector', device: 'recipe', position: 3 },
      { type: 'set-analog', device: 'recipe', value: 3 },
      { type: 'force', target: '%IX99999.0', value: 1 },
      { type: 'force', target: 'XX1', value: 1 },
      { type: 'unforce', target: '%IX0.0' },
      { type: 'clear-fault', id: 'none' },
      { type: 'stage-point-map', rows: [{ id: 'x' }] },
    ];
    for (const e of bad) {
      const r = c.apply(e);
      expect(r.ok, JSON.stringify(e)).toBe(false);
      if (!r.ok) for (const p of r.errors) expect(typeof p.code).toBe('string');
    }
    for (const ms of [-1, 0.5, Number.NaN, Infinity, '10' as unknown as number, 10 ** 12]) {
      const r = c.advance(ms);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(['negative_time', 'invalid_time', 'time_range']).toContain(r.errors[0].code);
    }
    expect(JSON.stringify(c.snapshot())).toBe(before);
    expect(c.eventLog()).toEqual([]);
  });

  it('subscribe gets a snapshot after each advance and apply; dispose stops everything', () => {
    const c = demo();
    const seen: CellSnapshot[] = [];
    const off = c.subscribe((s) => seen.push(s));
    c.advance(50);
    c.apply({ type: 'press', device: 'start' });
    expect(seen.map((s) => s.timeMs)).toEqual([50, 50]);
    off();
    c.advance(10);
    expect(seen).toHaveLength(2);
    c.dispose();
    expect(c.advance(10).ok).toBe(false);
    expect(c.apply({ type: 'release', device: 'start' }).ok).toBe(false);
  });

  it('controller point forces override the routine and are marked', () => {
    const c = demo();
    c.advance(2000);
    expect(c.apply({ type: 'force', target: 'TO1', value: 1 }).ok).toBe(true);
    c.advance(400); // gripper travel 300 ms
    const s = c.snapshot();
    expect(s.controller.points.find((p) => p.ref === 'TO1')).toMatchObject({ value: 1, forced: true });
    expect(s.devices.find((d) => d.id === 'gripper')?.feedback).toEqual({ closed: true, open: false });
    expect(s.controller.points.find((p) => p.ref === 'TI1')?.value).toBe(1);
  });

  it('an invalid option is rejected with its path', () => {
    const r = createCell(starterCell, { trace: ['time', 'nope.nope'], faults: [{ id: 'x', kind: 'link-loss', at: -3 }] });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      const paths = r.errors.map((e) => e.path.join('.'));
      expect(paths).toEqual(expect.arrayContaining(['options.trace.1', 'options.faults.0.at']));
    }
  });

  it('the starter exercise seals in and drops out on stop', () => {
    const r = createCell(starterCell);
    if (!r.ok) throw new Error('cell');
    const c = r.value;
    const lamp = () => c.snapshot().devices.find((d) => d.id === 'running')?.lamps?.[0];
    c.apply({ type: 'press', device: 'start' });
    c.advance(30);
    c.apply({ type: 'release', device: 'start' });
    c.advance(30);
    expect(lamp()).toBe(true);
    c.apply({ type: 'press', device: 'stop' });
    c.advance(30);
    c.apply({ type: 'release', device: 'stop' });
    c.advance(30);
    expect(lamp()).toBe(false);
  });
});
