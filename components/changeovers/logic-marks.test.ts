import { describe, expect, it } from 'vitest';
import { cellDocumentSchema, diffCells, pickAndPlaceCell } from '@/simulator';
import { demoChangeoverProposal } from '@/db/seeds/demo-changeovers';
import { logicMarks } from './logic-marks';

describe('marks on the changeover canvas', () => {
  it('marks the demo proposal: new blocks and wires, the changed OR and the re-pointed wire on both sheets', () => {
    const base = cellDocumentSchema.parse(structuredClone(pickAndPlaceCell));
    const m = logicMarks(diffCells(base, demoChangeoverProposal(base)).areas.logic);
    expect(Object.fromEntries(m.proposed.blocks)).toEqual({ guardsClosed: 'new', rearGuardOk: 'new', rearGuardOpen: 'new', yellowNeeded: 'changed' });
    expect(Object.fromEntries(m.proposed.connections)).toEqual({ c6: 'changed', c6g1: 'new', c6g2: 'new', c17b: 'new' });
    expect(Object.fromEntries(m.base.blocks)).toEqual({ yellowNeeded: 'changed' });
    expect(Object.fromEntries(m.base.connections)).toEqual({ c6: 'changed' });
  });

  it('puts removed things on the base sheet only, and layout moves on the proposal only', () => {
    const base = cellDocumentSchema.parse(structuredClone(pickAndPlaceCell));
    const proposed = structuredClone(base);
    proposed.plc.sheet.blocks = proposed.plc.sheet.blocks.filter((b) => b.id !== 'readyLampCoil');
    proposed.plc.sheet.connections = proposed.plc.sheet.connections.filter((c) => c.id !== 'c21');
    proposed.plc.sheet.blocks.find((b) => b.id === 'recipeWord')!.position = { x: 700, y: 1000 };
    const m = logicMarks(diffCells(base, proposed).areas.logic);
    expect(m.base.blocks.get('readyLampCoil')).toBe('removed');
    expect(m.base.connections.get('c21')).toBe('removed');
    expect(m.proposed.blocks.has('readyLampCoil')).toBe(false);
    expect(m.proposed.blocks.get('recipeWord')).toBe('moved');
    expect(m.base.blocks.has('recipeWord')).toBe(false);
  });
});
