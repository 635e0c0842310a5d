/**
 * Prover ≡ exhaustive explicit-state search, second half (see ./test-oracle.ts). The
 * 1,000 sheets are split over two files so vitest runs them on two cores.
 */
import { describe, expect, it } from 'vitest';
import { crossCheck } from './test-oracle';

describe('prover ≡ exhaustive explicit-state search (random sheets, second half)', () => {
  it('agrees on 500 seeded random sheets (3 rules each), with shortest counterexamples', () => {
    const t = crossCheck(0xc0ffee, 500);
    console.log(`prover vs oracle (second half): ${JSON.stringify(t)}`);
    expect(t.sheets).toBe(500);
    expect(t.rules).toBe(1500);
    expect(t.maxInputs).toBe(12);
    // Both verdicts must occur often, or the agreement would be vacuous.
    expect(t.provedComplete).toBeGreaterThan(50);
    expect(t.violatedAgreed).toBeGreaterThan(50);
  }, 180_000);

  it('stays sound with timers abstracted (horizon of one scan) on 100 more sheets', () => {
    const t = crossCheck(0xab57_ac72, 100, { timerHorizonScans: 1 });
    console.log(`prover vs oracle, timers abstracted: ${JSON.stringify(t)}`);
    expect(t.sheets).toBe(100);
    // The abstraction must actually be exercised, and still decide most rules.
    expect(t.inexact).toBeGreaterThan(10);
    expect(t.provedComplete + t.violatedAgreed).toBeGreaterThan(200);
  }, 120_000);
});
