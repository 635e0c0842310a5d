'use client';
/**
 * The controller's modules drawn as racks of slot cards, each with its family, channel count
 * and live channel values. An ON channel is filled and bold, an OFF one hollow: state is
 * never shown by colour alone.
 */
import { memo, useMemo } from 'react';
import type { ControllerModule, PointMapRow } from '@/simulator';
import { useSnapshot, shallowEqual } from '@/components/workspace/contract';
import { cn } from '@/components/ui/cn';
import { rowChannels } from './point-map-state';
import { channelsPerPoint } from '@/simulator';

const FAMILY_OF_TYPE: Record<ControllerModule['type'], string> = {
  'digital-in': 'DI',
  'digital-out': 'DO',
  'analog-in': 'AI',
  'analog-out': 'AO',
  'tool-in': 'TI',
  'tool-out': 'TO',
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

const SlotCard = memo(function SlotCard({ module: m, rows, dead }: { module: ControllerModule; rows: readonly PointMapRow[]; dead: boolean }) {
  const values = useSnapshot((s) => s.controller.channels[`${m.rack}.${m.slot}`], shallowEqual);
  const points = useMemo(() => channelPoints(rows, m), [rows, m]);
  const analog = m.type === 'analog-in' || m.type === 'analog-out';
  return (
    <div
      className={cn('w-44 shrink-0 rounded-md border bg-white p-2 shadow-sm', dead ? 'border-red-400' : 'border-slate-300')}
      data-testid={`slot-${m.rack}-${m.slot}`}
    >
      <div className="flex items-baseline justify-between">
        <span className="font-mono text-xs text-slate-500">slot {m.slot}</span>
        <span className="rounded bg-slate-800 px-1.5 font-mono text-xs font-semibold text-white">{FAMILY_OF_TYPE[m.type]}</span>
      </div>
      <p className="truncate text-sm font-medium" title={m.id}>
        {m.id}
      </p>
      <p className="text-[11px] text-slate-500">
        {m.type} · {m.channels} ch{m.signal ? ` · ${m.signal}` : ''}
      </p>
      {dead ? <p className="mt-1 rounded bg-red-50 px-1 text-[11px] font-semibold text-red-800">module dead (fault card)</p> : null}
      <div className={cn('mt-2 grid gap-1', analog ? 'grid-cols-2' : 'grid-cols-8')}>
        {Array.from({ length: m.channels }, (_, ch) => {
          const v = values?.[ch];
          const on = !analog && v !== undefined && v !== 0;
          const title = `channel ${ch}${points[ch].length ? ` → ${points[ch].join(', ')}` : ' (unmapped)'}${v !== undefined ? ` = ${v}` : ''}`;
          return analog ? (
            <span key={ch} title={title} className="rounded border border-slate-200 px-1 font-mono text-[10px]" data-testid={`channel-${m.rack}-${m.slot}-${ch}`} data-value={v}>
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
                on ? 'bg-teal-500 font-bold text-white ring-1 ring-teal-700' : 'border border-slate-300 text-slate-500',
                points[ch].length === 0 && !on && 'border-dashed text-slate-300',
              )}
            >
              {ch}
            </span>
          );
        })}
      </div>
    </div>
  );
});

export function RackView({ modules, rows }: { modules: readonly ControllerModule[]; rows: readonly PointMapRow[] }) {
  const dead = useSnapshot((s) => s.controller.moduleFaults, shallowEqual);
  const racks = useMemo(() => {
    const by = new Map<number, ControllerModule[]>();
    for (const m of modules) by.set(m.rack, [...(by.get(m.rack) ?? []), m]);
    return [...by].sort((a, b) => a[0] - b[0]).map(([rack, ms]) => ({ rack, modules: ms.sort((a, b) => a.slot - b.slot) }));
  }, [modules]);
  if (racks.length === 0) return <p className="text-sm text-slate-500">No controller modules in this cell.</p>;
  return (
    <div className="space-y-3">
      {racks.map(({ rack, modules: ms }) => (
        <div key={rack} className="rounded-md border border-slate-400 bg-slate-200 p-2" aria-label={`Rack ${rack}`} role="group">
          <p className="mb-1 font-mono text-xs font-semibold text-slate-700">rack {rack}</p>
          <div className="flex flex-wrap gap-2 pb-1">
            {ms.map((m) => (
              <SlotCard key={m.id} module={m} rows={rows} dead={dead?.includes(m.id) ?? false} />
            ))}
          </div>
        </div>
      ))}
    </div>
  );
}
