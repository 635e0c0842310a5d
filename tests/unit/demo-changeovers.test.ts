import { describe, expect, it } from 'vitest';
import { cellDocumentSchema, diffCells, ioChangeSheet, pickAndPlaceCell, validateCellDocument } from '@/simulator';
import { demoChangeoverProposal } from '@/db/seeds/demo-changeovers';

const base = () => cellDocumentSchema.parse(structuredClone(pickAndPlaceCell));

describe('the demo changeover proposal', () => {
  it('is a valid cell', () => {
    const r = validateCellDocument(demoChangeoverProposal(base()));
    expect(r.ok ? [] : r.errors).toEqual([]);
  });

  it('adds the rear guard door, ANDs it into the start permit, and moves the input card', () => {
    const d = diffCells(base(), demoChangeoverProposal(base()));
    const ids = (area: keyof typeof d.areas, kind: string) => d.areas[area].filter((e) => e.kind === kind).map((e) => e.id).sort();
    expect(ids('devices', 'added')).toEqual(['rearGuard']);
    expect(ids('logic', 'added')).toEqual(['c17b', 'c6g1', 'c6g2', 'guardsClosed', 'rearGuardOk', 'rearGuardOpen'].sort());
    expect(ids('logic', 'changed')).toEqual(['c6', 'yellowNeeded']);
    expect(ids('modules', 'changed')).toEqual(['ctl-di']);
    expect(ids('pointMap', 'changed')).toEqual(['pm-di', 'pm-wi']);
    expect(d.areas.wiring.filter((e) => e.kind === 'changed')).toHaveLength(7);
    expect(ids('wiring', 'added')).toEqual(['w-rear-guard']);
  });

  it('misses the rear door on the guard signal to the robot (the interlock the proof catches)', () => {
    const p = demoChangeoverProposal(base());
    const into = p.plc.sheet.connections.find((c) => c.to.block === 'robotGuard');
    expect(into?.from.block).toBe('guardPass');
    expect(p.plc.sheet.blocks.find((b) => b.id === 'guardPass')?.params).toEqual({ address: '%IX0.4' });
  });

  it('gives the electricians a change sheet with the moved card and the new input', () => {
    const b = base();
    const p = demoChangeoverProposal(b);
    const sheet = ioChangeSheet(diffCells(b, p), b, p);
    expect(sheet.rows.filter((r) => r.action === 'move' && r.point.startsWith('DI'))).toHaveLength(6);
    expect(sheet.rows.some((r) => r.action === 'add' && r.point === '%IX0.7')).toBe(true);
  });
});
