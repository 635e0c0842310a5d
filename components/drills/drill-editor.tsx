'use client';
/**
 * The trainer's drill editor (react-hook-form + zod): base cell and version, brief in Markdown
 * with preview and image upload, hidden fault cards, objectives, weighted rules, the answer,
 * time limit and what the student may use. Creates (POST /api/drills) or saves (PATCH).
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import { useRouter } from 'next/navigation';
import { Controller, useFieldArray, useForm, useWatch, type Control, type FieldPath, type UseFormRegister } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { ImagePlus, Plus, Trash2 } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { cn } from '@/components/ui/cn';
import { ApiClientError, fetchJson } from '@/lib/api/client';
import { humanise } from '@/components/workspace/format';
import { engineTraceOptions } from '@/components/rules/signal-catalogue';
import type { CellDocument } from '@/simulator';
import { DIAGNOSIS_KINDS, EDITABLE_AREAS, MAX_ASSET_BYTES, ASSET_TYPES, type DrillInput } from '@/lib/schemas/drills';
import { Markdown } from './markdown';
import { drillFormSchemaChecked, formPath, newFault, newRule, toDrillInput, toFormValues, type DrillFormValues } from './drill-form';
import { AnswerPlaces } from './answer-places';
import { DrillRuleEditor } from './drill-rule-editor';
import { FaultCardEditor } from './fault-card-editor';
import { FieldError, inputCls as input, Labelled } from './form-bits';

export type CellChoice = { id: string; name: string; versionCount: number };

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
  const form = useForm<DrillFormValues>({ resolver: zodResolver(drillFormSchemaChecked), defaultValues: defaults, mode: 'onBlur' });
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
  // The drill's own fault cards are signals too (`fault.<card>`), for rules and triggers.
  const faultIds = (useWatch({ control, name: 'faults' }) ?? []).map((f) => f.id).filter(Boolean);
  const faultKey = faultIds.join('|');
  const signals = useMemo(() => (document ? engineTraceOptions(document, faultKey ? faultKey.split('|').map((id) => `fault.${id}`) : []) : []), [document, faultKey]);
  const answerKind = useWatch({ control, name: 'answerKind' });

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
      {/* Fault cards and grading rules model e-stops, guards and interlocks: the page's one caution. */}
      <SafetyCaution compact />
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
        <div className="space-y-3">
          {faults.fields.map((f, i) => (
            <FaultCardEditor key={f.id} index={i} control={control} register={register} err={err} document={document} signals={signals} onRemove={() => faults.remove(i)} />
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

      <Section title="Grading rules" hint="Checked by the server on its own replay of the run; each passing rule earns its weight. Pick signals by name, address or wire.">
        <div className="space-y-3">
          {rules.fields.map((r, i) => (
            <DrillRuleEditor key={r.id} index={i} control={control} register={register} err={err} signals={signals} onRemove={() => rules.remove(i)} />
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
          <div className="space-y-1 md:col-span-4 md:row-start-2">
            <span className="block text-xs font-medium text-slate-600">Where the fault is (any one of these answers counts)</span>
            <Controller
              control={control}
              name="answerLocation"
              render={({ field }) => <AnswerPlaces value={field.value} onChange={field.onChange} document={document} pair={answerKind === 'swapped-wires'} invalid={Boolean(err('answerLocation'))} />}
            />
            <FieldError message={err('answerLocation')} />
          </div>
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
        <p className="mt-1 text-xs text-slate-500">A drill attempt runs on the server. Point-map changes reach it as staged rows (live after a controller restart); logic, wiring and routine edits reach it when the student presses “Send to cell”, which restarts the PLC program like a real download.</p>
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
      {/* The tab list holds only its tabs (WAI-ARIA tablist); the image upload sits beside it. */}
      <div className="flex flex-wrap items-center gap-1">
        <div role="tablist" aria-label="Brief" className="flex gap-1">
          {(['write', 'preview'] as const).map((t) => (
            <button
              key={t}
              id={`brief-tab-${t}`}
              type="button"
              role="tab"
              aria-selected={tab === t}
              aria-controls="brief-panel"
              onClick={() => setTab(t)}
              className={cn('rounded px-3 py-1 text-sm', tab === t ? 'bg-accent-50 font-semibold text-accent-800 ring-1 ring-accent-200' : 'text-slate-600 hover:bg-slate-100')}
            >
              {t === 'write' ? 'Write' : 'Preview'}
            </button>
          ))}
        </div>
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
      <div id="brief-panel" role="tabpanel" aria-labelledby={`brief-tab-${tab}`}>
        {tab === 'write' ? (
          <textarea aria-label="Brief (Markdown)" rows={10} className={cn(input, 'font-mono')} {...register('brief')} />
        ) : (
          <div className="min-h-40 rounded-md border border-slate-200 p-3">
            <Markdown source={brief || '_Nothing written yet._'} drillId={drillId} />
          </div>
        )}
      </div>
      {!drillId ? <p className="text-xs text-slate-500">Images can be added once the drill is created.</p> : null}
      <FieldError message={upload.error ?? error} />
    </div>
  );
}
