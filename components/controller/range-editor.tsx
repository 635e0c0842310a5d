'use client';
/**
 * One point-map range on its slot card: its points, family in words (code second), first
 * point, count, first channel, word bits and code, the slot it sits in, its state in our words
 * (in force / waits for reboot / clash) and why. Every edit stages the whole map through `onChange`.
 */
import { Trash2 } from 'lucide-react';
import type { ControllerModule, PointMapRow } from '@/simulator';
import { cn } from '@/components/ui/cn';
import { NumberCell } from './number-cell';
import { FAMILIES, FAMILY_WORDS, STATE_WORDS, channelRange, rowChannels, rowPoints, type PointFamily, type PointMapRowView, type RowState } from './point-map-state';

/** State marks: a word and a border style, never colour alone. */
const STATE_STYLE: Record<RowState, string> = {
  'in-force': 'border-slate-400 bg-white text-slate-800',
  waiting: 'border-dashed border-amber-700 bg-amber-50 text-amber-950',
  clash: 'border-red-700 bg-red-50 text-red-900',
};

type Props = {
  view: PointMapRowView;
  modules: readonly ControllerModule[];
  canEdit: boolean;
  onChange(patch: Partial<PointMapRow>, label: string): void;
  onRemove(): void;
};

function Field({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <span className="flex flex-col gap-0.5">
      <span aria-hidden className="text-[10px] font-medium uppercase tracking-wide text-slate-600">
        {label}
      </span>
      {children}
    </span>
  );
}

export function RangeEditor({ view, modules, canEdit, onChange, onRemove }: Props) {
  const r = view.row;
  const removed = view.change === 'removed';
  const disabled = !canEdit || removed;
  const word = r.family === 'WI' || r.family === 'WO';
  const [c0, c1] = rowChannels(r);
  const int = (label: string, key: 'first' | 'count' | 'firstChannel' | 'bits', value: number, min: number, max: number, word: string) => (
    <Field label={label}>
      <NumberCell
        label={`${word} of ${r.id}`}
        value={value}
        min={min}
        max={max}
        integer
        disabled={disabled}
        onCommit={(n) => onChange({ [key]: n }, `Set ${word.toLowerCase()} of ${r.id}`)}
        className="w-14 disabled:bg-transparent disabled:text-slate-700"
      />
    </Field>
  );
  return (
    <li
      className={cn('rounded border p-2 text-xs', STATE_STYLE[view.state], removed && 'opacity-80')}
      data-testid={`point-map-row-${r.id}`}
      data-state={view.state}
      aria-label={`Range ${rowPoints(r)} (${r.id}), ${STATE_WORDS[view.state]}`}
    >
      <div className="flex flex-wrap items-baseline gap-x-2 gap-y-1">
        <span className={cn('font-mono text-sm font-semibold', removed && 'line-through')}>{rowPoints(r)}</span>
        <span>
          {FAMILY_WORDS[r.family]} <span className="font-mono text-[10px] text-slate-700">{r.family}</span>
        </span>
        <span className="font-mono text-[10px] text-slate-700">ch {channelRange(c0, c1)}</span>
        <span className="ml-auto rounded-full border border-current px-1.5 font-semibold" data-testid={`point-map-state-${r.id}`}>
          {STATE_WORDS[view.state]}
          {view.change ? ` · ${view.change}` : ''}
        </span>
        {!removed && canEdit ? (
          <button type="button" aria-label={`Remove range ${r.id}`} className="rounded p-0.5 text-slate-700 hover:bg-red-100 hover:text-red-800" onClick={onRemove}>
            <Trash2 aria-hidden className="h-3.5 w-3.5" />
          </button>
        ) : null}
      </div>
      {removed ? null : (
        <div className="mt-1.5 flex flex-wrap items-end gap-1.5">
          <Field label="Family">
            <select
              aria-label={`Family of ${r.id}`}
              className="rounded border border-slate-400 bg-white px-1 py-0.5 text-xs text-slate-900 disabled:border-transparent disabled:bg-transparent"
              value={r.family}
              disabled={disabled}
              onChange={(e) => onChange({ family: e.target.value as PointFamily }, `Set family of ${r.id}`)}
            >
              {FAMILIES.map((f) => (
                <option key={f} value={f}>
                  {FAMILY_WORDS[f]} ({f})
                </option>
              ))}
            </select>
          </Field>
          {int('First', 'first', r.first, 1, 9999, 'First point')}
          {int('Count', 'count', r.count, 1, 64, 'Count')}
          {int('From ch', 'firstChannel', r.firstChannel, 0, 63, 'First channel')}
          {word ? (
            <>
              {int('Bits', 'bits', r.bits ?? 8, 1, 16, 'Bits')}
              <Field label="Code">
                <select
                  aria-label={`Encoding of ${r.id}`}
                  className="rounded border border-slate-400 bg-white px-1 py-0.5 text-xs text-slate-900 disabled:border-transparent disabled:bg-transparent"
                  value={r.encoding ?? 'binary'}
                  disabled={disabled}
                  onChange={(e) => onChange({ encoding: e.target.value as PointMapRow['encoding'] }, `Set encoding of ${r.id}`)}
                >
                  <option value="binary">binary</option>
                  <option value="bcd">BCD</option>
                  <option value="gray">Gray</option>
                </select>
              </Field>
            </>
          ) : null}
          <Field label="Slot">
            <select
              aria-label={`Slot of ${r.id}`}
              className="rounded border border-slate-400 bg-white px-1 py-0.5 text-xs text-slate-900 disabled:border-transparent disabled:bg-transparent"
              value={`${r.rack}.${r.slot}`}
              disabled={disabled}
              onChange={(e) => {
                const [rack, slot] = e.target.value.split('.').map(Number);
                onChange({ rack, slot }, `Move ${r.id} to rack ${rack} slot ${slot}`);
              }}
            >
              {modules.some((m) => m.rack === r.rack && m.slot === r.slot) ? null : (
                <option value={`${r.rack}.${r.slot}`}>
                  rack {r.rack} slot {r.slot} (no module)
                </option>
              )}
              {modules.map((m) => (
                <option key={m.id} value={`${m.rack}.${m.slot}`}>
                  rack {m.rack} slot {m.slot} · {m.type}
                </option>
              ))}
            </select>
          </Field>
        </div>
      )}
      <p className="mt-1 text-slate-800" data-testid={`point-map-why-${r.id}`}>
        {view.explanation.join('; ')}
      </p>
    </li>
  );
}
