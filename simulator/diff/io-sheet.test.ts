import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { diffCells, ioChangeSheet, IO_CHANGE_COLUMNS, neutraliseCsvCell, type IoChangeRow } from './index';
import { changeoverProposal, INPUT_CARD_ROWS, parsedCell } from './test-helpers';

// Check values are the fixture's own edits (test-helpers.ts) and the demo's point map
// (simulator/demo/pick-and-place.ts): channels count from 0, logical points from 1 (DESIGN.md).

function sheetOf(edit?: (b: ReturnType<typeof parsedCell>) => void) {
  const a = parsedCell();
  const b = changeoverProposal(a);
  edit?.(b);
  return ioChangeSheet(diffCells(a, b), a, b);
}

const pick = (rows: IoChangeRow[], point: string) => rows.filter((r) => r.point === point);

describe('ioChangeSheet', () => {
  it('identical cells give no rows and a CSV with only the header', () => {
    const a = parsedCell();
    const s = ioChangeSheet(diffCells(a, parsedCell()), a, parsedCell());
    expect(s.rows).toEqual([]);
    expect(s.csv).toBe(`${IO_CHANGE_COLUMNS.map((c) => c.title).join(',')}\r\n`);
  });

  it('the moved input card: every point on it moves to slot 6, same channel; the new point is an add', () => {
    const { rows } = sheetOf();
    // pm-di: DI1..DI6 on rack 1 slot 2 from channel 0, so DIn on channel n-1.
    for (let n = 1; n <= 6; n++) {
      expect(pick(rows, `DI${n}`)).toEqual([
        expect.objectContaining({ action: 'move', was: `rack 1 / slot 2 / ch ${n - 1}`, now: `rack 1 / slot 6 / ch ${n - 1}`, map: 'live', source: 'pointMap:pm-di' }),
      ]);
    }
    expect(pick(rows, 'DI7')).toEqual([expect.objectContaining({ action: 'add', label: 'Guards closed', was: '', now: 'rack 1 / slot 6 / ch 6' })]);
    // pm-wi: one 4-bit word point from channel 8.
    expect(pick(rows, 'WI1')).toEqual([expect.objectContaining({ action: 'move', was: 'rack 1 / slot 2 / ch 8–11', now: 'rack 1 / slot 6 / ch 8–11' })]);
    expect(pick(rows, 'ctl-di')).toEqual([expect.objectContaining({ action: 'move', was: 'rack 1 / slot 2', now: 'rack 1 / slot 6', source: 'modules:ctl-di' })]);
  });

  it('wires: each moved end, each added wire with its address and label', () => {
    const { rows } = sheetOf();
    const wireRows = rows.filter((r) => r.wire !== '');
    expect(new Set(wireRows.filter((r) => r.action === 'move').map((r) => r.wire))).toEqual(new Set(INPUT_CARD_ROWS));
    expect(wireRows.find((r) => r.wire === 'l-guard')).toMatchObject({ point: '%QX0.3', label: 'Guard closed', was: 'to rack 1 / slot 2 / ch 3', now: 'to rack 1 / slot 6 / ch 3' });
    expect(wireRows.find((r) => r.wire === 'w-guard2')).toMatchObject({ action: 'add', point: '%IX0.7', label: 'Rear guard', now: 'guard2:contact → %IX0.7' });
    expect(wireRows.find((r) => r.wire === 'l-guards')).toMatchObject({ action: 'add', point: '%QX0.6', label: 'Guards closed' });
  });

  it('relabel and invert changes are their own rows', () => {
    const { rows } = sheetOf((b) => {
      const pm = b.controller.pointMap.find((r) => r.id === 'pm-do')!;
      pm.points = pm.points!.map((p, i) => (i === 0 ? { label: 'Robot ready' } : i === 6 ? { ...p, invert: true } : p));
    });
    expect(pick(rows, 'DO1')).toEqual([expect.objectContaining({ action: 'relabel', was: 'Ready', now: 'Robot ready' })]);
    expect(pick(rows, 'DO7')).toEqual([expect.objectContaining({ action: 'invert', was: 'not inverted', now: 'inverted' })]);
  });

  it('a staged edit gives rows marked staged (they take effect at the controller restart)', () => {
    const a = parsedCell();
    const b = parsedCell();
    const staged = structuredClone(b.controller.pointMap);
    staged.find((r) => r.id === 'pm-to')!.firstChannel = 1;
    b.controller.staged = staged;
    const { rows } = ioChangeSheet(diffCells(a, b), a, b);
    // pm-to: TO1 alone on rack 1 slot 4; its first channel 0 → 1.
    expect(rows).toEqual([expect.objectContaining({ action: 'move', point: 'TO1', label: 'Gripper close', was: 'rack 1 / slot 4 / ch 0', now: 'rack 1 / slot 4 / ch 1', map: 'staged' })]);
  });

  it('a removed wire is a remove row', () => {
    const { rows } = sheetOf((b) => {
      b.wiring = b.wiring.filter((r) => r.id !== 'w-readylamp');
    });
    expect(rows.find((r) => r.wire === 'w-readylamp')).toMatchObject({ action: 'remove', point: '%QX1.3', label: 'Robot ready', was: '%QX1.3 → readyLamp:lamp', now: '' });
  });

  it('the CSV has one line per row in column order and parses back to the rows', () => {
    const s = sheetOf();
    expect(s.csv.endsWith('\r\n')).toBe(true);
    expect(s.csv.split('\r\n')).toHaveLength(s.rows.length + 2);
    const parsed = Papa.parse<string[]>(s.csv, { skipEmptyLines: true }).data;
    expect(parsed[0]).toEqual(IO_CHANGE_COLUMNS.map((c) => c.title));
    expect(parsed.slice(1)).toEqual(s.rows.map((r) => IO_CHANGE_COLUMNS.map((c) => r[c.key])));
  });

  it('neutralises cells that would start a spreadsheet formula (= + - @, tab, CR)', () => {
    // OWASP "CSV injection" (common practice): prefix such cells with a quote.
    expect(neutraliseCsvCell('=HYPERLINK("http://x")')).toBe(`'=HYPERLINK("http://x")`);
    expect(neutraliseCsvCell('+1')).toBe(`'+1`);
    expect(neutraliseCsvCell('-24 V return')).toBe(`'-24 V return`);
    expect(neutraliseCsvCell('@SUM(A1)')).toBe(`'@SUM(A1)`);
    expect(neutraliseCsvCell('\tx')).toBe(`'\tx`);
    expect(neutraliseCsvCell('Guard = closed')).toBe('Guard = closed');
    expect(neutraliseCsvCell('%IX0.4')).toBe('%IX0.4');
    expect(neutraliseCsvCell('')).toBe('');

    const s = sheetOf((b) => {
      b.field.find((d) => d.id === 'guard2')!.label = '=cmd|"/c calc"!A1';
      b.controller.pointMap.find((r) => r.id === 'pm-di')!.points![6] = { label: '@Guards' };
      b.wiring.find((r) => r.id === 'l-guards')!.label = '-wire';
    });
    const cells = Papa.parse<string[]>(s.csv, { skipEmptyLines: true }).data.flat();
    expect(cells).toContain(`'=cmd|"/c calc"!A1`);
    expect(cells).toContain(`'@Guards`);
    expect(cells).toContain(`'-wire`);
    expect(cells.filter((c) => /^[=+\-@\t\r]/.test(c))).toEqual([]);
    // The rows themselves keep the real text; only the CSV is neutralised.
    expect(s.rows.find((r) => r.wire === 'w-guard2')!.label).toBe('=cmd|"/c calc"!A1');
  });
});
