import { describe, expect, it } from 'vitest';
import { validateSheet } from '@/simulator';
import {
  addBlock,
  checkConnection,
  connect,
  formatLiveValue,
  indexSheetProblems,
  moveBlocks,
  paletteGroups,
  removeElements,
  setBlockParam,
  setBlockType,
  swappableTypes,
  type Sheet,
} from './sheet-graph';

const at = { x: 0, y: 0 };
const base = (): Sheet => ({
  scanPeriodMs: 10,
  blocks: [
    { id: 'a', type: 'NO_CONTACT', position: at, params: { address: '%IX0.0' } },
    { id: 'and', type: 'AND', position: at, params: { inputs: 3 } },
    { id: 'k', type: 'CONST', position: at, params: { value: 5 } },
    { id: 'q', type: 'COIL', position: at, params: { address: '%QX0.0' } },
  ],
  connections: [
    { id: 'c1', from: { block: 'a', port: 'Q' }, to: { block: 'and', port: 'IN1' } },
    { id: 'c2', from: { block: 'and', port: 'Q' }, to: { block: 'q', port: 'IN' } },
  ],
});

describe('checkConnection', () => {
  it('refuses NUM into BOOL with the types named (IEC 61131-3: BOOL is not a numeric type; engine rule portTypesCompatible)', () => {
    const r = checkConnection(base(), { source: 'k', sourcePort: 'OUT', target: 'and', targetPort: 'IN2' });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/NUM output k\.OUT to BOOL input and\.IN2/);
  });
  it('accepts BOOL into a free BOOL input', () => {
    expect(checkConnection(base(), { source: 'a', sourcePort: 'Q', target: 'and', targetPort: 'IN2' })).toEqual({ ok: true });
  });
  it('refuses a second driver on one input', () => {
    const r = checkConnection(base(), { source: 'a', sourcePort: 'Q', target: 'q', targetPort: 'IN' });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/already driven by and\.Q/);
  });
  it('refuses an unknown port', () => {
    expect(checkConnection(base(), { source: 'a', sourcePort: 'Q', target: 'and', targetPort: 'IN9' }).ok).toBe(false);
  });
});

describe('sheet edits', () => {
  it('adds a block with catalogue defaults and a fresh id that validates', () => {
    const { sheet, id } = addBlock(base(), 'TON', { x: 10.4, y: 20.6 });
    const b = sheet.blocks.find((x) => x.id === id);
    expect(id).toBe('ton1');
    expect(b?.params).toEqual({ PT: 1000 });
    expect(b?.position).toEqual({ x: 10, y: 21 });
    expect(validateSheet(sheet).ok).toBe(true);
  });
  it('removing a block removes its wires', () => {
    const s = removeElements(base(), ['and']);
    expect(s.blocks.map((b) => b.id)).toEqual(['a', 'k', 'q']);
    expect(s.connections).toEqual([]);
  });
  it('shrinking a variadic block drops wires into inputs that no longer exist', () => {
    let s = connect(base(), { source: 'a', sourcePort: 'Q', target: 'and', targetPort: 'IN3' }).sheet;
    s = setBlockParam(s, 'and', 'inputs', 2);
    expect(s.connections.map((c) => c.to.port)).toEqual(['IN1', 'IN']);
    expect(validateSheet(s).ok).toBe(true);
  });
  it('moves blocks and rounds positions', () => {
    const s = moveBlocks(base(), new Map([['k', { x: 1.6, y: -2.2 }]]));
    expect(s.blocks.find((b) => b.id === 'k')?.position).toEqual({ x: 2, y: -2 });
  });
  it('swaps a contact NO ↔ NC keeping its address, and offers only same-port types', () => {
    expect(swappableTypes('NO_CONTACT')).toEqual(['NO_CONTACT', 'NC_CONTACT']);
    expect(swappableTypes('GT')).toEqual(['GT', 'GE', 'EQ', 'NE', 'LE', 'LT']);
    expect(swappableTypes('SR')).toEqual(['SR']);
    const s = setBlockType(base(), 'a', 'NC_CONTACT');
    expect(s.blocks[0]).toMatchObject({ type: 'NC_CONTACT', params: { address: '%IX0.0' } });
  });
  it('palette covers every catalogue block type once', () => {
    const all = paletteGroups().flatMap((g) => g.types);
    expect(all.length).toBe(new Set(all).size);
    expect(all).toContain('TON');
    expect(all).toContain('PREV_NUM');
  });
});

describe('indexSheetProblems', () => {
  it('puts a block parameter problem on that block', () => {
    const s = base();
    (s.blocks[0].params as { address: string }).address = '%IX0.9';
    const r = validateSheet(s);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const idx = indexSheetProblems(s, r.errors);
    expect(idx.byBlock.get('a')?.length).toBeGreaterThan(0);
    expect(idx.byBlock.has('q')).toBe(false);
  });
  it('marks every block and wire of an algebraic loop (engine validate.ts loop rule)', () => {
    const s: Sheet = {
      scanPeriodMs: 10,
      blocks: [
        { id: 'x', type: 'AND', position: at, params: { inputs: 2 } },
        { id: 'y', type: 'NOT', position: at, params: {} },
        { id: 'z', type: 'COIL', position: at, params: { address: '%QX0.0' } },
      ],
      connections: [
        { id: 'l1', from: { block: 'x', port: 'Q' }, to: { block: 'y', port: 'IN' } },
        { id: 'l2', from: { block: 'y', port: 'Q' }, to: { block: 'x', port: 'IN1' } },
        { id: 'out', from: { block: 'x', port: 'Q' }, to: { block: 'z', port: 'IN' } },
      ],
    };
    const r = validateSheet(s);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const idx = indexSheetProblems(s, r.errors);
    expect([...idx.loopBlocks].sort()).toEqual(['x', 'y']);
    expect([...idx.loopConnections].sort()).toEqual(['l1', 'l2']);
    expect(idx.byBlock.has('z')).toBe(false);
  });
  it('strips a document prefix and shows a connection problem on both end blocks', () => {
    const s = base();
    const idx = indexSheetProblems(s, [{ path: ['plc', 'sheet', 'connections', 1], code: 'type_mismatch', message: 'bad wire' }], ['plc', 'sheet']);
    expect(idx.byConnection.get('c2')?.[0].message).toBe('bad wire');
    expect(idx.byBlock.get('and')?.[0].message).toBe('bad wire');
    expect(idx.byBlock.get('q')?.[0].message).toBe('bad wire');
  });
  it('keeps sheet-level problems apart', () => {
    const idx = indexSheetProblems(base(), [{ path: ['scanPeriodMs'], code: 'invalid_scan_period', message: 'scan' }]);
    expect(idx.sheet).toHaveLength(1);
  });
});

describe('formatLiveValue', () => {
  it('writes BOOLs as IEC 61131-3 literals TRUE/FALSE and numbers compactly', () => {
    expect(formatLiveValue(true)).toBe('TRUE');
    expect(formatLiveValue(false)).toBe('FALSE');
    expect(formatLiveValue(42)).toBe('42');
    expect(formatLiveValue(1 / 3)).toBe('0.33333');
    expect(formatLiveValue(undefined)).toBe('');
  });
});
