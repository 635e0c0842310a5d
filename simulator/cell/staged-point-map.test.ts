import { describe, expect, it } from 'vitest';
import { createCell } from './cell';
import { pickAndPlaceCell } from '@/simulator/demo/pick-and-place';

describe('a staged point-map edit changes nothing until the controller restarts', () => {
  it('moves DI6 (part present) to another channel only after restart', () => {
    const r = createCell(pickAndPlaceCell);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const c = r.value;
    expect(c.advance(2000).ok).toBe(true);
    expect(c.apply({ type: 'set-field', device: 'part', active: true }).ok).toBe(true);
    expect(c.advance(40).ok).toBe(true);
    const before = c.snapshot();
    expect(before.controller.points.find((p) => p.ref === 'DI6')).toMatchObject({ channel: 5, value: 1 });

    // The edit: DI1..DI6 now start at channel 1 (an off-by-one a student might make).
    const edited = before.controller.pointMap.map((row) => (row.id === 'pm-di' ? { ...row, firstChannel: 1 } : row));
    const staged = c.apply({ type: 'stage-point-map', rows: edited });
    expect(staged.ok).toBe(true);
    expect(c.advance(200).ok).toBe(true);
    const waiting = c.snapshot();
    expect(waiting.controller.staged).toEqual(edited);
    expect(waiting.controller.pointMap).toEqual(before.controller.pointMap);
    expect(waiting.controller.points).toEqual(before.controller.points);
    expect(waiting.controller.state).toBe('ready');

    expect(c.apply({ type: 'restart-controller' }).ok).toBe(true);
    expect(c.advance(2000).ok).toBe(true);
    const after = c.snapshot();
    expect(after.controller.staged).toBeNull();
    expect(after.controller.pointMap).toEqual(edited);
    // DI6 now reads channel 6, which nothing drives; DI5 reads channel 5 (the part sensor).
    expect(after.controller.points.find((p) => p.ref === 'DI6')).toMatchObject({ channel: 6, value: 0 });
    expect(after.controller.points.find((p) => p.ref === 'DI5')).toMatchObject({ channel: 5, value: 1 });
  });

  it('a staged edit that breaks the map is rejected with row paths and leaves nothing staged', () => {
    const r = createCell(pickAndPlaceCell);
    if (!r.ok) throw new Error('cell');
    const c = r.value;
    const rows = c.snapshot().controller.pointMap.map((row) => (row.id === 'pm-do' ? { ...row, count: 20 } : row));
    const res = c.apply({ type: 'stage-point-map', rows });
    expect(res.ok).toBe(false);
    if (!res.ok) expect(res.errors).toContainEqual(expect.objectContaining({ code: 'beyond_capacity', path: ['rows', 2, 'count'] }));
    expect(c.snapshot().controller.staged).toBeNull();
  });
});
