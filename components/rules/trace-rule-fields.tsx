'use client';
/**
 * Trace rules (a drill's grading rules, a scenario's rules) built with the same pickers and
 * all / any / not builder as interlock rules: a kind (never, always, after E within T,
 * eventually within T) and conditions over any signal of the cell. Stored in the engine's
 * rule format unchanged (simulator/trace/rules.ts), so existing drills and scenarios read back.
 */
import { useMemo } from 'react';
import { ruleSchema, type Rule, type SignalPredicate } from '@/simulator';
import { cn } from '@/components/ui/cn';
import { ConditionBuilder } from './condition-builder';
import { leaves, type Tree } from './condition-tree';
import { newTraceLeaf, TraceLeafEditor, type TraceLeaf } from './leaf-editors';
import { traceRuleSentence } from './sentences';
import { bitValues, optionLabels, type SignalOption } from './signal-catalogue';

export const TRACE_RULE_KINDS = [
  { kind: 'never', words: 'Never …' },
  { kind: 'always', words: 'Always …' },
  { kind: 'after', words: 'Each time …, then … within a time' },
  { kind: 'eventually', words: 'Within a time from the start, … at least once' },
] as const;
export type TraceRuleKind = (typeof TRACE_RULE_KINDS)[number]['kind'];

/** A predicate tree as the builder edits it (the engine's SignalPredicate). */
export type PredicateTree = Tree<TraceLeaf>;

const inputCls = 'rounded-md border border-slate-300 bg-white px-2 py-1.5 text-sm focus:border-accent-600 focus:outline-none focus:ring-2 focus:ring-accent-600/30';

/** A trace condition: the builder with signal, comparison and value on each row. */
export function TraceConditionField({ value, onChange, label, options, disabled }: { value: PredicateTree; onChange: (t: PredicateTree) => void; label: string; options: readonly SignalOption[]; disabled?: boolean }) {
  return (
    <ConditionBuilder<TraceLeaf>
      value={value}
      onChange={onChange}
      label={label}
      newLeaf={newTraceLeaf}
      disabled={disabled}
      maxDepth={12}
      renderLeaf={(leaf, set, n) => <TraceLeafEditor leaf={leaf} onChange={set} name={n} options={options} disabled={disabled} />}
    />
  );
}

/** How many conditions of a predicate still have no signal. */
export function blankSignals(p: PredicateTree): number {
  return leaves(p).filter((l) => !l.leaf.signal.trim()).length;
}

/** A trace rule as a sentence with the cell's labels (memoised on the options). */
export function useTraceSentence(options: readonly SignalOption[]) {
  const labels = useMemo(() => optionLabels(options), [options]);
  const bits = useMemo(() => bitValues(options), [options]);
  return (rule: Rule) => traceRuleSentence(rule, labels, bits);
}

/** Editor of one whole trace rule (a scenario's rule list uses it; the drill editor wires the same pieces into its form). */
export function TraceRuleFields({ value, onChange, options, name }: { value: Rule; onChange: (r: Rule) => void; options: readonly SignalOption[]; name: string }) {
  const sentence = useTraceSentence(options);
  const event = value.kind === 'after' ? value.event : newTraceLeaf();
  const withinMs = value.kind === 'after' || value.kind === 'eventually' ? value.withinMs : 1000;
  const setKind = (kind: TraceRuleKind) => {
    const common = { id: value.id, ...(value.label ? { label: value.label } : {}) };
    if (kind === 'after') onChange({ ...common, kind, event: event as SignalPredicate, withinMs, p: value.p });
    else if (kind === 'eventually') onChange({ ...common, kind, withinMs, p: value.p });
    else onChange({ ...common, kind, p: value.p });
  };
  const valid = ruleSchema.safeParse(value).success && blankSignals(value.p as PredicateTree) === 0 && (value.kind !== 'after' || blankSignals(value.event as PredicateTree) === 0);
  return (
    <div className="space-y-2" data-testid={`trace-rule-${value.id}`}>
      <div className="flex flex-wrap items-end gap-2">
        <label className="text-xs font-medium text-slate-600">
          Shown as
          <input aria-label={`${name}: shown as`} value={value.label ?? ''} onChange={(e) => onChange({ ...value, label: e.target.value || undefined } as Rule)} className={cn(inputCls, 'mt-1 block w-64')} />
        </label>
        <label className="text-xs font-medium text-slate-600">
          Kind
          <select aria-label={`${name}: kind`} value={value.kind} onChange={(e) => setKind(e.target.value as TraceRuleKind)} className={cn(inputCls, 'mt-1 block')}>
            {TRACE_RULE_KINDS.map((k) => (
              <option key={k.kind} value={k.kind}>
                {k.words}
              </option>
            ))}
          </select>
        </label>
        {value.kind === 'after' || value.kind === 'eventually' ? (
          <label className="text-xs font-medium text-slate-600">
            Within (ms)
            <input
              aria-label={`${name}: within (ms)`}
              type="number"
              min={0}
              value={withinMs}
              onChange={(e) => onChange({ ...value, withinMs: Math.max(0, Math.round(Number(e.target.value) || 0)) } as Rule)}
              className={cn(inputCls, 'mt-1 block w-28')}
            />
          </label>
        ) : null}
      </div>
      {value.kind === 'after' ? (
        <div>
          <p className="text-xs font-semibold text-slate-600">Each time this becomes true</p>
          <TraceConditionField value={value.event as PredicateTree} onChange={(t) => onChange({ ...value, event: t as SignalPredicate })} label={`${name} event`} options={options} />
        </div>
      ) : null}
      <div>
        <p className="text-xs font-semibold text-slate-600">{value.kind === 'never' ? 'This must never hold' : value.kind === 'always' ? 'This must always hold' : 'This must hold'}</p>
        <TraceConditionField value={value.p as PredicateTree} onChange={(t) => onChange({ ...value, p: t as SignalPredicate } as Rule)} label={`${name} condition`} options={options} />
      </div>
      <p className={cn('text-sm', valid ? 'text-slate-800' : 'text-amber-900')} data-testid="trace-rule-sentence">
        {sentence(value)}
      </p>
    </div>
  );
}
