import { describe, expect, it } from 'vitest';
import { cellDocumentSchema, IEC_61131_10_NS, pickAndPlaceCell } from '@/simulator';
import {
  cellFileSlug,
  countsText,
  exportFileName,
  formatBytes,
  importFileRefusal,
  MAX_IMPORT_BYTES,
  problemWhere,
  replaceQuestion,
  sheetCounts,
} from './exchange-flow';
import { exportSheet, importSheet } from './sheet-exchange';
import type { Sheet } from './sheet-graph';

const demoSheet = (): Sheet => cellDocumentSchema.parse(pickAndPlaceCell).plc.sheet;

describe('file names', () => {
  it('names downloads after the cell, in lower-case ASCII with single hyphens', () => {
    expect(cellFileSlug('Kestrel Vale Cell B — pick and place')).toBe('kestrel-vale-cell-b-pick-and-place');
    expect(cellFileSlug('  Zürich línea 3 / Öl  ')).toBe('zurich-linea-3-ol');
    expect(exportFileName('Kestrel Vale Cell B — pick and place', 'st')).toBe('kestrel-vale-cell-b-pick-and-place-logic.st');
    expect(exportFileName('Bay 4', 'xml')).toBe('bay-4-logic.xml');
  });

  it('falls back to "cell" for a name with no letters or digits and keeps long names short', () => {
    expect(cellFileSlug('———')).toBe('cell');
    const long = cellFileSlug('a'.repeat(59) + ' bcdef');
    expect(long).toBe('a'.repeat(59)); // cut at 60 characters, trailing hyphen dropped
  });
});

describe('the import size cap', () => {
  it('reads files up to 2 MiB and refuses empty or larger ones with the sizes named', () => {
    expect(MAX_IMPORT_BYTES).toBe(2 * 1024 * 1024);
    expect(importFileRefusal({ name: 'a.xml', size: MAX_IMPORT_BYTES })).toBeNull();
    expect(importFileRefusal({ name: 'a.xml', size: 0 })).toBe('“a.xml” is empty.');
    expect(importFileRefusal({ name: 'big.xml', size: MAX_IMPORT_BYTES + 1 })).toBe('“big.xml” is 2.0 MB; the import reads files up to 2.0 MB.');
    expect(importFileRefusal({ name: 'huge.xml', size: Math.round(3.4 * 1024 * 1024) })).toBe('“huge.xml” is 3.4 MB; the import reads files up to 2.0 MB.');
  });

  it('writes byte counts in bytes, KB and MB (1 KB = 1024 bytes)', () => {
    expect(formatBytes(1)).toBe('1 byte');
    expect(formatBytes(812)).toBe('812 bytes');
    expect(formatBytes(14_541)).toBe('14.2 KB');
  });
});

describe('the confirmation', () => {
  it('names both sheets’ blocks and wires, a changed scan period, and that undo restores', () => {
    const q = replaceQuestion({ blocks: 37, wires: 27, scanPeriodMs: 10 }, { blocks: 1, wires: 0, scanPeriodMs: 20 }, 'line-3.xml');
    expect(q.title).toBe('Replace the logic sheet?');
    expect(q.lines).toEqual([
      'The current sheet (37 blocks and 27 wires) will be replaced by the sheet in “line-3.xml” (1 block and 0 wires).',
      'The scan period changes from 10 ms to 20 ms.',
      'Undo brings the current sheet back.',
    ]);
    expect(replaceQuestion({ blocks: 2, wires: 1, scanPeriodMs: 10 }, { blocks: 2, wires: 1, scanPeriodMs: 10 }, 'x.xml').lines).toHaveLength(2);
    expect(countsText({ blocks: 1, wires: 1, scanPeriodMs: 5 })).toBe('1 block and 1 wire');
  });
});

describe('where a problem sits', () => {
  const sheet = demoSheet();
  it('names the XML line and column of a malformed document', () => {
    expect(problemWhere(['xml', 'line', 787, 'column', 3])).toBe('XML line 787, column 3');
    expect(problemWhere(['xml', 'line', 1])).toBe('XML line 1');
    expect(problemWhere(['xml'])).toBe('the XML document');
    expect(problemWhere([])).toBe('the file');
  });

  it('names an FBD element by its kind and localId, then the part of it', () => {
    const body = ['project', 'types', 'pous', 'pou', 'CellLogic', 'body', 'FBD'];
    expect(problemWhere([...body, 'block', 7, 'inputVariables', 'IN1', 'connection'])).toBe('block localId 7 › inputVariables › IN1 › connection');
    expect(problemWhere([...body, 'inVariable', 12])).toBe('inVariable localId 12');
    expect(problemWhere(body)).toBe('the FBD body');
    expect(problemWhere(['project', 'types', 'pous'])).toBe('project › types › pous');
  });

  it('names a sheet block or wire by its id (export problems)', () => {
    expect(problemWhere(['blocks', 0, 'params', 'address'], sheet)).toBe(`block ${sheet.blocks[0].id} › params › address`);
    expect(problemWhere(['connections', 1], sheet)).toBe(`wire ${sheet.connections[1].id}`);
    expect(problemWhere(['blocks', 500], sheet)).toBe('block #501');
    expect(problemWhere(['scanPeriodMs'], sheet)).toBe('sheet › scanPeriodMs');
  });
});

describe('export and import through the engine (sheet-exchange.ts)', () => {
  const now = new Date('2026-12-04T10:00:00Z');

  it('exports the demo sheet as Structured Text: one PROGRAM naming the cell and its addresses', () => {
    const out = exportSheet(demoSheet(), 'Kestrel Vale Cell B — pick and place', 'st', now);
    if (!out.ok) throw new Error(JSON.stringify(out.problems));
    expect(out.fileName).toBe('kestrel-vale-cell-b-pick-and-place-logic.st');
    expect(out.mediaType).toBe('text/plain;charset=utf-8');
    expect(out.text).toMatch(/^\(\* Kestrel Vale Cell B — pick and place/);
    expect(out.text).toMatch(/^PROGRAM CellLogic$/m);
    expect(out.text).toMatch(/^END_PROGRAM$/m);
    expect(out.text).toContain('AT %IX0.0 : BOOL; (* startPB *)');
  });

  it('exports XML with the export time and the cell as project name, and imports it back to the same sheet', () => {
    const sheet = demoSheet();
    const out = exportSheet(sheet, 'Bay 4', 'xml', now);
    if (!out.ok) throw new Error(JSON.stringify(out.problems));
    expect(out.fileName).toBe('bay-4-logic.xml');
    expect(out.text).toContain(`xmlns="${IEC_61131_10_NS}"`);
    expect(out.text).toContain('creationDateTime="2026-12-04T10:00:00.000Z"');
    expect(out.text).toContain('<contentHeader name="Bay 4"');
    const back = importSheet(out.text);
    if (!back.ok) throw new Error(JSON.stringify(back.problems));
    expect(back.sheet).toEqual(sheet);
    expect(back.counts).toEqual(sheetCounts(sheet));
  });

  it('an export of a sheet with problems gives the problems, named by block id, and no file', () => {
    const sheet = demoSheet();
    const broken = structuredClone(sheet);
    (broken.blocks[0].params as { address: string }).address = '%QX99.99';
    const out = exportSheet(broken, 'Bay 4', 'st', now);
    expect(out.ok).toBe(false);
    if (out.ok) return;
    expect(out.problems.length).toBeGreaterThan(0);
    expect(out.problems[0].where.startsWith(`block ${sheet.blocks[0].id}`)).toBe(true);
  });

  it('an import of a broken file lists each problem at its element and returns no sheet', () => {
    const out = exportSheet(demoSheet(), 'Bay 4', 'xml', now);
    if (!out.ok) throw new Error('export failed');
    const dangling = out.text.replace(/refLocalId="\d+"/, 'refLocalId="99999"');
    const r = importSheet(dangling);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems).toHaveLength(1);
    expect(r.problems[0].code).toBe('dangling_connection');
    expect(r.problems[0].where).toMatch(/^block localId \d+ › inputVariables › IN1 › connection$/);
    expect(r.problems[0].message).toBe('refLocalId 99999 names no element');

    const malformed = importSheet(out.text.replace('</types>', '</typez>'));
    expect(malformed.ok).toBe(false);
    if (!malformed.ok) expect(malformed.problems[0]).toMatchObject({ code: 'malformed_xml', where: expect.stringMatching(/^XML line \d+, column \d+$/) });
  });
});
