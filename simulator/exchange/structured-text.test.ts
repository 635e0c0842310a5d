/**
 * Structured Text output. The expected program below was written by hand from IEC 61131-3
 * ST syntax (3rd edition, from memory): PROGRAM … END_PROGRAM, VAR … END_VAR sections,
 * located variables `name AT %IX0.0 : BOOL`, FB instances with structured initial values
 * `t : TON := (PT := T#2s)`, formal FB calls `t(IN := x)`, `(* comments *)`, and the
 * standard type conversions `INT_TO_LINT`, `LINT_TO_WORD`. The evaluation order was worked
 * out by hand from the engine's rule (simulator/plc/api.ts: topological, ties by sheet order).
 */
import { describe, expect, it } from 'vitest';
import { formatAddress, parseAddress } from '@/simulator/address/address';
import { BLOCK_TYPES } from '@/simulator/plc/catalogue';
import type { LogicSheetInput } from '@/simulator/plc/api';
import { sheetToStructuredText } from './structured-text';
import { randomSheet, sheetForType } from './test-sheets';

type B = LogicSheetInput['blocks'][number];
const blk = (id: string, type: string, params: Record<string, unknown> = {}, label?: string): B =>
  ({ id, type, params, position: { x: 0, y: 0 }, ...(label ? { label } : {}) }) as B;
const w = (id: string, from: string, fromPort: string, to: string, toPort: string) => ({ id, from: { block: from, port: fromPort }, to: { block: to, port: toPort } });

function st(sheet: LogicSheetInput, options = {}): string {
  const r = sheetToStructuredText(sheet, options);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

/** A conveyor with a seal-in, a lamp after 2 s of running, and a part counter (invented). */
const conveyor: LogicSheetInput = {
  scanPeriodMs: 10,
  blocks: [
    blk('start', 'NO_CONTACT', { address: '%IX0.0' }, 'Start button'),
    blk('stopOk', 'NO_CONTACT', { address: '%IX0.1' }),
    blk('motorOn', 'NO_CONTACT', { address: '%QX0.0' }),
    blk('seal', 'OR', { inputs: 2 }),
    blk('run', 'AND', { inputs: 3 }),
    blk('jamClear', 'NC_CONTACT', { address: '%IX0.2' }),
    blk('motor', 'COIL', { address: '%QX0.0' }, 'Conveyor motor'),
    blk('runLamp', 'TON', { PT: 2000 }),
    blk('lamp', 'COIL', { address: '%QX0.1' }),
    blk('partSeen', 'NO_CONTACT', { address: '%IX0.3' }),
    blk('batch', 'CTU', { PV: 5 }),
    blk('batchDone', 'COIL', { address: '%QX0.2' }),
    blk('countOut', 'WORD_OUT', { address: '%QW2' }),
  ],
  connections: [
    w('c1', 'start', 'Q', 'seal', 'IN1'),
    w('c2', 'motorOn', 'Q', 'seal', 'IN2'),
    w('c3', 'seal', 'Q', 'run', 'IN1'),
    w('c4', 'stopOk', 'Q', 'run', 'IN2'),
    w('c5', 'jamClear', 'Q', 'run', 'IN3'),
    w('c6', 'run', 'Q', 'motor', 'IN'),
    w('c7', 'run', 'Q', 'runLamp', 'IN'),
    w('c8', 'runLamp', 'Q', 'lamp', 'IN'),
    w('c9', 'partSeen', 'Q', 'batch', 'CU'),
    w('c10', 'start', 'Q', 'batch', 'R'),
    w('c11', 'batch', 'Q', 'batchDone', 'IN'),
    w('c12', 'batch', 'CV', 'countOut', 'IN'),
  ],
};

const EXPECTED = `(* Conveyor with seal-in
   Exported from Cellwright as IEC 61131-3 Structured Text.
   Run Conveyor from a cyclic task every 10 ms (the sheet's scan period).
   Statements follow the order in which Cellwright solves the sheet.
   Counter presets and counts are INT; a number wired into PV is rounded to INT. *)
PROGRAM Conveyor
VAR
    (* Direct addresses: %I inputs, %Q outputs, %M memory *)
    IX0_0 AT %IX0.0 : BOOL; (* start (Start button) *)
    IX0_1 AT %IX0.1 : BOOL; (* stopOk *)
    QX0_0 AT %QX0.0 : BOOL; (* motorOn, motor (Conveyor motor) *)
    IX0_2 AT %IX0.2 : BOOL; (* jamClear *)
    QX0_1 AT %QX0.1 : BOOL; (* lamp *)
    IX0_3 AT %IX0.3 : BOOL; (* partSeen *)
    QX0_2 AT %QX0.2 : BOOL; (* batchDone *)
    QW2 AT %QW2 : WORD; (* countOut *)
END_VAR
VAR
    (* Function block instances; presets are their initial values *)
    runLamp : TON := (PT := T#2s);
    batch : CTU := (PV := 5);
END_VAR
VAR
    (* Block outputs, one per block on the sheet *)
    motorOn : BOOL;
    seal : BOOL;
    run : BOOL;
END_VAR

motorOn := QX0_0;
seal := IX0_0 OR motorOn;
run := seal AND IX0_1 AND NOT IX0_2;
QX0_0 := run; (* motor: Conveyor motor *)
runLamp(IN := run);
QX0_1 := runLamp.Q; (* lamp *)
batch(CU := IX0_3, R := IX0_0);
QX0_2 := batch.Q; (* batchDone *)
QW2 := LINT_TO_WORD(INT_TO_LINT(batch.CV)); (* countOut; WORD_OUT: low 16 bits of the whole number *)
END_PROGRAM
`;

describe('Structured Text export', () => {
  it('writes a small known sheet exactly as expected by hand', () => {
    expect(st(conveyor, { programName: 'Conveyor', title: 'Conveyor with seal-in' })).toBe(EXPECTED);
  });

  it('declares every standard function block instance with its preset, for each FB type in the catalogue', () => {
    // IEC 61131-3 standard function blocks (from memory of §6.6.3.5).
    const fbs = ['TON', 'TOF', 'TP', 'CTU', 'CTD', 'CTUD', 'SR', 'RS', 'R_TRIG', 'F_TRIG'];
    const presets: Record<string, string> = { TON: ' := (PT := T#30ms)', TOF: ' := (PT := T#40ms)', TP: ' := (PT := T#25ms)', CTU: ' := (PV := 3)', CTD: ' := (PV := 2)', CTUD: ' := (PV := 4)' };
    for (const type of fbs) {
      const text = st(sheetForType(type as (typeof BLOCK_TYPES)[number], true));
      expect(text).toContain(`    dut : ${type}${presets[type] ?? ''}; (* ${type} under test *)\n`);
      expect(text).toMatch(new RegExp(`^dut\\(.*\\);`, 'm'));
    }
  });

  it('declares one AT-located variable per direct address of each catalogue type’s sheet', () => {
    for (const type of BLOCK_TYPES) {
      const sheet = sheetForType(type, true);
      const text = st(sheet);
      const addresses = new Set(sheet.blocks.flatMap((b) => (b.params && 'address' in b.params ? [String(b.params.address)] : [])));
      for (const address of addresses) {
        const parsed = parseAddress(address);
        if (!parsed.ok) throw new Error(address);
        const size = { X: 'BOOL', B: 'BYTE', W: 'WORD', D: 'DWORD' }[parsed.value.size];
        // IEC 61131-3 located variable: name AT %<area><size><address> : <type>.
        expect(text).toMatch(new RegExp(`^    \\w+ AT ${formatAddress(parsed.value)} : ${size};`, 'm'));
      }
    }
  });

  it('writes blocks without a standard counterpart as commented expressions', () => {
    const sheet: LogicSheetInput = {
      scanPeriodMs: 20,
      blocks: [
        blk('raw', 'WORD_IN', { address: '%IW4' }),
        blk('level', 'SPAN_MAP', { inMin: 4, inMax: 20, outMin: 0, outMax: 100 }),
        blk('p1', 'PREV_BOOL', { initial: true }),
        blk('p2', 'PREV_BOOL'),
        blk('alarm', 'NO_CONTACT', { address: '%IX0.5' }),
        blk('latch', 'SET_COIL', { address: '%MX1.0' }),
        blk('TON', 'NOT'),
        blk('a.b', 'NOT'),
      ],
      connections: [w('r', 'raw', 'OUT', 'level', 'IN'), w('x', 'p2', 'Q', 'p1', 'IN'), w('y', 'p1', 'Q', 'p2', 'IN'), w('z', 'alarm', 'Q', 'latch', 'IN'), w('n', 'TON', 'Q', 'a.b', 'IN')],
    };
    const text = st(sheet);
    // (x - inMin) * (outMax - outMin) / (inMax - inMin), the engine's SPAN_MAP, with the spans worked out.
    expect(text).toContain('level := (UINT_TO_LREAL(raw) - 4.0) * 100.0 / 16.0; (* SPAN_MAP 4.0..20.0 -> 0.0..100.0 *)\n');
    expect(text).toContain('raw := WORD_TO_UINT(IW4);\n');
    expect(text).toContain('IF IX0_5 THEN MX1_0 := TRUE; END_IF; (* latch; set coil *)\n');
    // Two previous-scan blocks feeding each other: both new values are taken before either is stored.
    expect(text).toContain("(* Remember this scan's values for the next scan *)\np1_next := p2;\np2_next := p1;\np1 := p1_next;\np2 := p2_next;\nEND_PROGRAM");
    expect(text).toContain('    p1 : BOOL := TRUE;\n    p1_next : BOOL;\n');
    // Ids that are keywords or not identifiers become identifiers, with the id in a comment.
    expect(text).toContain('TON_B := NOT FALSE; (* TON *)\n');
    expect(text).toContain('a_b := NOT TON_B; (* a.b *)\n');
  });

  it('refuses a sheet that does not validate, with the sheet problems', () => {
    const r = sheetToStructuredText({ scanPeriodMs: 10, blocks: [blk('n', 'NOT'), blk('m', 'NOT')], connections: [w('1', 'n', 'Q', 'm', 'IN'), w('2', 'm', 'Q', 'n', 'IN')] });
    expect(r.ok ? [] : r.errors.map((e) => e.code)).toEqual(['algebraic_loop']);
  });

  it('writes well-formed lines for random sheets: statements end with ";", comments never nest, parentheses balance', () => {
    for (let seed = 1; seed <= 40; seed++) {
      const text = st(randomSheet(seed));
      // No lone surrogate: the text must be savable as UTF-8.
      expect(text).not.toMatch(/[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/);
      const body = text.slice(text.indexOf('\n\n', text.indexOf('PROGRAM ')) + 2, text.lastIndexOf('END_PROGRAM'));
      for (const line of body.split('\n').filter((l) => l.trim() !== '')) {
        const code = line.replace(/\(\*.*?\*\)/g, '');
        expect(code.trim() === '' || code.trimEnd().endsWith(';'), line).toBe(true);
        expect([...code].filter((c) => c === '(').length, line).toBe([...code].filter((c) => c === ')').length);
      }
      for (const comment of text.match(/\(\*[\s\S]*?\*\)/g) ?? []) expect(comment.slice(2, -2)).not.toMatch(/\(\*|\*\)/);
    }
  });
});
