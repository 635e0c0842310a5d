import { describe, expect, it } from 'vitest';
import { cellDocumentSchema, diffCells, pickAndPlaceCell } from '@/simulator';
import { demoChangeoverProposal } from '@/db/seeds/demo-changeovers';
import { kindLabel, sideLines } from './diff-format';

const base = cellDocumentSchema.parse(structuredClone(pickAndPlaceCell));
const diff = diffCells(base, demoChangeoverProposal(base));
const entry = (area: keyof typeof diff.areas, id: string) => diff.areas[area].find((e) => e.id === id)!;

describe('changeover diff wording', () => {
  it('shows a re-terminated wire as its old and new terminal', () => {
    const e = entry('wiring', 'l-guard');
    expect(kindLabel(e)).toBe('re-terminated');
    expect(sideLines(e, 'base')).toEqual(['to: rack 1 / slot 2 / ch 3']);
    expect(sideLines(e, 'proposed')).toEqual(['to: rack 1 / slot 6 / ch 3']);
  });

  it('shows an added device only on the proposed side', () => {
    const e = entry('devices', 'rearGuard');
    expect(sideLines(e, 'base')).toEqual([]);
    expect(sideLines(e, 'proposed')).toEqual(['guard-switch “Rear guard door” (NC)']);
  });

  it('shows an added setting by its field, not as an empty thing', () => {
    const e = entry('cell', 'initial.devices.rearGuard.guardClosed');
    expect(sideLines(e, 'base')).toEqual([]);
    expect(sideLines(e, 'proposed')).toEqual(['initial devices rearGuard guardClosed: yes']);
  });

  it('shows a changed parameter and a re-pointed wire field by field', () => {
    expect(sideLines(entry('logic', 'yellowNeeded'), 'base')).toEqual(['inputs: 2']);
    expect(sideLines(entry('logic', 'yellowNeeded'), 'proposed')).toEqual(['inputs: 3']);
    expect(sideLines(entry('logic', 'c6'), 'proposed')).toEqual(['from: guardsClosed.Q']);
    expect(sideLines(entry('pointMap', 'pm-di'), 'proposed')).toEqual(['slot: 6']);
  });
});
