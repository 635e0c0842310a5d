import { describe, expect, it } from 'vitest';
import { changeText, outcomeText, verdictText } from './record-text';

describe('the signed record in words', () => {
  it('counts a scenario outcome and names a changed rule with the arrow the medium has', () => {
    const outcome = { version: 3, ok: false, endMs: 12000, hash: null, problems: [], rules: [{ id: 'a', status: 'pass' }, { id: 'b', status: 'fail' }, { id: 'c', status: 'pending' }] } as never;
    expect(outcomeText(outcome)).toBe('1 pass, 1 fail, 1 other · 12000 ms');
    const change = { kind: 'rule', rule: 'r1', label: 'Guard stops the arm', from: 'pass', to: 'fail' } as const;
    expect(changeText(change)).toBe('rule Guard stops the arm: pass → fail');
    expect(changeText(change, 'to')).toBe('rule Guard stops the arm: pass to fail');
  });

  it('gives a verdict with its version, and the prover\'s words only when asked', () => {
    const v = { status: 'violated', version: 4, detail: 'after 3 scans' } as never;
    expect(verdictText(v)).toBe('VIOLATED (v4)');
    expect(verdictText(v, true)).toBe('VIOLATED (v4)\nafter 3 scans');
    expect(verdictText(null)).toBe('not proved');
  });
});
