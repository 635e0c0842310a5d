import { describe, expect, it } from 'vitest';
import type { Problem } from '@/simulator';
import { areaProblems, problemArea } from './problems';
import { demoDocument } from './test-helpers';

const p = (path: (string | number)[], message = 'x'): Problem => ({ path, code: 'test', message });

describe('areaProblems', () => {
  it('sends each engine problem to the area that edits its part of the document', () => {
    expect(problemArea(p(['panel', 2, 'colour']))).toBe('panel');
    expect(problemArea(p(['wiring', 3, 'to']))).toBe('field');
    expect(problemArea(p(['controller', 'pointMap', 0]))).toBe('controller');
    expect(problemArea(p(['plc', 'sheet', 'blocks', 1]))).toBe('logic');
    // A part no area edits lands beside the terminal strip.
    expect(problemArea(p(['supply']))).toBe('field');
  });

  it('splits errors and warnings by area; monitor and scope have none', () => {
    const input = { document: demoDocument(), problems: [p(['wiring', 0, 'to']), p(['controller', 'modules', 1])], warnings: [p(['panel', 0, 'colour'])] };
    expect(areaProblems('field', input).errors).toHaveLength(1);
    expect(areaProblems('controller', input).errors).toHaveLength(1);
    expect(areaProblems('panel', input)).toEqual({ errors: [], warnings: [p(['panel', 0, 'colour'])] });
    expect(areaProblems('monitor', input)).toEqual({ errors: [], warnings: [] });
  });

  it('checks the logic sheet from the document itself, with paths into the document', () => {
    const document = demoDocument();
    const block = document.plc.sheet.blocks[0];
    document.plc.sheet.connections.push({ id: 'bad', from: { block: 'nowhere', port: 'Q' }, to: { block: block.id, port: 'IN' } });
    const { errors } = areaProblems('logic', { document, problems: [], warnings: [] });
    expect(errors.length).toBeGreaterThan(0);
    expect(errors.every((e) => e.path[0] === 'plc' && e.path[1] === 'sheet')).toBe(true);
    // The demo sheet as shipped compiles.
    expect(areaProblems('logic', { document: demoDocument(), problems: [], warnings: [] }).errors).toEqual([]);
  });
});
