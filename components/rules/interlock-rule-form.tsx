'use client';
/**
 * The interlock rule form a lead reads and writes: a kind picker ("Never … while …",
 * "… only if … and …", "After …, … within N scans"), condition builders with signal pickers
 * and on/off toggles, and the rule read back as a plain sentence as it is built.
 */
import { useMemo, useState } from 'react';
import { Controller, useFieldArray, useForm, useWatch, type Resolver, type ResolverResult } from 'react-hook-form';
import { Plus, Trash2 } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { cn } from '@/components/ui/cn';
import { ConditionBuilder } from './condition-builder';
import { BitLeafEditor, newBitLeaf, type BitLeaf } from './leaf-editors';
import { interlockSentence } from './sentences';
import { optionLabels, type SignalOption } from './signal-catalogue';
import { emptyInterlockForm, interlockFormProblems, KIND_TEMPLATES, switchKind, toInterlockBody, type InterlockBody, type InterlockFormValues, type InterlockKind } from './interlock-form-model';
import type { Tree } from './condition-tree';

type Props = {
  options: readonly SignalOption[];
  initial?: InterlockFormValues;
  /** The PLC's scan period on the proposal, to say what N scans means in time. */
  scanPeriodMs?: number;
  submitLabel: string;
  onSubmit: (input: { title: string; rule: InterlockBody }) => Promise<void>;
  onCancel?: () => void;
};

const inputCls = 'block w-full rounded-md border border-slate-300 bg-white px-2 py-1.5 text-sm focus:border-accent-600 focus:outline-none focus:ring-2 focus:ring-accent-600/30';

const resolver: Resolver<InterlockFormValues> = async (values) => {
  const problems = interlockFormProblems(values);
  if (problems.length === 0) return { values, errors: {} } as ResolverResult<InterlockFormValues>;
  return { values: {}, errors: { root: { type: 'rule', message: problems.join(' ') } } } as ResolverResult<InterlockFormValues>;
};

export function InterlockRuleForm({ options, initial, scanPeriodMs, submitLabel, onSubmit, onCancel }: Props) {
  const form = useForm<InterlockFormValues>({ defaultValues: initial ?? emptyInterlockForm(), resolver });
  const { control, register, handleSubmit, formState, setError, getValues, reset } = form;
  const requires = useFieldArray({ control, name: 'requires' as never });
  const values = useWatch({ control }) as InterlockFormValues;
  const labels = useMemo(() => optionLabels(options), [options]);
  const [saving, setSaving] = useState(false);
  const kind = values.kind;
  const sentence = interlockSentence({ id: 'preview', title: values.title ?? '', ...toInterlockBody({ ...emptyInterlockForm(), ...values }) }, labels);

  const builder = (name: 'what' | 'while' | 'after' | 'expect', label: string) => (
    <Controller
      control={control}
      name={name}
      render={({ field }) => (
        <ConditionBuilder<BitLeaf>
          value={field.value}
          onChange={field.onChange}
          label={label}
          newLeaf={newBitLeaf}
          renderLeaf={(leaf, set, n) => <BitLeafEditor leaf={leaf} onChange={set} name={n} options={options} />}
        />
      )}
    />
  );

  const submit = handleSubmit(async (v) => {
    setSaving(true);
    try {
      await onSubmit({ title: v.title.trim(), rule: toInterlockBody(v) });
      if (!initial) reset(emptyInterlockForm());
    } catch (e) {
      setError('root', { type: 'server', message: e instanceof Error ? e.message : 'The rule could not be saved.' });
    } finally {
      setSaving(false);
    }
  });

  return (
    <form onSubmit={submit} noValidate aria-label="Interlock rule" className="space-y-4" data-testid="interlock-rule-form">
      <div className="space-y-1">
        <label htmlFor="interlock-title" className="block text-xs font-medium text-slate-600">
          Title
        </label>
        <input id="interlock-title" className={inputCls} placeholder="e.g. No start with a guard open" {...register('title')} />
      </div>

      <fieldset>
        <legend className="mb-1 text-xs font-medium text-slate-600">Kind of rule</legend>
        <div role="radiogroup" aria-label="Kind of rule" className="grid gap-2 md:grid-cols-3">
          {(Object.keys(KIND_TEMPLATES) as InterlockKind[]).map((k) => (
            <button
              key={k}
              type="button"
              role="radio"
              aria-checked={kind === k}
              onClick={() => reset(switchKind(getValues(), k), { keepDefaultValues: true })}
              className={cn('rounded-md border p-2 text-left', kind === k ? 'border-accent-700 bg-accent-50 ring-1 ring-accent-700' : 'border-slate-300 bg-white hover:bg-slate-50')}
            >
              <span className="block text-sm font-semibold text-slate-900">{KIND_TEMPLATES[k].words}</span>
              <span className="block text-xs text-slate-600">{KIND_TEMPLATES[k].hint}</span>
            </button>
          ))}
        </div>
      </fieldset>

      {kind === 'never' ? (
        <div className="space-y-2">
          <Part word="Never">{builder('what', 'What')}</Part>
          <Part word="while">{builder('while', 'While')}</Part>
        </div>
      ) : null}

      {kind === 'only-if' ? (
        <div className="space-y-2">
          <Part word="">{builder('what', 'What')}</Part>
          {requires.fields.map((f, i) => (
            <Part key={f.id} word={i === 0 ? 'only if' : 'and'}>
              <div className="flex items-start gap-2">
                <div className="min-w-0 flex-1">
                  <Controller
                    control={control}
                    name={`requires.${i}`}
                    render={({ field }) => (
                      <ConditionBuilder<BitLeaf>
                        value={field.value as Tree<BitLeaf>}
                        onChange={field.onChange}
                        label={`Requirement ${i + 1}`}
                        newLeaf={newBitLeaf}
                        renderLeaf={(leaf, set, n) => <BitLeafEditor leaf={leaf} onChange={set} name={n} options={options} />}
                      />
                    )}
                  />
                </div>
                {requires.fields.length > 1 ? (
                  <Button variant="ghost" aria-label={`Remove requirement ${i + 1}`} onClick={() => requires.remove(i)}>
                    <Trash2 aria-hidden className="h-4 w-4" />
                  </Button>
                ) : null}
              </div>
            </Part>
          ))}
          <div className="pl-20">
            <Button variant="secondary" onClick={() => requires.append(newBitLeaf() as never)}>
              <Plus aria-hidden className="h-4 w-4" /> Another requirement
            </Button>
          </div>
        </div>
      ) : null}

      {kind === 'within' ? (
        <div className="space-y-2">
          <Part word="After">
            {builder('after', 'After')}
            <label className="mt-1 flex items-center gap-2 text-xs text-slate-600">
              counts
              <select aria-label="When the window starts" className="rounded border border-slate-300 bg-white px-1 py-0.5" {...register('trigger')}>
                <option value="rises">each time it turns true</option>
                <option value="holds">every scan it is true</option>
              </select>
            </label>
          </Part>
          <Part word="then">{builder('expect', 'Then')}</Part>
          <Part word="within">
            <div className="flex items-center gap-2 text-sm">
              <input aria-label="Within how many scans" type="number" min={0} max={10_000} className={cn(inputCls, 'w-24')} {...register('scans', { valueAsNumber: true })} />
              scans{scanPeriodMs ? <span className="text-xs text-slate-500">({(values.scans ?? 0) * scanPeriodMs} ms at this cell’s {scanPeriodMs} ms scan)</span> : null}
            </div>
          </Part>
        </div>
      ) : null}

      <div className="rounded-md border border-slate-200 bg-slate-50 px-3 py-2">
        <p className="text-xs font-medium text-slate-500">Reads as</p>
        <p className="text-sm text-slate-900" data-testid="rule-sentence">
          {sentence}
        </p>
      </div>

      {formState.errors.root?.message ? <Notice tone="error">{formState.errors.root.message}</Notice> : null}
      <div className="flex gap-2">
        <Button type="submit" disabled={saving}>
          {saving ? 'Saving…' : submitLabel}
        </Button>
        {onCancel ? (
          <Button variant="ghost" onClick={onCancel}>
            Cancel
          </Button>
        ) : null}
      </div>
    </form>
  );
}

function Part({ word, children }: { word: string; children: React.ReactNode }) {
  return (
    <div className="grid grid-cols-[4.5rem_1fr] items-start gap-2">
      <span className="pt-2 text-right text-sm font-semibold text-slate-700">{word}</span>
      <div className="min-w-0">{children}</div>
    </div>
  );
}
