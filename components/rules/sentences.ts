/**
 * Rules read back as plain sentences. An interlock rule is worded by the engine's own
 * `describeRule` (the same words its verdicts carry); a rule still being built may have
 * conditions without a signal yet, which read as "(choose a signal)". Trace rules (drills
 * and scenarios: never / always / after / eventually over any signal) are worded here.
 */
import { describeRule, type InterlockRuleInput, type Rule, type RuleCondition, type SignalLabels, type SignalPredicate } from '@/simulator';
import { isLeaf, type Tree } from './condition-tree';

export const CHOOSE_SIGNAL = '(choose a signal)';

function fillBlanks<L extends { signal: string }>(tree: Tree<L>, blank: string): Tree<L> {
  if (isLeaf(tree)) return tree.signal.trim() ? tree : { ...tree, signal: blank };
  if ('not' in tree) return { not: fillBlanks(tree.not, blank) };
  if ('all' in tree) return { all: tree.all.map((t) => fillBlanks(t, blank)) };
  return { any: tree.any.map((t) => fillBlanks(t, blank)) };
}

/** An interlock rule (possibly half-built) as the sentence its verdict will carry. */
export function interlockSentence(rule: InterlockRuleInput, labels?: SignalLabels): string {
  const f = (c: RuleCondition) => fillBlanks<{ signal: string; value: 'on' | 'off' }>(c, CHOOSE_SIGNAL) as RuleCondition;
  switch (rule.kind) {
    case 'never':
      return describeRule({ ...rule, what: f(rule.what), while: f(rule.while) }, labels);
    case 'only-if':
      return describeRule({ ...rule, what: f(rule.what), requires: rule.requires.map(f) }, labels);
    case 'within':
      return describeRule({ ...rule, after: f(rule.after), expect: f(rule.expect) }, labels);
  }
}

/** Trace-rule signal labels: by the signal's full name (`plc.%IX0.4`, `dev.estop.latched`). */
export type TraceLabels = Record<string, string>;

const OP_WORDS: Record<string, string> = { '==': 'is', '!=': 'is not', '>': 'is above', '>=': 'is at least', '<': 'is below', '<=': 'is at most' };

function leafText(p: { signal: string; op: string; value: number | string | boolean }, labels: TraceLabels | undefined, bits: ReadonlySet<string> | undefined): string {
  const name = p.signal.trim() || CHOOSE_SIGNAL;
  const label = labels?.[name];
  const who = label ? `${label} (${name})` : name;
  const isBit = bits?.has(name) && (p.value === 0 || p.value === 1 || typeof p.value === 'boolean') && (p.op === '==' || p.op === '!=');
  if (isBit) {
    const on = p.value === 1 || p.value === true;
    return `${who} is ${(p.op === '==') === on ? 'on' : 'off'}`;
  }
  const value = typeof p.value === 'string' ? `“${p.value}”` : String(p.value);
  return `${who} ${OP_WORDS[p.op] ?? p.op} ${value}`;
}

function predicateText(p: SignalPredicate, labels: TraceLabels | undefined, bits: ReadonlySet<string> | undefined, nested: boolean): string {
  if ('signal' in p) return leafText(p, labels, bits);
  if ('not' in p) return `not ${predicateText(p.not, labels, bits, true)}`;
  const parts = 'all' in p ? p.all : p.any;
  if (parts.length === 1) return predicateText(parts[0], labels, bits, nested);
  const text = parts.map((x) => predicateText(x, labels, bits, true)).join('all' in p ? ' and ' : ' or ');
  return nested ? `(${text})` : text;
}

/** A trace predicate in words, e.g. `Front guard (plc.%IX0.4) is off and not (Arm moving (arm.moving) is on)`. */
export function describePredicate(p: SignalPredicate, labels?: TraceLabels, bits?: ReadonlySet<string>): string {
  return predicateText(p, labels, bits, false);
}

function duration(ms: number): string {
  if (ms % 60_000 === 0 && ms >= 60_000) return `${ms / 60_000} min`;
  if (ms % 1000 === 0 && ms >= 1000) return `${ms / 1000} s`;
  return `${ms} ms`;
}

/** A trace rule (drill grading rule, scenario rule) as a sentence. */
export function traceRuleSentence(rule: Rule, labels?: TraceLabels, bits?: ReadonlySet<string>): string {
  const p = (x: SignalPredicate) => predicateText(x, labels, bits, true);
  switch (rule.kind) {
    case 'never':
      return `Never ${p(rule.p)}`;
    case 'always':
      return `Always ${p(rule.p)}`;
    case 'after':
      return `Each time ${p(rule.event)} becomes true, ${p(rule.p)} within ${duration(rule.withinMs)}`;
    case 'eventually':
      return `Within the first ${duration(rule.withinMs)}, ${p(rule.p)} at least once`;
  }
}
