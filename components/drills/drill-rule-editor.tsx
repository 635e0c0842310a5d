'use client';
/**
 * One grading rule in the drill editor, built with the rule builder: its kind, the conditions
 * (signal pickers that search by label, address and wire; a nested all / any / not builder),
 * the window, the weight, and the rule read back as a sentence. Stored in the engine's rule
 * format (lib/schemas/drills.ts), as before.
 */
import { Controller, useWatch, type Control, type UseFormRegister } from 'react-hook-form';
import { Trash2 } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { cn } from '@/components/ui/cn';
import { TraceConditionField, TRACE_RULE_KINDS, useTraceSentence } from '@/components/rules/trace-rule-fields';
import type { SignalOption } from '@/components/rules/signal-catalogue';
import type { Rule } from '@/simulator';
import { fromCondition, type DrillFormValues } from './drill-form';
import { FieldError, inputCls, Labelled, type ErrFn } from './form-bits';

type Props = { index: number; control: Control<DrillFormValues>; register: UseFormRegister<DrillFormValues>; err: ErrFn; signals: readonly SignalOption[]; onRemove: () => void };

export function DrillRuleEditor({ index, control, register, err, signals, onRemove }: Props) {
  const p = `rules.${index}` as const;
  const value = useWatch({ control, name: p });
  const sentence = useTraceSentence(signals);
  const kind = value?.kind ?? 'never';
  let text = '';
  try {
    const common = { id: value.id, label: value.label };
    const rule = (kind === 'after' ? { ...common, kind, event: fromCondition(value.event), withinMs: value.withinMs, p: fromCondition(value.p) } : kind === 'eventually' ? { ...common, kind, withinMs: value.withinMs, p: fromCondition(value.p) } : { ...common, kind, p: fromCondition(value.p) }) as Rule;
    text = sentence(rule);
  } catch {
    text = '';
  }
  return (
    <fieldset className="rounded-md border border-slate-200 p-3" data-testid={`rule-${index}`}>
      <legend className="px-1 text-xs font-semibold text-slate-700">Rule {index + 1}</legend>
      <div className="grid gap-3 md:grid-cols-5">
        <Labelled id={`${p}.id`} label="Rule id" error={err(`${p}.id`)}>
          <input id={`${p}.id`} className={cn(inputCls, 'font-mono')} {...register(`${p}.id`)} />
        </Labelled>
        <Labelled id={`${p}.kind`} label="Kind">
          <select id={`${p}.kind`} className={inputCls} {...register(`${p}.kind`)}>
            {TRACE_RULE_KINDS.map((k) => (
              <option key={k.kind} value={k.kind}>
                {k.words}
              </option>
            ))}
          </select>
        </Labelled>
        <Labelled id={`${p}.label`} label="Shown as" className="md:col-span-2">
          <input id={`${p}.label`} className={inputCls} {...register(`${p}.label`)} />
        </Labelled>
        <Labelled id={`${p}.weight`} label="Weight" error={err(`${p}.weight`)}>
          <input id={`${p}.weight`} type="number" min={0} max={1000} className={inputCls} {...register(`${p}.weight`, { valueAsNumber: true })} />
        </Labelled>
        {kind === 'after' || kind === 'eventually' ? (
          <Labelled id={`${p}.withinMs`} label={kind === 'after' ? 'Within (ms after each time)' : 'Within (ms from the start)'} error={err(`${p}.withinMs`)}>
            <input id={`${p}.withinMs`} type="number" min={0} className={inputCls} {...register(`${p}.withinMs`, { valueAsNumber: true })} />
          </Labelled>
        ) : null}
      </div>
      {kind === 'after' ? (
        <div className="mt-2 rounded border border-slate-200 bg-white p-2">
          <p className="mb-1 text-xs font-medium text-slate-600">Each time this becomes true</p>
          <Controller control={control} name={`${p}.event`} render={({ field }) => <TraceConditionField value={field.value} onChange={field.onChange} label={`Rule ${index + 1} event`} options={signals} />} />
          <FieldError message={err(`${p}.event`)} />
        </div>
      ) : null}
      <div className="mt-2 rounded border border-slate-200 bg-white p-2">
        <p className="mb-1 text-xs font-medium text-slate-600">{kind === 'never' ? 'This must never hold' : kind === 'always' ? 'This must always hold' : kind === 'after' ? 'then this must hold' : 'This must hold at least once'}</p>
        <Controller control={control} name={`${p}.p`} render={({ field }) => <TraceConditionField value={field.value} onChange={field.onChange} label={`Rule ${index + 1} condition`} options={signals} />} />
        <FieldError message={err(`${p}.p`)} />
      </div>
      <div className="mt-2 flex items-start justify-between gap-2">
        <p className="text-sm text-slate-800" data-testid="drill-rule-sentence">
          {text}
        </p>
        <Button variant="ghost" onClick={onRemove} aria-label={`Remove rule ${index + 1}`}>
          <Trash2 aria-hidden className="h-4 w-4" /> Remove
        </Button>
      </div>
    </fieldset>
  );
}
