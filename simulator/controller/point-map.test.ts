import { describe, expect, it } from 'vitest';
import type { ControllerModule, PointMapRow } from '@/simulator/schema/cell-document';
import { resolvePhysical, resolvePointMap, restartPointMap, stagePointMap, validatePointMap } from './point-map';

const modules: ControllerModule[] = [
  { id: 'di', rack: 0, slot: 1, type: 'digital-in', channels: 16 },
  { id: 'do', rack: 0, slot: 2, type: 'digital-out', channels: 8 },
];
const rows: PointMapRow[] = [
  { id: 'a', family: 'DI', first: 1, count: 8, rack: 0, slot: 1, firstChannel: 0, points: [{ label: 'Start' }, { label: 'Stop', invert: true }] },
  { id: 'b', family: 'WI', first: 1, count: 1, rack: 0, slot: 1, firstChannel: 8, bits: 4 },
];

describe('point map resolution', () => {
  it('logical points count from 1, physical channels from 0 (DESIGN.md)', () => {
    const map = resolvePointMap(rows);
    // DI1 is channel 0, DI8 channel 7: first logical point + k ↔ first channel + k (common practice)
    expect((map.byRef.get('DI1') ?? null)).toMatchObject({ rack: 0, slot: 1, channel: 0, label: 'Start' });
    expect((map.byRef.get('DI2') ?? null)).toMatchObject({ channel: 1, invert: true });
    expect((map.byRef.get('DI8') ?? null)).toMatchObject({ channel: 7 });
    expect((map.byRef.get('DI9') ?? null)).toBeNull();
    expect((map.byRef.get('WI1') ?? null)).toMatchObject({ channel: 8, bits: 4 });
    expect(resolvePhysical(map, 0, 1, 10)).toEqual(['WI1']);
    expect(resolvePhysical(map, 0, 1, 3)).toEqual(['DI4']);
  });
});

describe('point map validation names the rows involved', () => {
  it('overlapping points and channels', () => {
    const bad: PointMapRow[] = [...rows, { id: 'c', family: 'DI', first: 5, count: 2, rack: 0, slot: 1, firstChannel: 12 }];
    const p = validatePointMap(bad, modules, [], ['pm']);
    expect(p).toContainEqual(expect.objectContaining({ code: 'point_overlap', related: ['a', 'c'], path: ['pm', 2, 'first'] }));
  });
  it('shared channels', () => {
    const bad: PointMapRow[] = [...rows, { id: 'c', family: 'DI', first: 20, count: 2, rack: 0, slot: 1, firstChannel: 7 }];
    const p = validatePointMap(bad, modules, []);
    expect(p.map((x) => x.code)).toContain('channel_overlap');
    expect(p.find((x) => x.code === 'channel_overlap')?.related).toEqual(expect.arrayContaining(['c']));
  });
  it('beyond capacity, wrong module type, missing module, unmapped used point', () => {
    const bad: PointMapRow[] = [
      { id: 'big', family: 'DO', first: 1, count: 9, rack: 0, slot: 2, firstChannel: 0 },
      { id: 'wrong', family: 'AI', first: 1, count: 1, rack: 0, slot: 1, firstChannel: 15 },
      { id: 'nowhere', family: 'DI', first: 1, count: 1, rack: 3, slot: 3, firstChannel: 0 },
    ];
    const p = validatePointMap(bad, modules, [{ ref: 'DO12', path: ['routine', 4, 'point'] }]);
    const codes = p.map((x) => x.code);
    expect(codes).toEqual(expect.arrayContaining(['beyond_capacity', 'family_module_mismatch', 'no_module', 'unmapped_point']));
    expect(p.find((x) => x.code === 'beyond_capacity')?.related).toEqual(['big', 'do']);
    expect(p.find((x) => x.code === 'unmapped_point')?.path).toEqual(['routine', 4, 'point']);
  });
  it('a valid map has no problems', () => {
    expect(validatePointMap(rows, modules, [{ ref: 'DI3', path: [] }])).toEqual([]);
  });
});

describe('staging is pure and waits for a restart', () => {
  it('stage keeps the live map; restart applies; restart with nothing staged is a no-op', () => {
    const edited: PointMapRow[] = [{ ...rows[0], firstChannel: 4, count: 4 }];
    const s0 = { live: rows, staged: null };
    const s1 = stagePointMap(s0, edited);
    expect(s1.live).toBe(rows);
    expect(s1.staged).toBe(edited);
    expect(s0.staged).toBeNull(); // the input state is not mutated
    const s2 = restartPointMap(s1);
    expect(s2).toEqual({ live: edited, staged: null });
    expect(restartPointMap(s2)).toBe(s2);
  });
});
