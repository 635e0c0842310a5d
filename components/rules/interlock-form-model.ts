/**
 * The interlock rule form's values and their conversion to and from the stored rule (kind and
 * conditions, simulator/prove/rules.ts). The form keeps every kind's fields, so switching the
 * kind picker back and forth loses nothing: "never X while Y" becomes "X only if …" with X kept.
 */
import { interlockRuleSchema, type InterlockRuleInput, type RuleCondition } from '@/simulator';
import { leaves, type Tree } from './condition-tree';
import { newBitLeaf, type BitLeaf } from './leaf-editors';

export type InterlockKind = 'never' | 'only-if' | 'within';

export type InterlockFormValues = {
  title: string;
  kind: InterlockKind;
  what: Tree<BitLeaf>;
  while: Tree<BitLeaf>;
  requires: Tree<BitLeaf>[];
  after: Tree<BitLeaf>;
  expect: Tree<BitLeaf>;
  scans: number;
  trigger: 'rises' | 'holds';
};

/** A rule's kind and conditions, as stored (no id, no title). */
export type InterlockBody = DistributiveOmit<InterlockRuleInput, 'id' | 'title'>;
type DistributiveOmit<T, K extends PropertyKey> = T extends unknown ? Omit<T, K> : never;

export const KIND_TEMPLATES: Record<InterlockKind, { words: string; hint: string }> = {
  never: { words: 'Never … while …', hint: 'Something must never be on (or off) while something else is — a start while a guard is open.' },
  'only-if': { words: '… only if … and …', hint: 'Something may be on only when every requirement holds in the same scan.' },
  within: { words: 'After …, … within N scans', hint: 'Once something happens, something else must follow within a number of PLC scans.' },
};

export function emptyInterlockForm(): InterlockFormValues {
  return { title: '', kind: 'never', what: newBitLeaf(), while: { ...newBitLeaf(), value: 'off' }, requires: [newBitLeaf()], after: newBitLeaf(), expect: newBitLeaf(), scans: 1, trigger: 'rises' };
}

const asTree = (c: RuleCondition): Tree<BitLeaf> => c as Tree<BitLeaf>;
const asCondition = (t: Tree<BitLeaf>): RuleCondition => t as RuleCondition;

/** A stored rule as form values (the other kinds' fields start from its first condition). */
export function toInterlockForm(title: string, body: InterlockBody): InterlockFormValues {
  const base = emptyInterlockForm();
  switch (body.kind) {
    case 'never':
      return { ...base, title, kind: 'never', what: asTree(body.what), while: asTree(body.while), after: asTree(body.what) };
    case 'only-if':
      return { ...base, title, kind: 'only-if', what: asTree(body.what), requires: body.requires.map(asTree), after: asTree(body.what) };
    case 'within':
      return { ...base, title, kind: 'within', after: asTree(body.after), expect: asTree(body.expect), what: asTree(body.after), scans: body.scans, trigger: body.trigger ?? 'rises' };
  }
}

/** The stored rule for form values (kind and conditions only). */
export function toInterlockBody(v: InterlockFormValues): InterlockBody {
  switch (v.kind) {
    case 'never':
      return { kind: 'never', what: asCondition(v.what), while: asCondition(v.while) };
    case 'only-if':
      return { kind: 'only-if', what: asCondition(v.what), requires: v.requires.map(asCondition) };
    case 'within':
      return { kind: 'within', after: asCondition(v.after), expect: asCondition(v.expect), scans: v.scans, trigger: v.trigger };
  }
}

/** Switching kinds carries the main condition across ("never X" ↔ "X only if" ↔ "after X"). */
export function switchKind(v: InterlockFormValues, kind: InterlockKind): InterlockFormValues {
  if (kind === v.kind) return v;
  const main = v.kind === 'within' ? v.after : v.what;
  return { ...v, kind, what: kind === 'within' ? v.what : main, after: kind === 'within' ? main : v.after };
}

/**
 * What still needs doing before the rule can be saved, as sentences (empty when it can): a
 * condition without a signal, a bad window, and anything else the engine's schema refuses.
 */
export function interlockFormProblems(v: InterlockFormValues): string[] {
  const out: string[] = [];
  if (!v.title.trim()) out.push('Give the rule a short title.');
  const body = toInterlockBody(v);
  const trees: Tree<BitLeaf>[] = body.kind === 'never' ? [v.what, v.while] : body.kind === 'only-if' ? [v.what, ...v.requires] : [v.after, v.expect];
  const blanks = trees.flatMap((t) => leaves(t)).filter((l) => !l.leaf.signal.trim()).length;
  if (blanks > 0) out.push(blanks === 1 ? 'One condition has no signal yet: choose one.' : `${blanks} conditions have no signal yet: choose them.`);
  if (body.kind === 'within' && !(Number.isInteger(v.scans) && v.scans >= 0 && v.scans <= 10_000)) out.push('The window is a whole number of scans from 0 to 10,000.');
  if (out.length === 0) {
    const parsed = interlockRuleSchema.safeParse({ id: 'rule', title: v.title.trim(), ...body });
    if (!parsed.success) out.push(...parsed.error.issues.map((i) => i.message));
  }
  return out;
}
