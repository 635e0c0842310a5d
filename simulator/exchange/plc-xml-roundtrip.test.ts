/**
 * The round trip sheet → IEC 61131-10 XML → sheet keeps every block, parameter, label,
 * position and wire (in order), for every block type in the catalogue, for the demo cells'
 * sheets and for seeded random sheets; and the imported sheet scans exactly like the
 * original (compiled engine on both, reference interpreter on the import).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { demoCells, pickAndPlaceDebouncedSheet } from '@/simulator/demo';
import { BLOCK_TYPES } from '@/simulator/plc/catalogue';
import type { LogicSheetInput } from '@/simulator/plc/api';
import { validateSheet } from '@/simulator/plc/validate';
import { plcXmlToSheet, sheetToPlcXml } from './plc-xml';
import { randomSheet, runSheet, sheetForType } from './test-sheets';

function roundTrip(sheet: LogicSheetInput) {
  const expected = validateSheet(sheet);
  if (!expected.ok) throw new Error(`test sheet does not validate: ${JSON.stringify(expected.errors)}`);
  const xml = sheetToPlcXml(sheet);
  if (!xml.ok) throw new Error(`export failed: ${JSON.stringify(xml.errors)}`);
  const back = plcXmlToSheet(xml.value);
  return { expected: expected.value, xml: xml.value, back };
}

function expectSameBehaviour(original: unknown, imported: unknown, seed: number) {
  const scans = 60;
  const want = runSheet(original, scans, seed);
  expect(runSheet(imported, scans, seed)).toEqual(want);
  expect(runSheet(imported, scans, seed, 'interpreted').images).toEqual(want.images);
}

describe('round trip of one block of each catalogue type', () => {
  for (const type of BLOCK_TYPES) {
    for (const wired of [true, false]) {
      it(`${type}, ${wired ? 'every input wired' : 'no input wired'}`, () => {
        const sheet = sheetForType(type, wired);
        const { expected, back } = roundTrip(sheet);
        expect(back.ok ? back.value : back.errors).toEqual(expected);
        if (!back.ok) return;
        // The block under test is present with its type and parameters (not only "something equal").
        expect(back.value.blocks.find((b) => b.id === 'dut')).toMatchObject({ type, label: `${type} under test` });
        expect(back.value.connections.map((c) => c.id)).toEqual(expected.connections.map((c) => c.id));
        expectSameBehaviour(sheet, back.value, 7);
      });
    }
  }
});

describe('round trip of the demo cells', () => {
  const sheets: [string, LogicSheetInput][] = [
    ...Object.values(demoCells).map((cell): [string, LogicSheetInput] => [cell.id, cell.plc.sheet as LogicSheetInput]),
    ['pick-and-place, debounced', pickAndPlaceDebouncedSheet()],
  ];
  for (const [name, sheet] of sheets) {
    it(`${name}: every block, parameter and wire, and the same scans`, () => {
      const { expected, back } = roundTrip(sheet);
      expect(back.ok ? back.value : back.errors).toEqual(expected);
      expectSameBehaviour(sheet, back.ok ? back.value : sheet, 11);
    });
  }
});

describe('round trip of random sheets', () => {
  it('keeps awkward ids, labels, positions and numbers, and behaves the same (fast-check, seeded)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 ** 31 - 1 }), (seed) => {
        const sheet = randomSheet(seed);
        const { expected, back } = roundTrip(sheet);
        expect(back.ok ? back.value : back.errors).toEqual(expected);
        expectSameBehaviour(sheet, back.ok ? back.value : sheet, seed);
      }),
      { numRuns: 60, seed: 61131 },
    );
  });

  it('writes the same document twice (the export is deterministic)', () => {
    const sheet = randomSheet(42);
    expect(sheetToPlcXml(sheet)).toEqual(sheetToPlcXml(sheet));
  });

  it('refuses to export a sheet that does not validate, with the sheet problems', () => {
    const r = sheetToPlcXml({ scanPeriodMs: 10, blocks: [{ id: 't', type: 'TON', params: { PT: -1 }, position: { x: 0, y: 0 } }], connections: [] });
    expect(r.ok ? [] : r.errors.map((e) => [e.code, e.path.join('.')])).toEqual([['negative_time', 'blocks.0.params.PT']]);
  });
});

describe('SPAN_MAP with its raw span left to the analog input', () => {
  const sheet: LogicSheetInput = {
    scanPeriodMs: 10,
    blocks: [
      { id: 'raw', type: 'WORD_IN', params: { address: '%IW4', signed: false }, position: { x: 0, y: 0 } },
      { id: 'level', type: 'SPAN_MAP', params: { outMin: 0, outMax: 100, clamp: true }, position: { x: 200, y: 0 } },
    ],
    connections: [{ id: 'w', from: { block: 'raw', port: 'OUT' }, to: { block: 'level', port: 'IN' } }],
  };

  it('round-trips without inventing IN_MIN / IN_MAX', () => {
    const { expected, xml, back } = roundTrip(sheet);
    expect(xml).not.toContain('member="IN_MAX"');
    expect(xml).not.toContain('member="IN_MIN"');
    expect(back.ok ? back.value : back.errors).toEqual(expected);
    if (back.ok) expect(back.value.blocks[1].params).toEqual({ outMin: 0, outMax: 100, clamp: true });
  });

  it('a file that still names the block CW_SCALE imports as SPAN_MAP', () => {
    const explicit = { ...sheet, blocks: [sheet.blocks[0], { ...sheet.blocks[1], params: { inMin: 0, inMax: 4095, outMin: 0, outMax: 100, clamp: false } }] } as LogicSheetInput;
    const xml = sheetToPlcXml(explicit);
    if (!xml.ok) throw new Error(JSON.stringify(xml.errors));
    const old = xml.value.replaceAll('CW_SPAN_MAP', 'CW_SCALE').replaceAll('type="SPAN_MAP"', 'type="SCALE"');
    const back = plcXmlToSheet(old);
    expect(back.ok ? back.value.blocks[1] : back.errors).toMatchObject({ type: 'SPAN_MAP', params: { inMin: 0, inMax: 4095 } });
  });
});
