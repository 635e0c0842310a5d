/**
 * Standard function blocks against IEC 61131-3 semantics. Clause references are to
 * IEC 61131-3 Ed. 2 (2003), section 2.5.2.3 "Standard function blocks" (clause numbers
 * from memory): Table 34 bistables, Table 35 edge detection, Table 36 counters,
 * Table 37 + Figure 15 timers. Every step also checks compiled ≡ reference interpreter.
 */
import { describe, expect, it } from 'vitest';
import { harness } from './test-helpers';

describe('TON (IEC 61131-3 Table 37 / Figure 15 timing diagram a)', () => {
  it('Q rises exactly when ET reaches PT, and ET clamps at PT', () => {
    const h = harness('TON', { PT: 30 }, 10);
    // ET is 0 on the scan IN rises, then grows by the scan time.
    expect(h.step({ IN: true })).toEqual({ Q: false, ET: 0 });
    expect(h.step({ IN: true })).toEqual({ Q: false, ET: 10 });
    expect(h.step({ IN: true })).toEqual({ Q: false, ET: 20 });
    // ET = PT: Q := TRUE (Figure 15: Q rises when ET reaches PT).
    expect(h.step({ IN: true })).toEqual({ Q: true, ET: 30 });
    // ET stays at PT while IN stays TRUE.
    expect(h.step({ IN: true })).toEqual({ Q: true, ET: 30 });
    // IN FALSE resets Q and ET at once.
    expect(h.step({ IN: false })).toEqual({ Q: false, ET: 0 });
  });
  it('an IN pulse shorter than PT never sets Q', () => {
    const h = harness('TON', { PT: 30 }, 10);
    h.step({ IN: true });
    h.step({ IN: true });
    expect(h.step({ IN: false })).toEqual({ Q: false, ET: 0 });
    expect(h.step({ IN: true })).toEqual({ Q: false, ET: 0 });
  });
  it('PT = 0 passes IN straight through (ET = PT = 0 on the first scan)', () => {
    const h = harness('TON', { PT: 0 }, 10);
    expect(h.step({ IN: true })).toEqual({ Q: true, ET: 0 });
    expect(h.step({ IN: false })).toEqual({ Q: false, ET: 0 });
  });
});

describe('TOF (IEC 61131-3 Figure 15 timing diagram c)', () => {
  it('Q follows IN up, falls PT after IN falls, and is re-armed by IN', () => {
    const h = harness('TOF', { PT: 30 }, 10);
    expect(h.step({ IN: false })).toEqual({ Q: false, ET: 0 }); // initial: Q FALSE
    expect(h.step({ IN: true })).toEqual({ Q: true, ET: 0 });
    expect(h.step({ IN: false })).toEqual({ Q: true, ET: 0 }); // falling: timing starts
    expect(h.step({ IN: false })).toEqual({ Q: true, ET: 10 });
    // IN TRUE again before PT: re-armed, ET back to 0, Q stays TRUE.
    expect(h.step({ IN: true })).toEqual({ Q: true, ET: 0 });
    expect(h.step({ IN: false })).toEqual({ Q: true, ET: 0 });
    expect(h.step({ IN: false })).toEqual({ Q: true, ET: 10 });
    expect(h.step({ IN: false })).toEqual({ Q: true, ET: 20 });
    expect(h.step({ IN: false })).toEqual({ Q: false, ET: 30 }); // ET reaches PT: Q falls
    // ET stays at PT while IN stays FALSE (Figure 15).
    expect(h.step({ IN: false })).toEqual({ Q: false, ET: 30 });
    expect(h.step({ IN: true })).toEqual({ Q: true, ET: 0 });
  });
});

describe('TP (IEC 61131-3 Figure 15 timing diagram b)', () => {
  it('a pulse lasts PT and is not retriggerable while running', () => {
    const h = harness('TP', { PT: 30 }, 10);
    expect(h.step({ IN: true })).toEqual({ Q: true, ET: 0 });
    expect(h.step({ IN: false })).toEqual({ Q: true, ET: 10 });
    // A new rising edge while the pulse runs is ignored: ET keeps counting.
    expect(h.step({ IN: true })).toEqual({ Q: true, ET: 20 });
    expect(h.step({ IN: true })).toEqual({ Q: false, ET: 30 });
    // IN still TRUE after the pulse: ET holds PT; it returns to 0 when IN falls.
    expect(h.step({ IN: true })).toEqual({ Q: false, ET: 30 });
    expect(h.step({ IN: false })).toEqual({ Q: false, ET: 0 });
    // A fresh rising edge after the pulse starts a new one.
    expect(h.step({ IN: true })).toEqual({ Q: true, ET: 0 });
  });
});

describe('CTU (IEC 61131-3 Table 36)', () => {
  it('counts rising edges of CU; Q when CV >= PV', () => {
    const h = harness('CTU', { PV: 2 });
    expect(h.step({ CU: true })).toEqual({ Q: false, CV: 1 }); // R_EDGE memory starts FALSE
    expect(h.step({ CU: true })).toEqual({ Q: false, CV: 1 }); // level, not edge
    expect(h.step({ CU: false })).toEqual({ Q: false, CV: 1 });
    expect(h.step({ CU: true })).toEqual({ Q: true, CV: 2 });
  });
  it('R dominates CU (IF R THEN CV := 0 ELSIF CU ...)', () => {
    const h = harness('CTU', { PV: 1 });
    h.step({ CU: true });
    expect(h.step({ CU: false, R: true })).toEqual({ Q: false, CV: 0 });
    expect(h.step({ CU: true, R: true })).toEqual({ Q: false, CV: 0 });
    // CU is still high when R releases: no new edge, no count.
    expect(h.step({ CU: true, R: false })).toEqual({ Q: false, CV: 0 });
  });
});

describe('CTD (IEC 61131-3 Table 36)', () => {
  it('LD loads PV, CD counts down, Q when CV <= 0', () => {
    const h = harness('CTD', { PV: 2 });
    expect(h.step({ LD: true })).toEqual({ Q: false, CV: 2 });
    expect(h.step({ CD: true })).toEqual({ Q: false, CV: 1 });
    expect(h.step({ CD: false })).toEqual({ Q: false, CV: 1 });
    expect(h.step({ CD: true })).toEqual({ Q: true, CV: 0 });
    expect(h.step({ CD: true, LD: true })).toEqual({ Q: false, CV: 2 }); // LD dominates CD
  });
});

describe('CTUD (IEC 61131-3 Table 36)', () => {
  it('counts up and down; R dominates LD; simultaneous edges cancel', () => {
    const h = harness('CTUD', { PV: 2 });
    expect(h.step({ CU: true })).toEqual({ QU: false, QD: false, CV: 1 });
    expect(h.step({})).toEqual({ QU: false, QD: false, CV: 1 });
    expect(h.step({ CU: true })).toEqual({ QU: true, QD: false, CV: 2 });
    expect(h.step({})).toEqual({ QU: true, QD: false, CV: 2 });
    expect(h.step({ CU: true, CD: true })).toEqual({ QU: true, QD: false, CV: 2 });
    expect(h.step({})).toEqual({ QU: true, QD: false, CV: 2 });
    expect(h.step({ CD: true })).toEqual({ QU: false, QD: false, CV: 1 });
    expect(h.step({ R: true, LD: true })).toEqual({ QU: false, QD: true, CV: 0 });
    expect(h.step({ LD: true })).toEqual({ QU: true, QD: false, CV: 2 });
  });
});

describe('SR and RS (IEC 61131-3 Table 34)', () => {
  it('SR is set-dominant: Q1 := S1 OR (NOT R AND Q1)', () => {
    const h = harness('SR');
    expect(h.step({ S1: true, R: true })).toEqual({ Q1: true });
    expect(h.step({})).toEqual({ Q1: true });
    expect(h.step({ R: true })).toEqual({ Q1: false });
  });
  it('RS is reset-dominant: Q1 := NOT R1 AND (S OR Q1)', () => {
    const h = harness('RS');
    expect(h.step({ S: true, R1: true })).toEqual({ Q1: false });
    expect(h.step({ S: true })).toEqual({ Q1: true });
    expect(h.step({})).toEqual({ Q1: true });
    expect(h.step({ R1: true })).toEqual({ Q1: false });
  });
});

describe('R_TRIG and F_TRIG (IEC 61131-3 Table 35)', () => {
  it('R_TRIG: Q := CLK AND NOT M; M starts FALSE, so TRUE on the first scan pulses', () => {
    const h = harness('R_TRIG');
    expect(h.step({ CLK: true })).toEqual({ Q: true });
    expect(h.step({ CLK: true })).toEqual({ Q: false });
    expect(h.step({ CLK: false })).toEqual({ Q: false });
    expect(h.step({ CLK: true })).toEqual({ Q: true });
  });
  it('R_TRIG: FALSE on the first scan gives no pulse', () => {
    expect(harness('R_TRIG').step({ CLK: false })).toEqual({ Q: false });
  });
  it('F_TRIG: Q := NOT CLK AND NOT M; M := NOT CLK — FALSE on the first scan pulses', () => {
    // Table 35 body with M initially FALSE; the standard's note says an F_TRIG whose CLK is
    // FALSE gives Q TRUE after its first execution following a cold restart (Ed. 2, from memory).
    const h = harness('F_TRIG');
    expect(h.step({ CLK: false })).toEqual({ Q: true });
    expect(h.step({ CLK: false })).toEqual({ Q: false });
    expect(h.step({ CLK: true })).toEqual({ Q: false });
    expect(h.step({ CLK: false })).toEqual({ Q: true });
    expect(h.step({ CLK: false })).toEqual({ Q: false });
  });
  it('F_TRIG: TRUE on the first scan gives no pulse', () => {
    expect(harness('F_TRIG').step({ CLK: true })).toEqual({ Q: false });
  });
});

describe('logic blocks (IEC 61131-3 Table 28 bitwise Boolean functions)', () => {
  it('AND, OR, XOR with three inputs; XOR is odd parity when extended', () => {
    const and = harness('AND', { inputs: 3 });
    const or = harness('OR', { inputs: 3 });
    const xor = harness('XOR', { inputs: 3 });
    for (let k = 0; k < 8; k++) {
      const ins = { IN1: (k & 1) === 1, IN2: (k & 2) === 2, IN3: (k & 4) === 4 };
      const ones = Number(ins.IN1) + Number(ins.IN2) + Number(ins.IN3);
      expect(and.step(ins)).toEqual({ Q: ones === 3 });
      expect(or.step(ins)).toEqual({ Q: ones > 0 });
      expect(xor.step(ins)).toEqual({ Q: ones % 2 === 1 });
    }
    const not = harness('NOT');
    expect(not.step({ IN: true })).toEqual({ Q: false });
    expect(not.step({ IN: false })).toEqual({ Q: true });
  });
});
