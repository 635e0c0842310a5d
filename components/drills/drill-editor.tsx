'use client';
/**
 * The trainer's drill editor (react-hook-form + zod): base cell and version, brief in Markdown
 * with preview and image upload, hidden fault cards, objectives, weighted rules, the answer,
 * time limit and what the student may use. Creates (POST /api/drills) or saves (PATCH).
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import { useRouter } from 'next/navigation';
import { useFieldArray, useForm, useWatch, type Control, type FieldPath, type UseFormRegister } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { ImagePlus, Plus, Trash2 } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { cn } from '@/components/ui/cn';
import { ApiClientError, fetchJson } from '@/lib/api/client';
import { humanise } from '@/components/workspace/format';
import { createCell, FAULT_KINDS, FAULT_SYMPTOMS, type CellDocument } from '@/simulator';
import { DIAGNOSIS_KINDS, EDITABLE_AREAS, MAX_ASSET_BYTES, ASSET_TYPES, type DrillInput } from '@/lib/schemas/drills';
import { Markdown } from './markdown';
import { locationOptions } from './locations';
import { FAULT_FIELDS, OPS, RULE_KINDS, drillFormSchema, formPath, newFault, newRule, toDrillInput, toFormValues, type DrillFormValues } from './drill-form';

export type CellChoice = { id: string; name: string; versionCount: number };

const input = 'block w-full rounded-md border border-slate-300 bg-white px-2 py-1.5 text-sm focus:border-accent-600 focus:outline-none focus:ring-2 focus:ring-accent-600/30 aria-[invalid=true]:border-red-500';
const labelCls = 'block text-xs font-medium text-slate-600';

function FieldError({ message }: { message?: string }) {
  return message ? (
    <p role="alert" className="text-xs text-red-700">
      {message}
    </p>
  ) : null;
}

/** One labelled control of the editor, with the control's error under it when it reports one. */
function Labelled({ id, label, error, className, children }: { id: string; label: React.ReactNode; error?: string; className?: string; children: React.ReactNode }) {
  return (
    <div className={cn('space-y-1', className)}>
      <label htmlFor={id} className={labelCls}>
        {label}
      </label>
      {children}
      <FieldError message={error} />
    </div>
  );
}

type Props = {
  drillId: string | null;
  initial: (DrillInput & { id?: string }) | null;
  cells: CellChoice[];
  /** The drill has runs: its grading can no longer change (the server answers 409). */
  locked: boolean;
};

export function DrillEditor({ drillId, initial, cells, locked }: Props) {
  const router = useRouter();
  const defaults = useMemo(() => toFormValues(initial, { cellId: cells[0]?.id ?? '', cellVersion: cells[0]?.versionCount ?? 1 }), [initial, cells]);
  const form = useForm<DrillFormValues>({ resolver: zodResolver(drillFormSchema), defaultValues: defaults, mode: 'onBlur' });
  const { register, control, handleSubmit, formState, setError, setValue } = form;
  const faults = useFieldArray({ control, name: 'faults' });
  const objectives = useFieldArray({ control, name: 'objectives' });
  const rules = useFieldArray({ control, name: 'rules' });
  const [serverError, setServerError] = useState<{ message: string; fields: [string, string[]][] } | null>(null);
  const [saved, setSaved] = useState(false);

  const cellId = useWatch({ control, name: 'cellId' });
  const cellVersion = useWatch({ control, name: 'cellVersion' });
  const versions = useQuery({
    queryKey: ['cell-versions', cellId],
    queryFn: () => fetchJson<{ versions: { version: number; message: string; createdAt: string }[] }>(`/api/cells/${cellId}/versions`),
    enabled: Boolean(cellId),
  });
  const doc = useQuery({
    queryKey: ['cell-version', cellId, cellVersion],
    queryFn: () => fetchJson<{ version: { document: CellDocument } }>(`/api/cells/${cellId}/versions/${cellVersion}`),
    enabled: Boolean(cellId && cellVersion),
  });
  const document = doc.data?.version.document ?? null;
  const places = useMemo(() => (document ? locationOptions(document) : []), [document]);
  const devices = places.filter((p) => p.group === 'device');
  const rows = places.filter((p) => p.group === 'wire');
  const modules = places.filter((p) => p.group === 'module');
  const signals = useMemo(() => (document ? signalHints(document) : []), [document]);

  const onSubmit = handleSubmit(async (values) => {
    setServerError(null);
    setSaved(false);
    let body: DrillInput;
    try {
      body = toDrillInput(values);
    } catch (e) {
      setServerError({ message: e instanceof Error ? e.message : 'A condition is not valid.', fields: [] });
      return;
    }
    try {
      if (drillId) {
        await fetchJson(`/api/drills/${drillId}`, { method: 'PATCH', body });
        setSaved(true);
        router.refresh();
      } else {
        const { drill } = await fetchJson<{ drill: { id: string } }>('/api/drills', { method: 'POST', body });
        router.push(`/drills/${drill.id}`);
      }
    } catch (e) {
      if (e instanceof ApiClientError) {
        const fields = Object.entries(e.fields ?? {});
        for (const [path, msgs] of fields) setError(formPath(path) as FieldPath<DrillFormValues>, { message: msgs.join(' ') });
        setServerError({ message: e.message, fields });
      } else setServerError({ message: 'The drill could not be saved.', fields: [] });
    }
  });

  const err = (path: string): string | undefined => {
    let node: unknown = formState.errors;
    for (const part of path.split('.')) node = (node as Record<string, unknown> | undefined)?.[part];
    return (node as { message?: string } | undefined)?.message;
  };

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6" aria-label="Drill editor">
      {locked ? <Notice>Students have started this drill: its faults, rules and answer are frozen so every stored grade stays reproducible. Create a new drill to change them.</Notice> : null}

      <Section title="Drill">
        <div className="grid gap-3 md:grid-cols-[2fr_1fr_1fr]">
          <Labelled id="title" label="Title" error={err('title')}>
            <input id="title" className={input} aria-invalid={Boolean(err('title'))} {...register('title')} />
          </Labelled>
          <Labelled id="cellId" label="Base cell" error={err('cellId')}>
            <select
              id="cellId"
              className={input}
              {...register('cellId', {
                onChange: (e) => {
                  const c = cells.find((x) => x.id === e.target.value);
                  if (c) setValue('cellVersion', c.versionCount);
                },
              })}
            >
              {cells.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.name}
                </option>
              ))}
            </select>
          </Labelled>
          <Labelled id="cellVersion" label="Version" error={err('cellVersion')}>
            <select id="cellVersion" className={input} {...register('cellVersion', { valueAsNumber: true })}>
              {(versions.data?.versions ?? [{ version: cellVersion, message: '', createdAt: '' }]).map((v) => (
                <option key={v.version} value={v.version}>
                  v{v.version} {v.message ? `— ${v.message}` : ''}
                </option>
              ))}
            </select>
          </Labelled>
        </div>
      </Section>

      <Section title="Brief">
        <BriefEditor drillId={drillId} register={register} control={control} setValue={(v) => setValue('brief', v, { shouldDirty: true })} error={err('brief')} />
      </Section>

      <Section title="Hidden fault cards" hint="Students never see these: they are armed on the server only.">
        <datalist id="dl-devices">{devices.map((d) => <option key={d.id} value={d.id} label={d.label} />)}</datalist>
        <datalist id="dl-rows">{rows.map((d) => <option key={d.id} value={d.id} label={d.label} />)}</datalist>
        <datalist id="dl-modules">{modules.map((d) => <option key={d.id} value={d.id} label={d.label} />)}</datalist>
        <datalist id="dl-places">{places.map((d) => <option key={`${d.group}-${d.id}`} value={d.id} label={`${d.group}: ${d.label}`} />)}</datalist>
        <div className="space-y-3">
          {faults.fields.map((f, i) => (
            <FaultCardEditor key={f.id} index={i} control={control} register={register} err={err} onRemove={() => faults.remove(i)} />
          ))}
          <Button variant="secondary" onClick={() => faults.append(newFault(faults.fields.length))} data-testid="add-fault">
            <Plus aria-hidden className="h-4 w-4" /> Add fault card
          </Button>
        </div>
      </Section>

      <Section title="Objectives">
        <div className="space-y-2">
          {objectives.fields.map((o, i) => (
            <div key={o.id} className="flex gap-2">
              <input aria-label={`Objective ${i + 1}`} className={input} {...register(`objectives.${i}.text`)} />
              <Button variant="ghost" aria-label={`Remove objective ${i + 1}`} onClick={() => objectives.remove(i)}>
                <Trash2 aria-hidden className="h-4 w-4" />
              </Button>
            </div>
          ))}
          <Button variant="secondary" onClick={() => objectives.append({ text: '' })}>
            <Plus aria-hidden className="h-4 w-4" /> Add objective
          </Button>
        </div>
      </Section>

      <Section title="Grading rules" hint="Checked by the server on its own replay of the run; each passing rule earns its weight.">
        <datalist id="dl-signals">{signals.map((s) => <option key={s} value={s} />)}</datalist>
        <div className="space-y-3">
          {rules.fields.map((r, i) => (
            <RuleEditor key={r.id} index={i} control={control} register={register} err={err} onRemove={() => rules.remove(i)} />
          ))}
          <Button variant="secondary" onClick={() => rules.append(newRule(rules.fields.length))}>
            <Plus aria-hidden className="h-4 w-4" /> Add rule
          </Button>
        </div>
      </Section>

      <Section title="Answer, time and permissions">
        <div className="grid gap-3 md:grid-cols-4">
          <Labelled id="answerKind" label="Fault kind (the answer)" error={err('answerKind')}>
            <select id="answerKind" className={input} {...register('answerKind')}>
              {DIAGNOSIS_KINDS.map((k) => (
                <option key={k} value={k}>
                  {humanise(k)}
                </option>
              ))}
            </select>
          </Labelled>
          <Labelled id="answerLocation" label="Where (id; alternatives with |)" error={err('answerLocation')}>
            <input id="answerLocation" list="dl-places" className={cn(input, 'font-mono')} aria-invalid={Boolean(err('answerLocation'))} {...register('answerLocation')} />
          </Labelled>
          <Labelled id="diagnosisWeight" label="Diagnosis weight" error={err('diagnosisWeight')}>
            <input id="diagnosisWeight" type="number" min={0} max={1000} className={input} {...register('diagnosisWeight', { valueAsNumber: true })} />
          </Labelled>
          <Labelled id="timeLimitMin" label="Time limit (minutes of cell time)" error={err('timeLimitMin')}>
            <input id="timeLimitMin" type="number" step="0.5" min={0.1} max={240} className={input} {...register('timeLimitMin', { valueAsNumber: true })} />
          </Labelled>
        </div>
        <fieldset className="mt-4 flex flex-wrap gap-x-6 gap-y-2 text-sm">
          <legend className="sr-only">Permissions</legend>
          <label className="inline-flex items-center gap-2">
            <input type="checkbox" {...register('forceAllowed')} /> Students may force points
          </label>
          {EDITABLE_AREAS.map((a) => (
            <label key={a} className="inline-flex items-center gap-2">
              <input type="checkbox" value={a} {...register('editable')} /> {humanise(a)} editable
            </label>
          ))}
        </fieldset>
        <p className="mt-1 text-xs text-slate-500">A drill attempt runs on the server. Point-map changes reach it as staged rows (live after a controller restart); logic, wiring and routine edits reach it when the student presses “Download to PLC”, which restarts the PLC program like a real download.</p>
      </Section>

      {serverError ? (
        <Notice tone="error">
          <p>{serverError.message}</p>
          {serverError.fields.length > 0 ? (
            <ul className="mt-1 list-disc pl-5 text-xs">
              {serverError.fields.map(([k, v]) => (
                <li key={k}>
                  <span className="font-mono">{k}</span>: {v.join(' ')}
                </li>
              ))}
            </ul>
          ) : null}
        </Notice>
      ) : null}
      {saved ? <Notice tone="success">Saved.</Notice> : null}
      <div className="flex gap-2">
        <Button type="submit" disabled={formState.isSubmitting || locked} data-testid="save-drill">
          {drillId ? 'Save drill' : 'Create drill'}
        </Button>
      </div>
    </form>
  );
}

/** Every signal the base cell exposes (the engine's own list), for the rule and trigger pickers. */
function signalHints(doc: CellDocument): string[] {
  const made = createCell(doc);
  if (!made.ok) return [];
  const names = made.value.signalNames().filter((n) => n !== 'time');
  made.value.dispose();
  return names;
}

function Section({ title, hint, children }: { title: string; hint?: string; children: React.ReactNode }) {
  return (
    <section aria-label={title} className="rounded-lg border border-slate-200 bg-white p-4 shadow-sm">
      <h2 className="text-base font-semibold text-slate-900">{title}</h2>
      {hint ? <p className="mb-3 text-xs text-slate-500">{hint}</p> : <div className="mb-3" />}
      {children}
    </section>
  );
}

function BriefEditor({ drillId, register, control, setValue, error }: { drillId: string | null; register: UseFormRegister<DrillFormValues>; control: Control<DrillFormValues>; setValue: (v: string) => void; error?: string }) {
  const brief = useWatch({ control, name: 'brief' });
  const [tab, setTab] = useState<'write' | 'preview'>('write');
  const [upload, setUpload] = useState<{ busy: boolean; error: string | null }>({ busy: false, error: null });
  const fileRef = useRef<HTMLInputElement>(null);
  const latest = useRef(brief);
  useEffect(() => {
    latest.current = brief;
  }, [brief]);

  const onFile = async (file: File) => {
    // Checked here for a quick answer; the server checks again (by the file's bytes) and decides.
    if (file.size > MAX_ASSET_BYTES) return setUpload({ busy: false, error: `“${file.name}” is ${(file.size / 1_048_576).toFixed(1)} MiB; images may be at most 1 MiB.` });
    if (!(ASSET_TYPES as readonly string[]).includes(file.type)) return setUpload({ busy: false, error: `“${file.name}” is not a PNG, JPEG, WebP or GIF image.` });
    setUpload({ busy: true, error: null });
    const body = new FormData();
    body.append('file', file);
    try {
      const res = await fetch(`/api/drills/${drillId}/assets`, { method: 'POST', body, credentials: 'same-origin' });
      const data = (await res.json().catch(() => ({}))) as { markdown?: string; error?: string; fields?: Record<string, string[]> };
      if (!res.ok || !data.markdown) throw new Error(data.fields?.file?.join(' ') ?? data.error ?? `Upload failed (${res.status}).`);
      setValue(`${latest.current.trimEnd()}\n\n${data.markdown}\n`);
      setUpload({ busy: false, error: null });
    } catch (e) {
      setUpload({ busy: false, error: e instanceof Error ? e.message : 'Upload failed.' });
    }
  };

  return (
    <div className="space-y-2">
      <div role="tablist" aria-label="Brief" className="flex gap-1">
        {(['write', 'preview'] as const).map((t) => (
          <button key={t} type="button" role="tab" aria-selected={tab === t} onClick={() => setTab(t)} className={cn('rounded px-3 py-1 text-sm', tab === t ? 'bg-accent-50 font-semibold text-accent-800 ring-1 ring-accent-200' : 'text-slate-600 hover:bg-slate-100')}>
            {t === 'write' ? 'Write' : 'Preview'}
          </button>
        ))}
        <div className="ml-auto flex items-center gap-2">
          <input
            ref={fileRef}
            type="file"
            accept={ASSET_TYPES.join(',')}
            className="sr-only"
            aria-label="Upload an image for the brief"
            data-testid="brief-image-input"
            onChange={(e) => {
              const f = e.target.files?.[0];
              e.target.value = '';
              if (f) void onFile(f);
            }}
          />
          <Button variant="secondary" disabled={!drillId || upload.busy} onClick={() => fileRef.current?.click()} title={drillId ? 'PNG, JPEG, WebP or GIF, at most 1 MiB' : 'Create the drill first'}>
            <ImagePlus aria-hidden className="h-4 w-4" /> {upload.busy ? 'Uploading…' : 'Add image'}
          </Button>
        </div>
      </div>
      {tab === 'write' ? (
        <textarea aria-label="Brief (Markdown)" rows={10} className={cn(input, 'font-mono')} {...register('brief')} />
      ) : (
        <div className="min-h-40 rounded-md border border-slate-200 p-3">
          <Markdown source={brief || '_Nothing written yet._'} drillId={drillId} />
        </div>
      )}
      {!drillId ? <p className="text-xs text-slate-500">Images can be added once the drill is created.</p> : null}
      <FieldError message={upload.error ?? error} />
    </div>
  );
}

type ErrFn = (path: string) => string | undefined;

function FaultCardEditor({ index, control, register, err, onRemove }: { index: number; control: Control<DrillFormValues>; register: UseFormRegister<DrillFormValues>; err: ErrFn; onRemove: () => void }) {
  const kind = useWatch({ control, name: `faults.${index}.kind` }) as keyof typeof FAULT_FIELDS;
  const trigger = useWatch({ control, name: `faults.${index}.trigger` });
  const need = FAULT_FIELDS[kind] ?? [];
  const p = `faults.${index}` as const;
  const small = (name: 'periodMs' | 'probability' | 'factor' | 'ratePerS', label: string, step: string) => (
    <Labelled id={`${p}.${name}`} label={label} error={err(`${p}.${name}`)}>
      <input id={`${p}.${name}`} type="number" step={step} className={input} {...register(`${p}.${name}`, { valueAsNumber: true })} />
    </Labelled>
  );
  return (
    <fieldset className="rounded-md border border-amber-200 bg-amber-50/40 p-3" data-testid={`fault-${index}`}>
      <legend className="px-1 text-xs font-semibold text-amber-900">Fault card {index + 1}</legend>
      <div className="grid gap-3 md:grid-cols-4">
        <Labelled id={`${p}.id`} label="Card id" error={err(`${p}.id`)}>
          <input id={`${p}.id`} className={cn(input, 'font-mono')} {...register(`${p}.id`)} />
        </Labelled>
        <Labelled id={`${p}.kind`} label="Kind">
          <select id={`${p}.kind`} className={input} {...register(`${p}.kind`)}>
            {FAULT_KINDS.map((k) => (
              <option key={k} value={k}>
                {humanise(k)}
              </option>
            ))}
          </select>
        </Labelled>
        <Labelled id={`${p}.label`} label="Note for trainers" className="md:col-span-2">
          <input id={`${p}.label`} className={input} {...register(`${p}.label`)} />
        </Labelled>
        {need.includes('device') ? (
          <Labelled id={`${p}.device`} label="Device" error={err(`${p}.device`)}>
            <input id={`${p}.device`} list="dl-devices" className={cn(input, 'font-mono')} {...register(`${p}.device`)} />
          </Labelled>
        ) : null}
        {need.includes('row') || need.includes('rows') ? (
          <Labelled id={`${p}.row`} label={need.includes('rows') ? 'First wire (row)' : 'Wire (row)'} error={err(`${p}.row`)}>
            <input id={`${p}.row`} list="dl-rows" className={cn(input, 'font-mono')} {...register(`${p}.row`)} />
          </Labelled>
        ) : null}
        {need.includes('rows') ? (
          <Labelled id={`${p}.row2`} label="Second wire (row)" error={err(`${p}.row2`)}>
            <input id={`${p}.row2`} list="dl-rows" className={cn(input, 'font-mono')} {...register(`${p}.row2`)} />
          </Labelled>
        ) : null}
        {need.includes('module') ? (
          <Labelled id={`${p}.module`} label="Module" error={err(`${p}.module`)}>
            <input id={`${p}.module`} list="dl-modules" className={cn(input, 'font-mono')} {...register(`${p}.module`)} />
          </Labelled>
        ) : null}
        {need.includes('periodMs') ? small('periodMs', 'Window (ms)', '1') : null}
        {need.includes('probability') ? small('probability', 'Open probability (0–1)', '0.05') : null}
        {need.includes('factor') ? small('factor', 'Slower by factor', '0.5') : null}
        {need.includes('ratePerS') ? small('ratePerS', 'Drift (V or mA per s)', '0.1') : null}
        <Labelled id={`${p}.trigger`} label="Appears">
          <select id={`${p}.trigger`} className={input} {...register(`${p}.trigger`)}>
            <option value="now">from the start</option>
            <option value="at">at a cell time</option>
            <option value="when">when a condition holds</option>
          </select>
        </Labelled>
        {trigger === 'at' ? (
          <Labelled id={`${p}.atMs`} label="At (ms of cell time)" error={err(`${p}.atMs`)}>
            <input id={`${p}.atMs`} type="number" min={0} className={input} {...register(`${p}.atMs`, { valueAsNumber: true })} />
          </Labelled>
        ) : null}
      </div>
      {trigger === 'when' ? <ConditionEditor prefix={`${p}.when`} label="Trigger condition" control={control} register={register} err={err} /> : null}
      <div className="mt-2 flex items-center justify-between gap-2">
        <p className="text-xs text-slate-600">Symptom: {FAULT_SYMPTOMS[kind as keyof typeof FAULT_SYMPTOMS] ?? ''}</p>
        <Button variant="ghost" onClick={onRemove} aria-label={`Remove fault card ${index + 1}`}>
          <Trash2 aria-hidden className="h-4 w-4" /> Remove
        </Button>
      </div>
    </fieldset>
  );
}

function ConditionEditor({ prefix, label, control, register, err }: { prefix: `faults.${number}.when` | `rules.${number}.p` | `rules.${number}.event`; label: string; control: Control<DrillFormValues>; register: UseFormRegister<DrillFormValues>; err: ErrFn }) {
  const mode = useWatch({ control, name: `${prefix}.mode` });
  return (
    <div className="mt-2 rounded border border-slate-200 bg-white p-2">
      <div className="mb-1 flex items-center gap-3">
        <span className="text-xs font-medium text-slate-600">{label}</span>
        <label className="inline-flex items-center gap-1 text-xs">
          <input type="radio" value="simple" {...register(`${prefix}.mode`)} /> one comparison
        </label>
        <label className="inline-flex items-center gap-1 text-xs">
          <input type="radio" value="json" {...register(`${prefix}.mode`)} /> compound (JSON: all / any / not)
        </label>
      </div>
      {mode === 'json' ? (
        <textarea aria-label={`${label} (JSON)`} rows={4} className={cn(input, 'font-mono text-xs')} {...register(`${prefix}.json`)} />
      ) : (
        <div className="grid grid-cols-[2fr_auto_1fr] gap-2">
          <input aria-label={`${label} signal`} list="dl-signals" placeholder="plc.%IX0.1" className={cn(input, 'font-mono')} {...register(`${prefix}.signal`)} />
          <select aria-label={`${label} comparison`} className={input} {...register(`${prefix}.op`)}>
            {OPS.map((o) => (
              <option key={o} value={o}>
                {o}
              </option>
            ))}
          </select>
          <input aria-label={`${label} value`} className={cn(input, 'font-mono')} {...register(`${prefix}.value`)} />
        </div>
      )}
      <FieldError message={err(`${prefix}.signal`) ?? err(prefix)} />
    </div>
  );
}

function RuleEditor({ index, control, register, err, onRemove }: { index: number; control: Control<DrillFormValues>; register: UseFormRegister<DrillFormValues>; err: ErrFn; onRemove: () => void }) {
  const kind = useWatch({ control, name: `rules.${index}.kind` });
  const p = `rules.${index}` as const;
  return (
    <fieldset className="rounded-md border border-slate-200 p-3" data-testid={`rule-${index}`}>
      <legend className="px-1 text-xs font-semibold text-slate-700">Rule {index + 1}</legend>
      <div className="grid gap-3 md:grid-cols-5">
        <Labelled id={`${p}.id`} label="Rule id" error={err(`${p}.id`)}>
          <input id={`${p}.id`} className={cn(input, 'font-mono')} {...register(`${p}.id`)} />
        </Labelled>
        <Labelled id={`${p}.kind`} label="Kind">
          <select id={`${p}.kind`} className={input} {...register(`${p}.kind`)}>
            {RULE_KINDS.map((k) => (
              <option key={k} value={k}>
                {k === 'after' ? 'after E, within T: P' : k === 'eventually' ? 'within T, eventually P' : `${k} P`}
              </option>
            ))}
          </select>
        </Labelled>
        <Labelled id={`${p}.label`} label="Shown as" className="md:col-span-2">
          <input id={`${p}.label`} className={input} {...register(`${p}.label`)} />
        </Labelled>
        <Labelled id={`${p}.weight`} label="Weight" error={err(`${p}.weight`)}>
          <input id={`${p}.weight`} type="number" min={0} max={1000} className={input} {...register(`${p}.weight`, { valueAsNumber: true })} />
        </Labelled>
        {kind === 'after' || kind === 'eventually' ? (
          <Labelled id={`${p}.withinMs`} label="Within T (ms)" error={err(`${p}.withinMs`)}>
            <input id={`${p}.withinMs`} type="number" min={0} className={input} {...register(`${p}.withinMs`, { valueAsNumber: true })} />
          </Labelled>
        ) : null}
      </div>
      {kind === 'after' ? <ConditionEditor prefix={`${p}.event`} label="Event E" control={control} register={register} err={err} /> : null}
      <ConditionEditor prefix={`${p}.p`} label="Condition P" control={control} register={register} err={err} />
      <div className="mt-2 flex justify-end">
        <Button variant="ghost" onClick={onRemove} aria-label={`Remove rule ${index + 1}`}>
          <Trash2 aria-hidden className="h-4 w-4" /> Remove
        </Button>
      </div>
    </fieldset>
  );
}
