import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { validateCellDocument } from './validate';
import { createCell } from '@/simulator/cell/cell';
import { pickAndPlaceCell } from '@/simulator/demo/pick-and-place';
import { starterCell } from '@/simulator/demo/starter';

type Doc = Record<string, unknown> & typeof pickAndPlaceCell;
const copy = (): Doc => structuredClone(pickAndPlaceCell) as Doc;

function problemsOf(input: unknown) {
  const r = validateCellDocument(input);
  if (r.ok) throw new Error('expected problems');
  return r.errors;
}

describe('the demo documents are valid', () => {
  it('pick and place and starter validate', () => {
    expect(validateCellDocument(pickAndPlaceCell).ok).toBe(true);
    expect(validateCellDocument(starterCell).ok).toBe(true);
  });
});

describe('bad input gives a typed error listing every problem with its path', () => {
  it('not an object at all', () => {
    for (const bad of [null, 42, 'cell', [], undefined]) {
      const p = problemsOf(bad);
      expect(p.length).toBeGreaterThan(0);
      expect(p[0]).toHaveProperty('path');
    }
  });

  it('several shape problems are all reported', () => {
    const d = copy();
    (d as Record<string, unknown>).schemaVersion = 99;
    (d.panel[0] as Record<string, unknown>).colour = 'purple';
    (d.controller as Record<string, unknown>).bootMs = -5; // a negative time
    const p = problemsOf(d);
    const paths = p.map((x) => x.path.join('.'));
    expect(paths).toEqual(expect.arrayContaining(['schemaVersion', 'panel.0.colour', 'controller.bootMs']));
    expect(p.find((x) => x.path.join('.') === 'controller.bootMs')?.code).toBe('negative_value');
  });

  it('unknown block type and dangling connection in the logic sheet', () => {
    const d = copy();
    (d.plc.sheet.blocks as unknown[]).push({ id: 'weird', type: 'FLUX_CAPACITOR', position: { x: 0, y: 0 }, params: {} });
    const p1 = problemsOf(d);
    expect(p1).toContainEqual(expect.objectContaining({ code: 'unknown_block_type' }));
    expect(p1.find((x) => x.code === 'unknown_block_type')?.path.slice(0, 4)).toEqual(['plc', 'sheet', 'blocks', d.plc.sheet.blocks.length - 1]);

    const d2 = copy();
    (d2.plc.sheet.connections as unknown[]).push({ id: 'dangle', from: { block: 'ghost', port: 'Q' }, to: { block: 'robotStart', port: 'IN' } });
    const p2 = problemsOf(d2);
    expect(p2.some((x) => x.path[0] === 'plc' && x.path[1] === 'sheet' && x.path[2] === 'connections')).toBe(true);
  });

  it('dangling wiring, wrong direction, unknown terminal, duplicate destination, address on no module', () => {
    const d = copy();
    const w = d.wiring as unknown[];
    w.push({ id: 'x1', from: { device: 'ghost', terminal: 'contact' }, to: { plc: '%IX0.7' } });
    w.push({ id: 'x2', from: { plc: '%IX0.0' }, to: { device: 'readyLamp', terminal: 'lamp' } });
    w.push({ id: 'x3', from: { device: 'start', terminal: 'coil' }, to: { plc: '%IX1.7' } });
    w.push({ id: 'x4', from: { device: 'reset', terminal: 'contact' }, to: { plc: '%IX0.0' } });
    w.push({ id: 'x5', from: { device: 'reset', terminal: 'contact' }, to: { plc: '%IX9.0' } });
    const p = problemsOf(d);
    const byCode = (c: string) => p.filter((x) => x.code === c).map((x) => x.path.join('.'));
    expect(byCode('unknown_device')).toContain(`wiring.${w.length - 5}.from.device`);
    expect(byCode('wrong_direction')).toContain(`wiring.${w.length - 4}`);
    expect(byCode('unknown_terminal')).toContain(`wiring.${w.length - 3}.from.terminal`);
    expect(byCode('duplicate_destination')).toContain(`wiring.${w.length - 2}.to`);
    expect(byCode('address_not_on_module')).toContain(`wiring.${w.length - 1}.to.plc`);
  });

  it('routine and point-map cross-references', () => {
    const d = copy();
    (d.controller.routine as unknown[]).push({ kind: 'move', pose: 'nowhere' }, { kind: 'jump', to: 'noLabel' }, { kind: 'set', point: 'DO12', value: 1 }, { kind: 'set', point: 'DI1', value: 1 });
    const p = problemsOf(d);
    const codes = p.map((x) => x.code);
    expect(codes).toEqual(expect.arrayContaining(['unknown_pose', 'unknown_step', 'unmapped_point', 'writes_input']));
  });

  it('oversized documents are rejected by the limits, not processed', () => {
    const d = copy();
    (d as Record<string, unknown>).wiring = Array.from({ length: 2001 }, (_, i) => ({ id: `w${i}`, from: { plc: '%QX0.0' }, to: { device: 'readyLamp', terminal: 'lamp' } }));
    const p = problemsOf(d);
    expect(p).toContainEqual(expect.objectContaining({ path: ['wiring'], code: 'too_large' }));
  });

  it('createCell on a bad document returns the problems and no cell', () => {
    const d = copy();
    (d.controller as Record<string, unknown>).homePose = 'attic';
    const r = createCell(d);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors).toContainEqual(expect.objectContaining({ path: ['controller', 'homePose'], code: 'unknown_pose' }));
  });
});

describe('property: the schema rejects malformed documents with paths, never throwing', () => {
  // Corrupt one leaf of the demo document at a random path and check the result.
  const leaves: (string | number)[][] = [];
  const walk = (v: unknown, path: (string | number)[]) => {
    if (v && typeof v === 'object') {
      for (const [k, x] of Object.entries(v)) walk(x, [...path, Array.isArray(v) ? Number(k) : k]);
    } else leaves.push(path);
  };
  walk(pickAndPlaceCell, []);

  it('replacing a leaf by a value of the wrong type yields a problem at (or under) that path', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: leaves.length - 1 }), fc.constantFrom<unknown>({ nested: true }, [1, 2], Symbol.for('x').description, -1e308, NaN), (i, junk) => {
        const path = leaves[i];
        const d = structuredClone(pickAndPlaceCell) as unknown as Record<string, unknown>;
        let at: Record<string | number, unknown> = d;
        for (const k of path.slice(0, -1)) at = at[k] as Record<string | number, unknown>;
        const original = at[path[path.length - 1]];
        if (typeof junk === typeof original && typeof junk !== 'number') return; // not a corruption
        at[path[path.length - 1]] = junk;
        let r: ReturnType<typeof validateCellDocument> | undefined;
        expect(() => (r = validateCellDocument(d))).not.toThrow();
        if (r && !r.ok) {
          for (const e of r.errors) expect(Array.isArray(e.path)).toBe(true);
        }
        // A wrong-typed leaf must be reported somewhere along its own path (numbers may stay valid).
        if (typeof original !== typeof junk || Number.isNaN(junk as number)) {
          expect(r!.ok).toBe(false);
          if (!r!.ok) {
            const hit = r!.errors.some((e) => e.path.length > 0 && path.slice(0, e.path.length).join('.') === e.path.join('.'));
            expect(hit).toBe(true);
          }
        }
      }),
      { numRuns: 200 },
    );
  });
});

describe('staged rows must keep the points in use mapped', () => {
  it('refuses a staged edit that unmaps a routine point', async () => {
    const { validateStagedRows } = await import('./validate');
    const v = validateCellDocument(pickAndPlaceCell);
    if (!v.ok) throw new Error('demo');
    const rows = v.value.document.controller.pointMap.filter((r) => r.id !== 'pm-ti');
    const r = validateStagedRows(v.value.document, rows);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.filter((e) => e.code === 'unmapped_point').map((e) => e.path.join('.'))).toContain('controller.routine.4.condition.point');
  });
});

describe('one pass reports shape and cross-reference problems together', () => {
  it('a bad colour on the panel does not hide a routine moving to an unknown pose', () => {
    const d = copy();
    (d.panel[0] as Record<string, unknown>).colour = 'purple';
    (d.controller.routine as unknown[]).push({ kind: 'move', pose: 'nowhere' });
    const p = problemsOf(d);
    expect(p.map((x) => x.code)).toEqual(expect.arrayContaining(['invalid_value', 'unknown_pose']));
    expect(p.find((x) => x.code === 'unknown_pose')?.path).toEqual(['controller', 'routine', d.controller.routine.length - 1, 'pose']);
  });
});
