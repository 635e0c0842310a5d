import { describe, expect, it } from 'vitest';
import { cellDocumentSchema, pickAndPlaceCell, type CellDocument } from '@/simulator';
import { registerMap, registerMapCsv, tablesOf } from './register-map';

const demo = (): CellDocument => cellDocumentSchema.parse(structuredClone(pickAndPlaceCell));

describe('register map', () => {
  it('orders each table by byte then bit, offsets from 0 with no gaps', () => {
    const rows = registerMap(demo());
    const t = tablesOf(rows);
    expect(t.coil.slice(0, 3)).toEqual(['%QX0.0', '%QX0.1', '%QX0.2']);
    expect(t.coil[8]).toBe('%QX1.0');
    expect(t['discrete-input'][8]).toBe('%IX1.0');
    expect(t['holding-register']).toEqual(['%QW2']);
    expect(t['input-register']).toEqual([]);
    for (const table of Object.values(t)) expect(table.every((a) => typeof a === 'string')).toBe(true);
  });

  it('a word in the map carries the bits it overlaps (%QW2 = bytes 2–3, so no %QX2.x coils)', () => {
    expect(registerMap(demo()).some((r) => r.address.startsWith('%QX2.'))).toBe(false);
  });

  it('analog inputs are input registers, channel k at %IW<address + 2k>', () => {
    const doc = demo();
    doc.plc.modules.push({ id: 'plc-ai', kind: 'analog-in', address: 10, channels: 2, signal: '4-20mA', resolutionBits: 12 } as CellDocument['plc']['modules'][number]);
    const rows = registerMap(doc).filter((r) => r.table === 'input-register');
    expect(rows.map((r) => [r.offset, r.address, r.direction])).toEqual([
      [0, '%IW10', 'plc-reads'],
      [1, '%IW12', 'plc-reads'],
    ]);
  });

  it('CSV: the columns, CRLF lines, and formula-looking labels neutralised', () => {
    const doc = demo();
    const start = doc.panel.find((d) => d.id === 'start')!;
    start.label = '=HYPERLINK("x")';
    const csv = registerMapCsv(registerMap(doc));
    const lines = csv.split('\r\n');
    expect(lines[0]).toBe('table,offset,address,label,direction');
    const row = lines.find((l) => l.startsWith('discrete-input,0,'))!;
    expect(row).toBe(`discrete-input,0,%IX0.0,"'=HYPERLINK(""x"") (contact); sheet startPB",plc-reads`);
  });
});
