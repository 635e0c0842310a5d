'use client';
/**
 * The routine as a list of step rows: add, remove, reorder, and edit each step kind's fields
 * with selects and inputs. No text language. The step the controller is executing is marked.
 */
import { useState } from 'react';
import { ArrowDown, ArrowUp, Plus, Trash2 } from 'lucide-react';
import type { RoutineStep } from '@/simulator';

type Condition = Extract<RoutineStep, { kind: 'wait' }>['condition'];
import { useRoutineProgress } from './use-controller';
import { cn } from '@/components/ui/cn';
import { defaultStep, moveStep, STEP_KINDS, STEP_KIND_WORDS, type StepKind } from './routine-steps';
import { blurOnEnter, useTextDraft } from '@/components/workspace/use-text-draft';

type Props = {
  steps: readonly RoutineStep[];
  /** Mapped point refs, inputs and outputs. */
  inputPoints: string[];
  outputPoints: string[];
  poses: string[];
  canEdit: boolean;
  onChange(steps: RoutineStep[], label: string): void;
};

const OPS: Condition['op'][] = ['==', '!=', '>', '>=', '<', '<='];
const sel = 'rounded border border-slate-300 px-1 py-0.5 text-sm disabled:border-transparent';

function Num({ label, ariaLabel, value, onCommit, disabled, integer, min, max, optional }: { label: string; /** The input's name where the visible label is empty. */ ariaLabel?: string; value: number | undefined; onCommit(v: number | undefined): void; disabled: boolean; integer?: boolean; min?: number; max?: number; optional?: boolean }) {
  const shown = value === undefined ? '' : String(value);
  const [text, setText] = useTextDraft(shown);
  const commit = () => {
    if (text.trim() === '' && optional) return value !== undefined && onCommit(undefined);
    const n = Number(text);
    const ok = text.trim() !== '' && Number.isFinite(n) && (!integer || Number.isInteger(n)) && (min === undefined || n >= min) && (max === undefined || n <= max);
    if (!ok) return setText(shown);
    if (n !== value) onCommit(n);
  };
  return (
    <label className="inline-flex items-center gap-1 text-xs text-slate-600">
      {label}
      <input
        className="w-20 rounded border border-slate-300 px-1 py-0.5 font-mono text-sm text-slate-900"
        aria-label={label ? undefined : ariaLabel}
        value={text}
        inputMode="decimal"
        placeholder={optional ? 'none' : undefined}
        disabled={disabled}
        onChange={(e) => setText(e.target.value)}
        onBlur={commit}
        onKeyDown={blurOnEnter}
      />
    </label>
  );
}

function Text({ label, value, onCommit, disabled, placeholder }: { label: string; value: string; onCommit(v: string): void; disabled: boolean; placeholder?: string }) {
  const [text, setText] = useTextDraft(value);
  return (
    <label className="inline-flex items-center gap-1 text-xs text-slate-600">
      {label}
      <input
        className="w-44 rounded border border-slate-300 px-1 py-0.5 text-sm text-slate-900"
        value={text}
        placeholder={placeholder}
        disabled={disabled}
        onChange={(e) => setText(e.target.value)}
        onBlur={() => text !== value && onCommit(text)}
        onKeyDown={blurOnEnter}
      />
    </label>
  );
}

function PointSelect({ label, value, options, disabled, onChange }: { label: string; value: string; options: string[]; disabled: boolean; onChange(v: string): void }) {
  const all = options.includes(value) ? options : [value, ...options];
  return (
    <select aria-label={label} className={cn(sel, 'font-mono')} value={value} disabled={disabled} onChange={(e) => onChange(e.target.value)}>
      {all.map((p) => (
        <option key={p} value={p}>
          {p}
          {options.includes(p) ? '' : ' (unmapped)'}
        </option>
      ))}
    </select>
  );
}

function ConditionFields({ c, points, disabled, onChange, label }: { c: Condition; points: string[]; disabled: boolean; onChange(c: Condition): void; label: string }) {
  return (
    <span className="inline-flex flex-wrap items-center gap-1">
      <PointSelect label={`${label} point`} value={c.point} options={points} disabled={disabled} onChange={(point) => onChange({ ...c, point })} />
      <select aria-label={`${label} comparison`} className={cn(sel, 'font-mono')} value={c.op} disabled={disabled} onChange={(e) => onChange({ ...c, op: e.target.value as Condition['op'] })}>
        {OPS.map((o) => (
          <option key={o}>{o}</option>
        ))}
      </select>
      <Num label="" ariaLabel={`${label} value`} value={c.value} disabled={disabled} onCommit={(v) => onChange({ ...c, value: v ?? 0 })} />
    </span>
  );
}

export function RoutineEditor({ steps, inputPoints, outputPoints, poses, canEdit, onChange }: Props) {
  const { pc, state } = useRoutineProgress();
  const [addKind, setAddKind] = useState<StepKind>('wait');
  const allPoints = [...inputPoints, ...outputPoints];
  const targets = steps.map((s, i) => ({ value: s.label ?? String(i), text: s.label ? `${s.label} (step ${i + 1})` : `step ${i + 1}` }));

  const replace = (i: number, next: RoutineStep, label: string) => onChange(steps.map((s, j) => (j === i ? next : s)), label);

  return (
    <div className="space-y-2">
      <ol className="space-y-1" data-testid="routine-steps">
        {steps.map((step, i) => {
          const current = pc === i && (state === 'cycling' || state === 'holding');
          const d = !canEdit;
          return (
            <li
              key={i}
              data-testid={`routine-step-${i}`}
              data-current={current ? 'true' : undefined}
              aria-current={current ? 'step' : undefined}
              className={cn('flex flex-wrap items-center gap-2 rounded border px-2 py-1', current ? 'border-accent-600 bg-accent-50 ring-1 ring-accent-400' : 'border-slate-200 bg-white')}
            >
              <span className="w-7 font-mono text-xs text-slate-500">
                {current ? '▶' : ''}
                {i + 1}
              </span>
              <select
                aria-label={`Kind of step ${i + 1}`}
                className={sel}
                value={step.kind}
                disabled={d}
                onChange={(e) => replace(i, defaultStep(e.target.value as StepKind, { inputs: inputPoints, outputs: outputPoints, poses }, step.label), `Change step ${i + 1} kind`)}
              >
                {STEP_KINDS.map((k) => (
                  <option key={k} value={k}>
                    {STEP_KIND_WORDS[k]}
                  </option>
                ))}
              </select>
              {step.kind === 'wait' ? (
                <>
                  <ConditionFields label={`Step ${i + 1}`} c={step.condition} points={allPoints} disabled={d} onChange={(condition) => replace(i, { ...step, condition }, `Edit step ${i + 1}`)} />
                  <Num label="timeout ms" optional integer min={0} value={step.timeoutMs} disabled={d} onCommit={(timeoutMs) => replace(i, { ...step, timeoutMs }, `Edit step ${i + 1}`)} />
                  <Text label="alarm" value={step.alarm ?? ''} disabled={d} placeholder="message on timeout" onCommit={(alarm) => replace(i, { ...step, alarm: alarm || undefined }, `Edit step ${i + 1}`)} />
                </>
              ) : null}
              {step.kind === 'set' ? (
                <>
                  <PointSelect label={`Step ${i + 1} point`} value={step.point} options={outputPoints} disabled={d} onChange={(point) => replace(i, { ...step, point }, `Edit step ${i + 1}`)} />
                  <Num label="value" value={step.value} disabled={d} onCommit={(value) => replace(i, { ...step, value: value ?? 0 }, `Edit step ${i + 1}`)} />
                </>
              ) : null}
              {step.kind === 'pulse' ? (
                <>
                  <PointSelect label={`Step ${i + 1} point`} value={step.point} options={outputPoints} disabled={d} onChange={(point) => replace(i, { ...step, point }, `Edit step ${i + 1}`)} />
                  <Num label="ms" integer min={0} value={step.ms} disabled={d} onCommit={(ms) => replace(i, { ...step, ms: ms ?? 0 }, `Edit step ${i + 1}`)} />
                </>
              ) : null}
              {step.kind === 'set-word' ? (
                <>
                  <PointSelect label={`Step ${i + 1} point`} value={step.point} options={outputPoints.filter((p) => p.startsWith('WO'))} disabled={d} onChange={(point) => replace(i, { ...step, point }, `Edit step ${i + 1}`)} />
                  <Num label="value" integer min={0} max={65535} value={step.value} disabled={d} onCommit={(value) => replace(i, { ...step, value: value ?? 0 }, `Edit step ${i + 1}`)} />
                  <select aria-label={`Step ${i + 1} encoding`} className={sel} value={step.encoding} disabled={d} onChange={(e) => replace(i, { ...step, encoding: e.target.value as typeof step.encoding }, `Edit step ${i + 1}`)}>
                    <option value="binary">binary</option>
                    <option value="bcd">BCD</option>
                    <option value="gray">Gray</option>
                  </select>
                </>
              ) : null}
              {step.kind === 'move' ? (
                <>
                  <select aria-label={`Step ${i + 1} pose`} className={cn(sel, 'font-mono')} value={step.pose} disabled={d} onChange={(e) => replace(i, { ...step, pose: e.target.value }, `Edit step ${i + 1}`)}>
                    {(poses.includes(step.pose) ? poses : [step.pose, ...poses]).map((p) => (
                      <option key={p}>{p}</option>
                    ))}
                  </select>
                  <Num label="speed %" optional min={1} max={100} value={step.speedPercent} disabled={d} onCommit={(speedPercent) => replace(i, { ...step, speedPercent }, `Edit step ${i + 1}`)} />
                </>
              ) : null}
              {step.kind === 'pause' ? <Num label="ms" integer min={0} value={step.ms} disabled={d} onCommit={(ms) => replace(i, { ...step, ms: ms ?? 0 }, `Edit step ${i + 1}`)} /> : null}
              {step.kind === 'branch' ? (
                <ConditionFields label={`Step ${i + 1}`} c={step.condition} points={allPoints} disabled={d} onChange={(condition) => replace(i, { ...step, condition }, `Edit step ${i + 1}`)} />
              ) : null}
              {step.kind === 'branch' || step.kind === 'jump' ? (
                <label className="inline-flex items-center gap-1 text-xs text-slate-600">
                  go to
                  <select
                    aria-label={`Step ${i + 1} target`}
                    className={sel}
                    value={String(step.to)}
                    disabled={d}
                    onChange={(e) => {
                      const v = e.target.value;
                      replace(i, { ...step, to: /^\d+$/.test(v) ? Number(v) : v }, `Edit step ${i + 1}`);
                    }}
                  >
                    {targets.some((t) => t.value === String(step.to)) ? null : <option value={String(step.to)}>{String(step.to)} (missing)</option>}
                    {targets.map((t) => (
                      <option key={t.value} value={t.value}>
                        {t.text}
                      </option>
                    ))}
                  </select>
                </label>
              ) : null}
              {step.kind === 'alarm' ? <Text label="message" value={step.message} disabled={d} onCommit={(message) => replace(i, { ...step, message }, `Edit step ${i + 1}`)} /> : null}
              <Text
                label="label"
                value={step.label ?? ''}
                disabled={d}
                placeholder="optional"
                onCommit={(label) => replace(i, { ...step, label: label.trim() || undefined } as RoutineStep, `Label step ${i + 1}`)}
              />
              {canEdit ? (
                <span className="ml-auto inline-flex gap-0.5">
                  <button type="button" aria-label={`Move step ${i + 1} up`} disabled={i === 0} className="rounded p-1 hover:bg-slate-100 disabled:opacity-30" onClick={() => onChange(moveStep(steps, i, i - 1), `Move step ${i + 1} up`)}>
                    <ArrowUp className="h-4 w-4" />
                  </button>
                  <button type="button" aria-label={`Move step ${i + 1} down`} disabled={i === steps.length - 1} className="rounded p-1 hover:bg-slate-100 disabled:opacity-30" onClick={() => onChange(moveStep(steps, i, i + 1), `Move step ${i + 1} down`)}>
                    <ArrowDown className="h-4 w-4" />
                  </button>
                  <button type="button" aria-label={`Remove step ${i + 1}`} className="rounded p-1 text-slate-500 hover:bg-red-50 hover:text-red-700" onClick={() => onChange(steps.filter((_, j) => j !== i), `Remove step ${i + 1}`)}>
                    <Trash2 className="h-4 w-4" />
                  </button>
                </span>
              ) : null}
            </li>
          );
        })}
      </ol>
      {canEdit ? (
        <div className="flex items-center gap-2">
          <select aria-label="Kind of new step" className={sel} value={addKind} onChange={(e) => setAddKind(e.target.value as StepKind)}>
            {STEP_KINDS.map((k) => (
              <option key={k} value={k}>
                {STEP_KIND_WORDS[k]}
              </option>
            ))}
          </select>
          <button
            type="button"
            className="inline-flex items-center gap-1 rounded border border-slate-300 bg-white px-2 py-1 text-sm hover:bg-slate-100"
            onClick={() => onChange([...steps, defaultStep(addKind, { inputs: inputPoints, outputs: outputPoints, poses })], `Add ${STEP_KIND_WORDS[addKind]} step`)}
          >
            <Plus aria-hidden className="h-4 w-4" /> Add step
          </button>
        </div>
      ) : null}
    </div>
  );
}
