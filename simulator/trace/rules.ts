/**
 * Rules over a trace: never P, always P, after E within T ms P, within T ms eventually P.
 * Signals are piecewise constant between samples, so a rule is checked at every sample time
 * (after all samples at that time) — the only instants where anything can change.
 */
import { z } from 'zod';
import type { Problem, Result } from '@/simulator/shared/result';
import { signalPredicateSchema } from '@/simulator/faults/fault-card';
import { compilePredicate, predicateSignals, type CompiledPredicate, type SignalValue } from './predicate';
import type { Trace } from './trace';

const id = z.string().min(1).max(64);
const ms = z.number().int().min(0).max(30 * 86_400_000);

/** A rule. */
export const ruleSchema = z.discriminatedUnion('kind', [
  z.object({ id, kind: z.literal('never'), p: signalPredicateSchema, label: z.string().max(200).optional() }),
  z.object({ id, kind: z.literal('always'), p: signalPredicateSchema, label: z.string().max(200).optional() }),
  /** Each time E becomes true, P must hold at some instant within the next T ms. */
  z.object({ id, kind: z.literal('after'), event: signalPredicateSchema, withinMs: ms, p: signalPredicateSchema, label: z.string().max(200).optional() }),
  /** P must hold at some instant within the first T ms of the trace. */
  z.object({ id, kind: z.literal('eventually'), withinMs: ms, p: signalPredicateSchema, label: z.string().max(200).optional() }),
]);
/** A list of rules (the headless runner's `--rules` file). */
export const rulesSchema = z.array(ruleSchema).max(1000);

/** A rule. */
export type Rule = z.infer<typeof ruleSchema>;

/** Outcome of one rule. `inconclusive` when the trace ends before a deadline. */
export type RuleResult = {
  id: string;
  kind: Rule['kind'];
  status: 'pass' | 'fail' | 'inconclusive';
  /** Time of the first violation (ms), with the values of the rule's signals then. */
  violation?: { timeMs: number; values: Record<string, SignalValue | null>; message: string };
};

/** Signals a rule reads (they must be in the trace). */
export function ruleSignals(rule: Rule): string[] {
  const out: string[] = [];
  if (rule.kind === 'after') predicateSignals(rule.event, out);
  predicateSignals(rule.p, out);
  return out;
}

/** Checks rules against a trace. Every rule naming a signal the trace lacks is a problem. */
export function checkRules(trace: Trace, rules: readonly Rule[]): Result<RuleResult[], Problem> {
  const index = new Map(trace.signals.map((s, i) => [s, i]));
  const problems: Problem[] = [];
  const compiled = rules.map((rule, r) => {
    const known = (n: string) => index.has(n);
    const p = compilePredicate(rule.p, known, [r, 'p']);
    const e = rule.kind === 'after' ? compilePredicate(rule.event, known, [r, 'event']) : null;
    if (!p.ok) problems.push(...p.errors.map((x) => ({ ...x, message: `${x.message} in the trace (add it to --trace)` })));
    if (e && !e.ok) problems.push(...e.errors.map((x) => ({ ...x, message: `${x.message} in the trace (add it to --trace)` })));
    return { rule, p: p.ok ? p.value : null, e: e && e.ok ? e.value : null };
  });
  if (problems.length > 0) return { ok: false, errors: problems };

  // Instants: every distinct sample time; values after applying all samples at that time.
  const values: (SignalValue | null)[] = trace.signals.map(() => null);
  const read = (n: string) => values[index.get(n)!] ?? 0;
  type St = { done: boolean; result: RuleResult; prevE: boolean; pending: number[] };
  const states: St[] = compiled.map(({ rule }) => ({ done: false, result: { id: rule.id, kind: rule.kind, status: 'pass' }, prevE: false, pending: [] }));
  const snapshotOf = (rule: Rule) => {
    const out: Record<string, SignalValue | null> = {};
    for (const s of ruleSignals(rule)) out[s] = values[index.get(s)!] ?? null;
    return out;
  };
  const fail = (st: St, rule: Rule, t: number, message: string) => {
    st.done = true;
    st.result = { id: rule.id, kind: rule.kind, status: 'fail', violation: { timeMs: t, values: snapshotOf(rule), message } };
  };
  // Deadline checks happen at the deadline itself, with the values holding then.
  const checkDeadlines = (upTo: number, inclusive: boolean) => {
    compiled.forEach(({ rule }, r) => {
      const st = states[r];
      if (st.done) return;
      if (rule.kind === 'after') {
        while (st.pending.length > 0 && (inclusive ? st.pending[0] <= upTo : st.pending[0] < upTo)) {
          const due = st.pending[0];
          fail(st, rule, due, `within ${rule.withinMs} ms after the event at ${due - rule.withinMs} ms, P never held`);
          return;
        }
      } else if (rule.kind === 'eventually' && (inclusive ? rule.withinMs <= upTo : rule.withinMs < upTo)) {
        fail(st, rule, rule.withinMs, `P did not hold within ${rule.withinMs} ms`);
      }
    });
  };

  let k = 0;
  const n = trace.samples.length;
  while (k < n) {
    const t = trace.samples[k][0];
    checkDeadlines(t, false);
    while (k < n && trace.samples[k][0] === t) {
      values[trace.samples[k][1]] = trace.samples[k][2];
      k++;
    }
    compiled.forEach(({ rule, p, e }, r) => evaluate(states[r], rule, p!, e, t));
  }
  checkDeadlines(trace.endMs, true);
  // Deadlines beyond the end of the trace cannot be decided.
  compiled.forEach(({ rule }, r) => {
    const st = states[r];
    if (st.done) return;
    if ((rule.kind === 'after' && st.pending.length > 0) || (rule.kind === 'eventually' && rule.withinMs > trace.endMs)) {
      st.result = { id: rule.id, kind: rule.kind, status: 'inconclusive' };
    }
  });
  return { ok: true, value: states.map((s) => s.result) };

  function evaluate(st: St, rule: Rule, p: CompiledPredicate, e: CompiledPredicate | null, t: number): void {
    if (st.done) return;
    const holds = p(read);
    switch (rule.kind) {
      case 'never':
        if (holds) fail(st, rule, t, 'P held');
        return;
      case 'always':
        if (!holds) fail(st, rule, t, 'P did not hold');
        return;
      case 'eventually':
        if (holds && t <= rule.withinMs) st.done = true;
        return;
      case 'after': {
        const ev = e!(read);
        if (ev && !st.prevE) st.pending.push(t + rule.withinMs);
        st.prevE = ev;
        if (holds) st.pending = [];
        return;
      }
    }
  }
}
