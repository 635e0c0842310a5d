'use client';
/**
 * One controller module as a slot card: what it is (family in words, code second), its channels
 * with live values, and the point-map ranges that sit on it, edited right there. An ON channel
 * is filled and bold, an OFF one hollow: state is never shown by colour alone.
 */
import { useMemo } from 'react';
import { Plus } from 'lucide-react';
import { channelsPerPoint, type ControllerModule, type PointMapRow } from '@/simulator';
import { cn } from '@/components/ui/cn';
import { FAMILY_WORDS, familiesFor, rowChannels, type PointMapRowView } from './point-map-state';
import { RangeEditor } from './range-editor';
import { useSlotChannels } from './use-controller';

/** A module type in words, with the short family code for the chip. */
const MODULE_WORDS: Record<ControllerModule['type'], { words: string; code: string }> = {
  'digital-in': { words: 'digital in', code: 'DI' },
  'digital-out': { words: 'digital out', code: 'DO' },
  'analog-in': { words: 'analog in', code: 'AI' },
  'analog-out': { words: 'analog out', code: 'AO' },
  'tool-in': { words: 'tool in', code: 'TI' },
  'tool-out': { words: 'tool out', code: 'TO' },
};

/** Which logical points use each channel of a module, from the running map. */
function channelPoints(rows: readonly PointMapRow[], m: ControllerModule): string[][] {
  const out: string[][] = Array.from({ length: m.channels }, () => []);
  for (const row of rows) {
    if (row.rack !== m.rack || row.slot !== m.slot) continue;
    const [c0] = rowChannels(row);
    const per = channelsPerPoint(row);
    for (let i = 0; i < row.count; i++) {
      for (let b = 0; b < per; b++) {
        const ch = c0 + i * per + b;
        if (ch < m.channels) out[ch].push(per > 1 ? `${row.family}${row.first + i}.${b}` : `${row.family}${row.first + i}`);
      }
    }
  }
  return out;
}

export type RangeActions = {
  canEdit: boolean;
  modules: readonly ControllerModule[];
  change(id: string, patch: Partial<PointMapRow>, label: string): void;
  remove(id: string): void;
  add(module: ControllerModule): void;
};

export function SlotCard({
  module: m,
  running,
  ranges,
  dead,
  actions,
}: {
  module: ControllerModule;
  /** The map that runs now (what each channel carries at this instant). */
  running: readonly PointMapRow[];
  /** The ranges on this slot as they will run after the next reboot, and ranges removed from it. */
  ranges: readonly PointMapRowView[];
  dead: boolean;
  actions: RangeActions;
}) {
  const values = useSlotChannels(m.rack, m.slot);
  const points = useMemo(() => channelPoints(running, m), [running, m]);
  const analog = m.type === 'analog-in' || m.type === 'analog-out';
  const kind = MODULE_WORDS[m.type];
  return (
    <section
      className={cn('w-full min-w-0 rounded-md border bg-white p-2 shadow-sm sm:w-80', dead ? 'border-2 border-red-700' : 'border-slate-400')}
      data-testid={`slot-${m.rack}-${m.slot}`}
      aria-label={`Rack ${m.rack} slot ${m.slot}: ${kind.words} module ${m.id}`}
    >
      <div className="flex items-baseline justify-between gap-2">
        <h4 className="text-sm font-semibold text-slate-900">
          slot {m.slot} · {kind.words}
        </h4>
        <span className="rounded bg-slate-800 px-1.5 font-mono text-xs font-semibold text-white">{kind.code}</span>
      </div>
      <p className="truncate font-mono text-xs text-slate-700" title={m.id}>
        {m.id} · {m.channels} ch{m.signal ? ` · ${m.signal}` : ''}
      </p>
      {dead ? <p className="mt-1 rounded bg-red-50 px-1 text-[11px] font-semibold text-red-800">module dead (fault card)</p> : null}
      <div className={cn('mt-2 grid gap-1', analog ? 'grid-cols-2' : 'grid-cols-8')}>
        {Array.from({ length: m.channels }, (_, ch) => {
          const v = values?.[ch];
          const on = !analog && v !== undefined && v !== 0;
          const title = `channel ${ch}${points[ch].length ? ` → ${points[ch].join(', ')}` : ' (unmapped)'}${v !== undefined ? ` = ${v}` : ''}`;
          return analog ? (
            <span key={ch} title={title} className="rounded border border-slate-300 px-1 font-mono text-[10px] text-slate-800" data-testid={`channel-${m.rack}-${m.slot}-${ch}`} data-value={v}>
              {ch}: {v === undefined ? '—' : Number(v.toFixed(2))}
            </span>
          ) : (
            <span
              key={ch}
              title={title}
              data-testid={`channel-${m.rack}-${m.slot}-${ch}`}
              data-on={on ? 'true' : 'false'}
              className={cn(
                'flex h-5 items-center justify-center rounded-sm font-mono text-[10px]',
                on ? 'bg-teal-800 font-bold text-white ring-1 ring-teal-950' : 'border border-slate-400 text-slate-700',
                points[ch].length === 0 && !on && 'border-dashed',
              )}
            >
              {ch}
            </span>
          );
        })}
      </div>
      <h5 className="mt-2 text-[11px] font-semibold uppercase tracking-wide text-slate-700">Point ranges</h5>
      {ranges.length === 0 ? <p className="text-xs text-slate-700">No points mapped to this slot.</p> : null}
      <ul className="mt-1 space-y-1.5">
        {ranges.map((v) => (
          <RangeEditor
            key={`${v.row.id}-${v.change === 'removed' ? 'removed' : 'range'}`}
            view={v}
            modules={actions.modules}
            canEdit={actions.canEdit}
            onChange={(patch, label) => actions.change(v.row.id, patch, label)}
            onRemove={() => actions.remove(v.row.id)}
          />
        ))}
      </ul>
      {actions.canEdit ? (
        <button
          type="button"
          onClick={() => actions.add(m)}
          className="mt-1.5 inline-flex items-center gap-1 rounded border border-slate-400 bg-white px-2 py-0.5 text-xs font-medium text-slate-800 hover:bg-slate-100"
          aria-label={`Add a range to rack ${m.rack} slot ${m.slot}`}
        >
          <Plus aria-hidden className="h-3.5 w-3.5" /> Add a range ({familiesFor(m.type).map((f) => FAMILY_WORDS[f]).join(' or ')})
        </button>
      ) : null}
    </section>
  );
}
