/**
 * Hand-built sheets with known interlock bugs (violated, with the expected shortest
 * counterexample) and their corrected versions (proved); block semantics at the
 * boundaries; abstractions; limits; invalid input. Expected values are derived in the
 * comments from the cited rule, never read back from the prover.
 *
 * Block semantics cite IEC 61131-3 Ed. 2 (2003), 2.5.2.3 "Standard function blocks"
 * (table numbers from memory, as in simulator/plc/blocks.test.ts): Table 34 bistables,
 * Table 35 edge detection, Table 36 counters, Table 37 and Figure 15 timers. NC stop and
 * e-stop circuits, and a guard switch that is on while the guard is shut, are common
 * practice (DESIGN.md, "The job, in the trade's own terms").
 */
import { describe, expect, it } from 'vitest';
import { starterCell } from '@/simulator/demo';
import { proveRules, type Verdict } from './prove';
import type { InterlockRuleInput } from './rules';
import { blk, cellWithSheet, estopWiredNc, estopWiredNo, guardBypassedByLatch, guardInSeries, guardResetsLatch, sheetOf, wire } from './test-cells';

const on = (signal: string) => ({ signal, value: 'on' as const });
const off = (signal: string) => ({ signal, value: 'off' as const });

/** The one verdict of proving one rule (fails the test on invalid input). */
function prove1(input: unknown, rule: InterlockRuleInput, options = {}): Verdict {
  const r = proveRules(input, [rule], options);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value[0];
}
/** The inputs of each scan of a violated verdict, as on/off lists in `names` order. */
function inputsOf(v: Verdict, names: string[]): number[][] {
  if (v.status !== 'violated') throw new Error(`expected a violation, got ${v.status}`);
  return v.counterexample.scans.map((s) => names.map((n) => (s.inputs[n] ? 1 : 0)));
}

const guardRule: InterlockRuleInput = { id: 'guard', title: 'No start request with the guard open', kind: 'never', what: on('%QX0.1'), while: off('%IX0.2') };

describe('guard bypassed by a latch', () => {
  it('is violated after two scans: latched with the guard shut, then the guard opens', () => {
    const v = prove1(guardBypassedByLatch, guardRule);
    expect(v.status).toBe('violated');
    if (v.status !== 'violated') return;
    // Scan 0 can only set the latch with the guard shut (S1 = start AND guard), so the
    // earliest break is scan 1: guard open, stop not pressed (the NC stop input on, so R
    // is off) and the latch holds — SR keeps Q1 while R is off (IEC 61131-3 Table 34 SR:
    // Q1 := S1 OR (NOT R AND Q1)). At scan 0 stop may read off: SR is set-dominant.
    expect(v.counterexample.failsAtScan).toBe(1);
    expect(inputsOf(v, ['%IX0.0', '%IX0.1', '%IX0.2'])).toEqual([
      [1, 0, 1],
      [0, 1, 0],
    ]);
    expect(v.counterexample.scans[1].signals).toEqual({ '%QX0.1': true, '%IX0.2': false });
    expect(v.exact).toBe(true);
  });
  it('is proved when the guard resets a reset-dominant latch, or sits in series with its output', () => {
    for (const sheet of [guardResetsLatch, guardInSeries]) {
      const v = prove1(sheet, guardRule);
      expect(v.status).toBe('proved');
    }
  });
});

describe('e-stop wired as NO', () => {
  const rule: InterlockRuleInput = { id: 'estop', title: 'Start only with the e-stop chain healthy', kind: 'only-if', what: on('%QX0.1'), requires: [on('%IX0.3')] };
  it('is violated in the first scan: start pressed, stop not pressed, chain broken', () => {
    const v = prove1(estopWiredNo, rule);
    // AND(start, stop input on, NOT e-stop input) drives the coil in the same scan.
    expect(inputsOf(v, ['%IX0.0', '%IX0.1', '%IX0.3'])).toEqual([[1, 1, 0]]);
  });
  it('is proved when the chain is read as NC (on = healthy), seal-in and all', () => {
    expect(prove1(estopWiredNc, rule).status).toBe('proved');
  });
});

/** "Never <address> on" (while itself is on). */
const neverOn = (id: string, a: string): InterlockRuleInput => ({ id, title: '', kind: 'never', what: on(a), while: on(a) });
const violatedAt = (v: Verdict) => (v.status === 'violated' ? v.counterexample.failsAtScan : v.status);

describe('block semantics the proof must follow', () => {
  it('CTU counts a CU that is on in the first scan (its edge memory starts off); Q once CV reaches PV', () => {
    const sheet = sheetOf([blk('part', 'NO_CONTACT', { address: '%IX0.0' }), blk('count', 'CTU', { PV: 3 }), blk('full', 'COIL', { address: '%QX0.0' })], [
      wire('part', 'Q', 'count', 'CU'),
      wire('count', 'Q', 'full', 'IN'),
    ]);
    const v = prove1(sheet, neverOn('full', '%QX0.0'));
    // IEC 61131-3 Table 36 CTU counts rising edges of CU: three edges need CU on, off, on, off, on.
    expect(inputsOf(v, ['%IX0.0'])).toEqual([[1], [0], [1], [0], [1]]);
    expect(v.exact).toBe(true);
    expect(v.encoding.map((n) => [n.block, n.treatment])).toEqual([['count', 'exact']]);
  });
  it('CTUD: QU at CV >= PV after two up edges; QD (CV <= 0) holds from the start', () => {
    const sheet = sheetOf(
      [
        blk('up', 'NO_CONTACT', { address: '%IX0.0' }),
        blk('down', 'NO_CONTACT', { address: '%IX0.1' }),
        blk('count', 'CTUD', { PV: 2 }),
        blk('high', 'COIL', { address: '%QX0.0' }),
        blk('low', 'COIL', { address: '%QX0.1' }),
      ],
      [wire('up', 'Q', 'count', 'CU'), wire('down', 'Q', 'count', 'CD'), wire('count', 'QU', 'high', 'IN'), wire('count', 'QD', 'low', 'IN')],
    );
    // IEC 61131-3 Table 36 CTUD: up edges at scans 0 and 2 (CD off) give CV 2 = PV at scan 2.
    expect(inputsOf(prove1(sheet, neverOn('high', '%QX0.0')), ['%IX0.0', '%IX0.1'])).toEqual([
      [1, 0],
      [0, 0],
      [1, 0],
    ]);
    // CV starts at 0, so QD is on until the first up edge (scan 0 at the earliest).
    expect(violatedAt(prove1(sheet, { id: 'low', title: '', kind: 'never', what: off('%QX0.1'), while: off('%QX0.1') }))).toBe(0);
  });
  it('R_TRIG pulses in the first scan when CLK is already on; F_TRIG when CLK is off (memory starts off)', () => {
    const sheet = sheetOf(
      [
        blk('clk', 'NO_CONTACT', { address: '%IX0.0' }),
        blk('rise', 'R_TRIG'),
        blk('fall', 'F_TRIG'),
        blk('rq', 'COIL', { address: '%QX0.0' }),
        blk('fq', 'COIL', { address: '%QX0.1' }),
      ],
      [wire('clk', 'Q', 'rise', 'CLK'), wire('clk', 'Q', 'fall', 'CLK'), wire('rise', 'Q', 'rq', 'IN'), wire('fall', 'Q', 'fq', 'IN')],
    );
    // IEC 61131-3 Table 35 R_TRIG: Q := CLK AND NOT M with M initially FALSE: the pulse comes the scan CLK turns on, scan 0 included.
    expect(prove1(sheet, { id: 'r', title: '', kind: 'within', after: on('%IX0.0'), expect: on('%QX0.0'), scans: 0 }).status).toBe('proved');
    // Table 35 F_TRIG: Q := NOT CLK AND NOT M, M initially FALSE: an off CLK in the first scan pulses.
    const f = prove1(sheet, neverOn('f', '%QX0.1'));
    expect(inputsOf(f, ['%IX0.0'])).toEqual([[0]]);
    // A held CLK never pulses again: after the first scan, Q only on the scan CLK turns on.
    expect(prove1(sheet, { id: 'r2', title: '', kind: 'only-if', what: on('%QX0.0'), requires: [on('%IX0.0')] }).status).toBe('proved');
  });
  it('TOF holds Q for PT after IN falls: on for the falling scan and the next four at PT 50 ms, 10 ms scans', () => {
    const sheet = sheetOf([blk('run', 'NO_CONTACT', { address: '%IX0.0' }), blk('delay', 'TOF', { PT: 50 }), blk('motor', 'COIL', { address: '%QX0.0' })], [
      wire('run', 'Q', 'delay', 'IN'),
      wire('delay', 'Q', 'motor', 'IN'),
    ]);
    const rule = (scans: number): InterlockRuleInput => ({ id: `off${scans}`, title: '', kind: 'within', after: off('%IX0.0'), expect: off('%QX0.0'), scans });
    // IEC 61131-3 Figure 15 c (TOF): Q follows IN up at once.
    expect(prove1(sheet, { id: 'up', title: '', kind: 'never', what: off('%QX0.0'), while: on('%IX0.0') }).status).toBe('proved');
    // Q stays on until ET reaches PT; ET is 0 the scan IN falls and grows by the scan period
    // after (simulator/plc/api.ts), so Q is on for that scan and the next four, off at the fifth.
    // Within 4 scans: IN on at scan 0, falls at scan 1, Q still on at scan 1 + 4 = 5.
    const four = prove1(sheet, rule(4));
    expect(inputsOf(four, ['%IX0.0'])).toEqual([[1], [0], [0], [0], [0], [0]]);
    expect(four.encoding[0]).toMatchObject({ block: 'delay', treatment: 'exact' });
    // Within 5 scans holds while IN stays off, so the shortest break is one scan later and needs IN back on.
    const five = prove1(sheet, rule(5));
    expect(violatedAt(five)).toBe(6);
    expect(inputsOf(five, ['%IX0.0']).slice(2).flat()).toContain(1);
  });
  it('TON: Q only after IN has been on for PT (3 scans for 30 ms); TP: a pulse of PT', () => {
    const sheet = sheetOf(
      [
        blk('x', 'NO_CONTACT', { address: '%IX0.0' }),
        blk('on', 'TON', { PT: 30 }),
        blk('pulse', 'TP', { PT: 20 }),
        blk('q0', 'COIL', { address: '%QX0.0' }),
        blk('q1', 'COIL', { address: '%QX0.1' }),
      ],
      [wire('x', 'Q', 'on', 'IN'), wire('x', 'Q', 'pulse', 'IN'), wire('on', 'Q', 'q0', 'IN'), wire('pulse', 'Q', 'q1', 'IN')],
    );
    // IEC 61131-3 Figure 15 a (TON): ET 0, 10, 20, 30 ms over four scans of IN on; Q at ET = PT, so first at scan 3.
    expect(inputsOf(prove1(sheet, neverOn('ton', '%QX0.0')), ['%IX0.0'])).toEqual([[1], [1], [1], [1]]);
    // IEC 61131-3 Figure 15 b (TP): a 20 ms pulse lasts two scans whatever IN does, so Q is never on three scans running.
    const tp: InterlockRuleInput = { id: 'tp', title: '', kind: 'within', after: on('%QX0.1'), expect: off('%QX0.1'), scans: 2, trigger: 'rises' };
    expect(prove1(sheet, tp).status).toBe('proved');
    // Within 1 scan: the pulse starts at scan 0 and is still on at scan 1.
    expect(violatedAt(prove1(sheet, { ...tp, id: 'tp1', scans: 1 }))).toBe(1);
  });
  it('a contact on an output sees last scan\'s coil value, and memory persists (seal-in)', () => {
    const v = prove1(starterCell, { id: 'seal', title: '', kind: 'never', what: on('%QX0.0'), while: off('%IX0.0') });
    // Starter cell: Running := (start OR Running) AND stop AND e-stop. Start at scan 0, released at scan 1: still running.
    expect(inputsOf(v, ['%IX0.0', '%IX0.1', '%IX0.2'])).toEqual([
      [1, 1, 1],
      [0, 1, 1],
    ]);
    // Labels come from the devices wired to each address.
    expect(v.text).toBe('Never %QX0.0 (Running) on while %IX0.0 (Start) off');
    expect(prove1(starterCell, { id: 'permit', title: '', kind: 'only-if', what: on('%QX0.0'), requires: [on('%IX0.1'), on('%IX0.2')] }).status).toBe('proved');
  });
});

describe('abstractions and limits', () => {
  const analog = sheetOf(
    [blk('level', 'WORD_IN', { address: '%IW2' }), blk('limit', 'CONST', { value: 100 }), blk('high', 'GT'), blk('alarm', 'COIL', { address: '%QX0.2' })],
    [wire('level', 'OUT', 'high', 'IN1'), wire('limit', 'OUT', 'high', 'IN2'), wire('high', 'Q', 'alarm', 'IN')],
  );
  it('a comparison over a word is free; a counterexample that needs it does not replay, so the verdict is undecided', () => {
    const v = prove1(analog, neverOn('alarm', '%QX0.2'));
    expect(v.status).toBe('undecided');
    if (v.status !== 'undecided') return;
    expect(v.reason).toBe('abstraction');
    expect(v.exact).toBe(false);
    expect(v.encoding).toEqual([expect.objectContaining({ block: 'high', treatment: 'abstracted' })]);
  });
  it('a rule that holds whatever the abstracted block does is proved, marked inexact', () => {
    const sheet = sheetOf([blk('x', 'NO_CONTACT', { address: '%IX0.0' }), blk('slow', 'TON', { PT: 600_000 }), blk('q', 'COIL', { address: '%QX0.0' })], [
      wire('x', 'Q', 'slow', 'IN'),
      wire('slow', 'Q', 'q', 'IN'),
    ]);
    // 600 s at 10 ms is 60,000 scans, past the default horizon: TON is abstracted, but its Q is still only on with IN on (IEC 61131-3 Figure 15 a).
    const v = prove1(sheet, { id: 'ton', title: '', kind: 'only-if', what: on('%QX0.0'), requires: [on('%IX0.0')] });
    expect(v.status).toBe('proved');
    expect(v.exact).toBe(false);
    expect(v.encoding[0]).toMatchObject({ block: 'slow', treatment: 'abstracted' });
    // The same block within a longer horizon is exact.
    expect(prove1(sheet, { id: 'ton', title: '', kind: 'only-if', what: on('%QX0.0'), requires: [on('%IX0.0')] }, { timerHorizonScans: 60_000 }).exact).toBe(true);
  });
  it('stops at the depth or the clause budget with no violation found, and says how far it got', () => {
    const sheet = sheetOf([blk('part', 'NO_CONTACT', { address: '%IX0.0' }), blk('count', 'CTU', { PV: 50 }), blk('full', 'COIL', { address: '%QX0.0' })], [
      wire('part', 'Q', 'count', 'CU'),
      wire('count', 'Q', 'full', 'IN'),
    ]);
    // 50 edges need 99 scans; induction cannot close (a state with CV 49 is one edge from Q).
    const deep = prove1(sheet, neverOn('full', '%QX0.0'), { maxDepth: 5 });
    expect(deep).toMatchObject({ status: 'undecided', reason: 'max-depth', bound: 6 });
    const poor = prove1(sheet, neverOn('full', '%QX0.0'), { budget: 10 });
    expect(poor).toMatchObject({ status: 'undecided', reason: 'budget' });
  });
});

describe('input checking and determinism', () => {
  it('reports every problem with its path: the cell\'s sheet and the rules', () => {
    const bad = cellWithSheet(sheetOf([blk('x', 'NO_CONTACT', { address: '%IX0.9' })], []));
    const r = proveRules(bad, [
      { id: 'a', title: '', kind: 'never', what: on('%QW0'), while: on('%IX0.0') },
      { id: 'a', title: '', kind: 'only-if', what: on('%QX0.0'), requires: [] },
    ]);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors.map((e) => [e.code, e.path.join('.')])).toEqual(
      expect.arrayContaining([
        ['address_range', 'plc.sheet.blocks.0.params.address'],
        ['address_size', 'rules.0.what.signal'],
        ['too_small', 'rules.1.requires'],
      ]),
    );
  });
  it('gives the same verdicts, counterexamples included, every time', () => {
    const rules = [guardRule, { id: 'estop', title: '', kind: 'only-if' as const, what: on('%QX0.1'), requires: [on('%IX0.3')] }];
    expect(proveRules(estopWiredNo, rules)).toEqual(proveRules(estopWiredNo, rules));
  });
});
