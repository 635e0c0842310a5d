/**
 * Rule monitors: each interlock rule becomes one "bad" literal over a scan's signals, with
 * monitor state bits where the rule looks back (a `within` window, a rising trigger).
 * The rule holds on a run exactly when `bad` is false after every scan, which turns every
 * rule into a safety property over the transition system.
 */
import { neg, constBits, eqConst, increment, leConst, muxBits, widthFor, type Lit } from './aig';
import type { EncodedSheet } from './encode';
import { canonicalAddress, type InterlockRule, type RuleCondition } from './rules';

/** A condition as a literal over the post-scan signals. */
export function conditionLit(enc: EncodedSheet, c: RuleCondition): Lit {
  const g = enc.system.aig;
  if ('signal' in c) {
    const s = enc.signal(canonicalAddress(c.signal));
    return c.value === 'on' ? s : neg(s);
  }
  if ('all' in c) return g.andAll(c.all.map((x) => conditionLit(enc, x)));
  if ('any' in c) return g.orAll(c.any.map((x) => conditionLit(enc, x)));
  return neg(conditionLit(enc, c.not));
}

/**
 * Adds a rule's monitor to the encoded sheet and returns its bad literal: true after a
 * scan that breaks the rule.
 *
 * `within` keeps the age of the oldest trigger not yet answered (a trigger is answered
 * by `expect` at its own scan or a later one; one answer serves every pending trigger,
 * so the oldest alone decides). The rule breaks at the scan where that age reaches the
 * window with `expect` still off.
 */
export function addMonitor(enc: EncodedSheet, rule: InterlockRule): Lit {
  const ts = enc.system;
  const g = ts.aig;
  switch (rule.kind) {
    case 'never':
      return g.and(conditionLit(enc, rule.what), conditionLit(enc, rule.while));
    case 'only-if':
      return g.and(conditionLit(enc, rule.what), neg(g.andAll(rule.requires.map((c) => conditionLit(enc, c)))));
    case 'within': {
      const x = conditionLit(enc, rule.after);
      const y = conditionLit(enc, rule.expect);
      let trigger = x;
      if (rule.trigger === 'rises') {
        // Memory starts off, so `after` holding at the first scan counts as turning true.
        const was = ts.addState(false, `${rule.id}.after-was`);
        ts.setNext(was, x);
        trigger = g.and(x, neg(was));
      }
      const n = rule.scans;
      if (n === 0) return g.and(trigger, neg(y));
      const pending = ts.addState(false, `${rule.id}.pending`);
      const w = widthFor(n - 1);
      const age = Array.from({ length: w }, (_, k) => ts.addState(false, `${rule.id}.age[${k}]`));
      // Invariants while no scan has broken the rule: age < n, and 0 when nothing is pending.
      if (w > 0) {
        ts.constraints.push({ lit: leConst(g, age, n - 1), owner: `${rule.id}.age` });
        ts.constraints.push({ lit: g.or(pending, eqConst(g, age, 0)), owner: `${rule.id}.age` });
      }
      const bad = g.and(neg(y), g.and(pending, eqConst(g, age, n - 1)));
      const waiting = g.and(neg(y), pending);
      ts.setNext(pending, g.and(neg(y), g.or(pending, trigger)));
      const nextAge = muxBits(g, waiting, increment(g, age), constBits(0, w));
      age.forEach((b, k) => ts.setNext(b, nextAge[k]));
      return bad;
    }
  }
}
