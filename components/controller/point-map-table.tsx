'use client';
/**
 * The point-map table: the rows as they will run after the next restart, each with its
 * state (live, staged, conflict) and why. Editing a row stages the whole map — the engine is
 * told with `stage-point-map` and the document keeps the staged rows for saving, and the run
 * goes on with the old map until "Restart controller".
 */
import { useMemo } from 'react';
import { Plus, RotateCcw, Trash2, Undo2 } from 'lucide-react';
import type { ControllerModule, PointMapRow } from '@/simulator';

type PointFamily = PointMapRow['family'];
import { Button } from '@/components/ui/button';
import { cn } from '@/components/ui/cn';
import { canApplyStaged, pointMapView, rowChannels, channelRange, type RowState } from './point-map-state';
import { NumberCell } from './number-cell';

const FAMILIES: PointFamily[] = ['DI', 'DO', 'AI', 'AO', 'WI', 'WO', 'TI', 'TO'];

const STATE_STYLE: Record<RowState, string> = {
  live: 'border-slate-300 bg-white text-slate-700',
  staged: 'border-amber-400 bg-amber-50 text-amber-900',
  conflict: 'border-red-500 bg-red-50 text-red-800',
};

type Props = {
  live: readonly PointMapRow[];
  staged: readonly PointMapRow[] | null;
  modules: readonly ControllerModule[];
  canEdit: boolean;
  onStage(rows: PointMapRow[], label: string): void;
  onDiscard(): void;
  onRestart(): void;
};

function IntCell(props: { label: string; value: number; min: number; max: number; disabled: boolean; onCommit(v: number): void }) {
  return <NumberCell {...props} integer className="w-14 disabled:bg-transparent disabled:text-slate-500" />;
}

export function PointMapTable({ live, staged, modules, canEdit, onStage, onDiscard, onRestart }: Props) {
  const views = useMemo(() => pointMapView(live, staged, modules), [live, staged, modules]);
  const base = staged ?? live;
  const applicable = canApplyStaged(views, staged);
  const conflicts = views.filter((v) => v.state === 'conflict').length;

  const update = (id: string, patch: Partial<PointMapRow>, label: string) => {
    onStage(
      base.map((r) => {
        if (r.id !== id) return r;
        const next = { ...r, ...patch };
        if (next.family !== 'WI' && next.family !== 'WO') {
          delete next.bits;
          delete next.encoding;
        } else {
          next.bits ??= 8;
          next.encoding ??= 'binary';
        }
        return next;
      }),
      label,
    );
  };

  const addRow = () => {
    const ids = new Set(base.map((r) => r.id));
    let n = base.length + 1;
    while (ids.has(`pm-${n}`)) n++;
    const m = modules[0];
    onStage([...base, { id: `pm-${n}`, family: 'DI', first: 1 + Math.max(0, ...base.filter((r) => r.family === 'DI').map((r) => r.first + r.count - 1)), count: 1, rack: m?.rack ?? 0, slot: m?.slot ?? 0, firstChannel: 0 }], 'Add point-map row');
  };

  return (
    <div className="space-y-2">
      <div className="flex flex-wrap items-center gap-2">
        <Button onClick={onRestart} disabled={!canEdit || (staged !== null && !applicable)} data-testid="restart-controller" title={staged && !applicable ? 'Fix the conflicting rows first' : undefined}>
          <RotateCcw aria-hidden className="h-4 w-4" /> Restart controller
        </Button>
        <Button variant="secondary" onClick={onDiscard} disabled={!canEdit || !staged} data-testid="discard-staged">
          <Undo2 aria-hidden className="h-4 w-4" /> Discard staged
        </Button>
        <Button variant="secondary" onClick={addRow} disabled={!canEdit}>
          <Plus aria-hidden className="h-4 w-4" /> Add row
        </Button>
        <p className="text-sm text-slate-600" data-testid="point-map-summary" role="status">
          {staged === null
            ? 'No staged changes: the table is the running map.'
            : conflicts > 0
              ? `${conflicts} conflicting row${conflicts === 1 ? '' : 's'}: restart applies nothing until fixed.`
              : 'Staged changes wait for a controller restart; the run still uses the old map.'}
        </p>
      </div>
      <div className="overflow-x-auto">
        <table className="w-full min-w-[900px] border-collapse text-sm" data-testid="point-map-table">
          <thead>
            <tr className="border-b border-slate-300 text-left text-xs uppercase tracking-wide text-slate-500">
              <th className="px-1 py-1">#</th>
              <th className="px-1">Row</th>
              <th className="px-1">Family</th>
              <th className="px-1">First</th>
              <th className="px-1">Count</th>
              <th className="px-1">Rack</th>
              <th className="px-1">Slot</th>
              <th className="px-1">1st ch.</th>
              <th className="px-1">Bits / code</th>
              <th className="px-1">Channels</th>
              <th className="px-1">State</th>
              <th className="px-1">Why</th>
              <th className="px-1" aria-label="Actions" />
            </tr>
          </thead>
          <tbody>
            {views.map((v) => {
              const r = v.row;
              const removed = v.change === 'removed';
              const disabled = !canEdit || removed;
              const word = r.family === 'WI' || r.family === 'WO';
              const [c0, c1] = rowChannels(r);
              return (
                <tr
                  key={`${r.id}-${removed ? 'removed' : 'row'}`}
                  data-testid={`point-map-row-${r.id}`}
                  data-state={v.state}
                  className={cn('border-b border-slate-200 align-top', removed && 'opacity-60', v.state === 'conflict' && 'bg-red-50/50')}
                >
                  <td className="px-1 py-1 font-mono text-xs text-slate-500">{v.number}</td>
                  <td className={cn('px-1 py-1 font-mono text-xs', removed && 'line-through')}>{r.id}</td>
                  <td className="px-1 py-1">
                    <select
                      aria-label={`Family of ${r.id}`}
                      className="rounded border border-slate-300 px-1 py-0.5 font-mono text-sm disabled:border-transparent"
                      value={r.family}
                      disabled={disabled}
                      onChange={(e) => update(r.id, { family: e.target.value as PointFamily }, `Set family of ${r.id}`)}
                    >
                      {FAMILIES.map((f) => (
                        <option key={f}>{f}</option>
                      ))}
                    </select>
                  </td>
                  <td className="px-1 py-1">
                    <IntCell label={`First point of ${r.id}`} value={r.first} min={1} max={9999} disabled={disabled} onCommit={(n) => update(r.id, { first: n }, `Set first point of ${r.id}`)} />
                  </td>
                  <td className="px-1 py-1">
                    <IntCell label={`Count of ${r.id}`} value={r.count} min={1} max={64} disabled={disabled} onCommit={(n) => update(r.id, { count: n }, `Set count of ${r.id}`)} />
                  </td>
                  <td className="px-1 py-1">
                    <IntCell label={`Rack of ${r.id}`} value={r.rack} min={0} max={15} disabled={disabled} onCommit={(n) => update(r.id, { rack: n }, `Set rack of ${r.id}`)} />
                  </td>
                  <td className="px-1 py-1">
                    <IntCell label={`Slot of ${r.id}`} value={r.slot} min={0} max={63} disabled={disabled} onCommit={(n) => update(r.id, { slot: n }, `Set slot of ${r.id}`)} />
                  </td>
                  <td className="px-1 py-1">
                    <IntCell
                      label={`First channel of ${r.id}`}
                      value={r.firstChannel}
                      min={0}
                      max={63}
                      disabled={disabled}
                      onCommit={(n) => update(r.id, { firstChannel: n }, `Set first channel of ${r.id}`)}
                    />
                  </td>
                  <td className="px-1 py-1">
                    {word ? (
                      <span className="flex gap-1">
                        <IntCell label={`Bits of ${r.id}`} value={r.bits ?? 8} min={1} max={16} disabled={disabled} onCommit={(n) => update(r.id, { bits: n }, `Set bits of ${r.id}`)} />
                        <select
                          aria-label={`Encoding of ${r.id}`}
                          className="rounded border border-slate-300 px-1 py-0.5 text-sm"
                          value={r.encoding ?? 'binary'}
                          disabled={disabled}
                          onChange={(e) => update(r.id, { encoding: e.target.value as PointMapRow['encoding'] }, `Set encoding of ${r.id}`)}
                        >
                          <option value="binary">binary</option>
                          <option value="bcd">BCD</option>
                          <option value="gray">Gray</option>
                        </select>
                      </span>
                    ) : (
                      <span className="text-slate-400">—</span>
                    )}
                  </td>
                  <td className="px-1 py-1 font-mono text-xs text-slate-600">{channelRange(c0, c1)}</td>
                  <td className="px-1 py-1">
                    <span className={cn('inline-block rounded border px-1.5 py-0.5 text-xs font-semibold', STATE_STYLE[v.state])} data-testid={`point-map-state-${r.id}`}>
                      {v.state}
                      {v.change ? ` · ${v.change}` : ''}
                    </span>
                  </td>
                  <td className="max-w-[22rem] px-1 py-1 text-xs text-slate-700" data-testid={`point-map-why-${r.id}`}>
                    {v.explanation.join('; ')}
                  </td>
                  <td className="px-1 py-1">
                    {!removed && canEdit ? (
                      <button
                        type="button"
                        aria-label={`Remove row ${r.id}`}
                        className="rounded p-1 text-slate-500 hover:bg-red-50 hover:text-red-700"
                        onClick={() => onStage(base.filter((x) => x.id !== r.id), `Remove point-map row ${r.id}`)}
                      >
                        <Trash2 className="h-4 w-4" />
                      </button>
                    ) : null}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </div>
  );
}
