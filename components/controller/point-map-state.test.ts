import { describe, expect, it } from 'vitest';
import type { ControllerModule, PointMapRow } from '@/simulator';
import { canApplyStaged, newRangeAt, pointMapView, rowChannels, rowConflicts } from './point-map-state';
import { moveStep, defaultStep } from './routine-steps';
import { armGeometry } from './arm-geometry';

const modules: ControllerModule[] = [
  { id: 'di', rack: 0, slot: 1, type: 'digital-in', channels: 16 },
  { id: 'do', rack: 0, slot: 2, type: 'digital-out', channels: 16 },
];
const live: PointMapRow[] = [
  { id: 'r-di', family: 'DI', first: 1, count: 6, rack: 0, slot: 1, firstChannel: 0 },
  { id: 'r-wi', family: 'WI', first: 1, count: 1, rack: 0, slot: 1, firstChannel: 8, bits: 4, encoding: 'binary' },
  { id: 'r-do', family: 'DO', first: 1, count: 7, rack: 0, slot: 2, firstChannel: 0 },
];

describe('pointMapView', () => {
  it('shows every range in force when nothing is staged', () => {
    const v = pointMapView(live, null, modules);
    expect(v.map((x) => x.state)).toEqual(['in-force', 'in-force', 'in-force']);
    expect(v[1].explanation[0]).toBe('WI1 on rack 0 slot 1 channels 8–11, in force now');
    expect(canApplyStaged(v, null)).toBe(false);
  });
  it('marks a changed range as waiting for the reboot and says what changed', () => {
    const staged = live.map((r) => (r.id === 'r-do' ? { ...r, firstChannel: 8 } : r));
    const v = pointMapView(live, staged, modules);
    expect(v.map((x) => x.state)).toEqual(['in-force', 'in-force', 'waiting']);
    expect(v[2].explanation.join('; ')).toContain('first channel 0 → 8');
    expect(canApplyStaged(v, staged)).toBe(true);
  });
  it('explains a channel clash with the other range and the shared channels', () => {
    // DI range grown to 10 points covers channels 0–9; the WI range uses 8–11 → shared 8–9.
    const staged = live.map((r) => (r.id === 'r-di' ? { ...r, count: 10 } : r));
    const v = pointMapView(live, staged, modules);
    expect(v[0].state).toBe('clash');
    expect(v[0].explanation).toContain('shares channels 8–9 of rack 0 slot 1 with WI1');
    expect(v[1].explanation).toContain('shares channels 8–9 of rack 0 slot 1 with DI1–DI10');
    expect(canApplyStaged(v, staged)).toBe(false);
  });
  it('lists removed ranges as waiting removals and added ranges as new', () => {
    const staged = [live[0], live[1], { ...live[2], id: 'r-do2' }];
    const v = pointMapView(live, staged, modules);
    expect(v.find((x) => x.row.id === 'r-do2')?.change).toBe('added');
    expect(v.find((x) => x.row.id === 'r-do')).toMatchObject({ state: 'waiting', change: 'removed' });
  });
  it('reports a wrong module type and a row beyond the module', () => {
    const c = rowConflicts([{ id: 'x', family: 'DO', first: 1, count: 20, rack: 0, slot: 1, firstChannel: 0 }], modules);
    const words = c.get(0) ?? [];
    expect(words.some((w) => w.includes('digital out points need a digital-out module'))).toBe(true);
    expect(words.some((w) => w.includes('needs channels 0–19 but the module has channels 0–15'))).toBe(true);
  });
  it('starts a new range at the next free point and the first free channel of its slot', () => {
    // r-di uses channels 0–5 and r-wi 8–11 of rack 0 slot 1: channel 6 is the first free one; DI1–DI6 are taken.
    expect(newRangeAt(live, modules[0], 'DI', 'pm-1')).toEqual({ id: 'pm-1', family: 'DI', first: 7, count: 1, rack: 0, slot: 1, firstChannel: 6 });
    expect(newRangeAt(live, modules[0], 'WI', 'pm-2')).toMatchObject({ first: 2, bits: 8, encoding: 'binary' });
  });
  it('counts word rows as bits × points channels', () => {
    expect(rowChannels({ id: 'w', family: 'WO', first: 1, count: 2, rack: 0, slot: 2, firstChannel: 4, bits: 4 })).toEqual([4, 11]);
  });
});

describe('routine steps', () => {
  it('reordering keeps numeric jump targets on the same step', () => {
    const steps = [defaultStep('pause', { inputs: [], outputs: [], poses: [] }), defaultStep('alarm', { inputs: [], outputs: [], poses: [] }), { kind: 'jump' as const, to: 1 }];
    const moved = moveStep(steps, 1, 0);
    expect(moved.map((s) => s.kind)).toEqual(['alarm', 'pause', 'jump']);
    expect(moved[2]).toEqual({ kind: 'jump', to: 0 });
  });
});

describe('arm geometry', () => {
  it('places the tool at the requested point with two equal links (planar 2-link IK, common practice)', () => {
    const g = armGeometry([[0.5, 0.3]]);
    const { elbow, tool } = g.solve(0.5, 0.3);
    expect(tool).toEqual([0.5, 0.3]);
    expect(Math.hypot(elbow[0], elbow[1])).toBeCloseTo(g.link, 9);
    expect(Math.hypot(tool[0] - elbow[0], tool[1] - elbow[1])).toBeCloseTo(g.link, 9);
  });
});
