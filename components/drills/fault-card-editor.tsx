'use client';
/**
 * One hidden fault card in the drill editor: its kind, and the wire, device or module it
 * acts on picked from the base cell (only the devices the kind applies to are offered), its
 * parameters, and when it appears — from the start, at a cell time, or when a condition built
 * with the rule builder first holds.
 */
import { Controller, useWatch, type Control, type UseFormRegister } from 'react-hook-form';
import { Trash2 } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { cn } from '@/components/ui/cn';
import { humanise } from '@/components/workspace/format';
import { TraceConditionField } from '@/components/rules/trace-rule-fields';
import type { SignalOption } from '@/components/rules/signal-catalogue';
import { FAULT_KINDS, FAULT_SYMPTOMS, type CellDocument, type FaultKind } from '@/simulator';
import { FAULT_FIELDS, type DrillFormValues } from './drill-form';
import { devicePlaces, modulePlaces, wirePlaces, type Place } from './fault-places';
import { FieldError, inputCls, Labelled, type ErrFn } from './form-bits';

type Props = {
  index: number;
  control: Control<DrillFormValues>;
  register: UseFormRegister<DrillFormValues>;
  err: ErrFn;
  document: CellDocument | null;
  signals: readonly SignalOption[];
  onRemove: () => void;
};

type PlaceField = `faults.${number}.${'device' | 'row' | 'row2' | 'module'}`;

/**
 * A select of places, controlled by the form: its options arrive with the base cell, after the
 * form's values, so an uncontrolled select would lose a stored choice. A stored id the cell
 * no longer has stays choosable, marked, so nothing is lost silently.
 */
function PlaceSelect({ id, places, control, field: name, what }: { id: string; places: Place[]; control: Control<DrillFormValues>; field: PlaceField; what: string }) {
  return (
    <Controller
      control={control}
      name={name}
      render={({ field }) => {
        const missing = field.value && !places.some((p) => p.id === field.value);
        return (
          <select id={id} className={cn(inputCls, 'font-mono text-xs')} aria-invalid={Boolean(missing)} name={field.name} value={field.value} onChange={field.onChange} onBlur={field.onBlur} ref={field.ref}>
            <option value="">Choose the {what}…</option>
            {missing ? <option value={field.value}>{field.value} (not in this cell)</option> : null}
            {places.map((p) => (
              <option key={p.id} value={p.id}>
                {p.label}
              </option>
            ))}
          </select>
        );
      }}
    />
  );
}

export function FaultCardEditor({ index, control, register, err, document, signals, onRemove }: Props) {
  const kind = useWatch({ control, name: `faults.${index}.kind` }) as FaultKind;
  const trigger = useWatch({ control, name: `faults.${index}.trigger` });
  const row = useWatch({ control, name: `faults.${index}.row` });
  const need = FAULT_FIELDS[kind] ?? [];
  const p = `faults.${index}` as const;
  const devices = document ? devicePlaces(document, kind) : [];
  const wires = document ? wirePlaces(document) : [];
  const modules = document ? modulePlaces(document) : [];
  const small = (name: 'periodMs' | 'probability' | 'factor' | 'ratePerS' | 'volts' | 'leakMa', label: string, step: string) => (
    <Labelled id={`${p}.${name}`} label={label} error={err(`${p}.${name}`)}>
      <input id={`${p}.${name}`} type="number" step={step} className={inputCls} {...register(`${p}.${name}`, { valueAsNumber: true })} />
    </Labelled>
  );
  return (
    <fieldset className="rounded-md border border-amber-200 bg-amber-50/40 p-3" data-testid={`fault-${index}`}>
      <legend className="px-1 text-xs font-semibold text-amber-900">Fault card {index + 1}</legend>
      <div className="grid gap-3 md:grid-cols-4">
        <Labelled id={`${p}.id`} label="Card id" error={err(`${p}.id`)}>
          <input id={`${p}.id`} className={cn(inputCls, 'font-mono')} {...register(`${p}.id`)} />
        </Labelled>
        <Labelled id={`${p}.kind`} label="Kind">
          <select id={`${p}.kind`} className={inputCls} {...register(`${p}.kind`)}>
            {FAULT_KINDS.map((k) => (
              <option key={k} value={k}>
                {humanise(k)}
              </option>
            ))}
          </select>
        </Labelled>
        <Labelled id={`${p}.label`} label="Note for trainers" className="md:col-span-2">
          <input id={`${p}.label`} className={inputCls} {...register(`${p}.label`)} />
        </Labelled>
        {need.includes('device') ? (
          <Labelled id={`${p}.device`} label="Device" error={err(`${p}.device`)} className="md:col-span-2">
            <PlaceSelect id={`${p}.device`} places={devices} control={control} field={`${p}.device`} what="device" />
          </Labelled>
        ) : null}
        {need.includes('row') || need.includes('rows') ? (
          <Labelled id={`${p}.row`} label={need.includes('rows') ? 'First wire (row)' : 'Wire (row)'} error={err(`${p}.row`)} className="md:col-span-2">
            <PlaceSelect id={`${p}.row`} places={wires} control={control} field={`${p}.row`} what="wire" />
          </Labelled>
        ) : null}
        {need.includes('rows') ? (
          <Labelled id={`${p}.row2`} label="Second wire (row)" error={err(`${p}.row2`)} className="md:col-span-2">
            <PlaceSelect id={`${p}.row2`} places={wires.filter((w) => w.id !== row)} control={control} field={`${p}.row2`} what="second wire" />
          </Labelled>
        ) : null}
        {need.includes('module') ? (
          <Labelled id={`${p}.module`} label="Module" error={err(`${p}.module`)} className="md:col-span-2">
            <PlaceSelect id={`${p}.module`} places={modules} control={control} field={`${p}.module`} what="module" />
          </Labelled>
        ) : null}
        {need.includes('periodMs') ? small('periodMs', 'Window (ms)', '1') : null}
        {need.includes('probability') ? small('probability', 'Open probability (0–1)', '0.05') : null}
        {need.includes('factor') ? small('factor', 'Slower by factor', '0.5') : null}
        {need.includes('ratePerS') ? small('ratePerS', 'Drift (V or mA per s)', '0.1') : null}
        {need.includes('volts') ? small('volts', 'Supply sags to (V)', '0.5') : null}
        {need.includes('leakMa') ? small('leakMa', 'Off-state leakage (mA)', '0.1') : null}
        <Labelled id={`${p}.trigger`} label="Appears">
          <select id={`${p}.trigger`} className={inputCls} {...register(`${p}.trigger`)}>
            <option value="now">from the start</option>
            <option value="at">at a cell time</option>
            <option value="when">when a condition holds</option>
          </select>
        </Labelled>
        {trigger === 'at' ? (
          <Labelled id={`${p}.atMs`} label="At (ms of cell time)" error={err(`${p}.atMs`)}>
            <input id={`${p}.atMs`} type="number" min={0} className={inputCls} {...register(`${p}.atMs`, { valueAsNumber: true })} />
          </Labelled>
        ) : null}
      </div>
      {trigger === 'when' ? (
        <div className="mt-2 rounded border border-slate-200 bg-white p-2">
          <p className="mb-1 text-xs font-medium text-slate-600">The card appears the first time this holds</p>
          <Controller
            control={control}
            name={`${p}.when`}
            render={({ field }) => <TraceConditionField value={field.value} onChange={field.onChange} label={`Fault card ${index + 1} trigger`} options={signals} />}
          />
          <FieldError message={err(`${p}.when`)} />
        </div>
      ) : null}
      <div className="mt-2 flex items-center justify-between gap-2">
        <p className="text-xs text-slate-600">Symptom: {FAULT_SYMPTOMS[kind as keyof typeof FAULT_SYMPTOMS] ?? ''}</p>
        <Button variant="ghost" onClick={onRemove} aria-label={`Remove fault card ${index + 1}`}>
          <Trash2 aria-hidden className="h-4 w-4" /> Remove
        </Button>
      </div>
    </fieldset>
  );
}
