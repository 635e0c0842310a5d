'use client';
/**
 * The controller's modules as racks of slot cards, and the point map edited on them: each
 * range sits on the card of the slot it maps to. Above the racks, the reboot that puts staged
 * ranges in force and the drop that forgets them. Edits stage the whole map (the store's
 * `stagePointMap`); the run keeps its map until the controller reboots (DESIGN.md).
 */
import { useMemo } from 'react';
import { RotateCcw, Undo2 } from 'lucide-react';
import type { ControllerModule, PointMapRow } from '@/simulator';
import { Button } from '@/components/ui/button';
import { freshId } from '@/components/workspace/fresh-id';
import { canApplyStaged, familiesFor, newRangeAt, pointMapView, type PointMapRowView } from './point-map-state';
import { SlotCard, type RangeActions } from './slot-card';
import { RangeEditor } from './range-editor';
import { useDeadModules } from './use-controller';

type Props = {
  modules: readonly ControllerModule[];
  live: readonly PointMapRow[];
  staged: readonly PointMapRow[] | null;
  canEdit: boolean;
  onStage(rows: PointMapRow[], label: string): void;
  onDiscard(): void;
  onReboot(): void;
};

/** A row with a patch applied; word families keep bits and a code, the others drop them. */
function patched(r: PointMapRow, patch: Partial<PointMapRow>): PointMapRow {
  const next = { ...r, ...patch };
  if (next.family !== 'WI' && next.family !== 'WO') {
    delete next.bits;
    delete next.encoding;
  } else {
    next.bits ??= 8;
    next.encoding ??= 'binary';
  }
  return next;
}

export function RackView({ modules, live, staged, canEdit, onStage, onDiscard, onReboot }: Props) {
  const dead = useDeadModules();
  const views = useMemo(() => pointMapView(live, staged, modules), [live, staged, modules]);
  const base = staged ?? live;
  const applicable = canApplyStaged(views, staged);
  const clashes = views.filter((v) => v.state === 'clash').length;

  const racks = useMemo(() => {
    const by = new Map<number, ControllerModule[]>();
    for (const m of modules) by.set(m.rack, [...(by.get(m.rack) ?? []), m]);
    return [...by].sort((a, b) => a[0] - b[0]).map(([rack, ms]) => ({ rack, modules: [...ms].sort((a, b) => a.slot - b.slot) }));
  }, [modules]);
  const onSlot = (m: ControllerModule) => views.filter((v) => v.row.rack === m.rack && v.row.slot === m.slot);
  const homeless: PointMapRowView[] = views.filter((v) => !modules.some((m) => m.rack === v.row.rack && m.slot === v.row.slot));

  const actions: RangeActions = {
    canEdit,
    modules,
    change: (id, patch, label) => onStage(base.map((r) => (r.id === id ? patched(r, patch) : r)), label),
    remove: (id) => onStage(base.filter((r) => r.id !== id), `Remove point range ${id}`),
    add: (m) => {
      const family = familiesFor(m.type)[0];
      onStage([...base, newRangeAt(base, m, family, freshId('pm-', base.map((r) => r.id)))], `Add a range to rack ${m.rack} slot ${m.slot}`);
    },
  };

  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-center gap-2">
        <Button
          onClick={onReboot}
          disabled={!canEdit || (staged !== null && !applicable)}
          data-testid="reboot-controller"
          title={staged && !applicable ? 'Fix the clashing ranges first' : undefined}
        >
          <RotateCcw aria-hidden className="h-4 w-4" /> {staged ? 'Reboot controller, staged ranges in force' : 'Reboot controller'}
        </Button>
        <Button variant="secondary" onClick={onDiscard} disabled={!canEdit || !staged} data-testid="discard-staged">
          <Undo2 aria-hidden className="h-4 w-4" /> Drop staged changes
        </Button>
        <p className="min-w-0 text-sm text-slate-700" data-testid="point-map-summary" role="status">
          {staged === null
            ? 'Nothing staged: every range shown is in force.'
            : clashes > 0
              ? `${clashes} clashing range${clashes === 1 ? '' : 's'}: the reboot waits until they are fixed.`
              : 'Staged ranges wait for the controller to reboot; the run still uses the map in force.'}
        </p>
      </div>
      {racks.length === 0 ? <p className="text-sm text-slate-700">No controller modules in this cell.</p> : null}
      {racks.map(({ rack, modules: ms }) => (
        <div key={rack} className="rounded-md border border-slate-400 bg-slate-100 p-2" aria-label={`Rack ${rack}`} role="group">
          <h4 className="mb-1 font-mono text-xs font-semibold text-slate-800">rack {rack}</h4>
          <div className="flex flex-wrap items-start gap-2 pb-1">
            {ms.map((m) => (
              <SlotCard key={m.id} module={m} running={live} ranges={onSlot(m)} dead={dead?.includes(m.id) ?? false} actions={actions} />
            ))}
          </div>
        </div>
      ))}
      {homeless.length > 0 ? (
        <section aria-label="Ranges on no module" className="rounded-md border-2 border-red-700 bg-white p-2">
          <h4 className="text-sm font-semibold text-red-900">Ranges on a slot with no module</h4>
          <ul className="mt-1 space-y-1.5">
            {homeless.map((v) => (
              <RangeEditor
                key={`${v.row.id}-${v.change === 'removed' ? 'removed' : 'range'}`}
                view={v}
                modules={modules}
                canEdit={canEdit}
                onChange={(patch, label) => actions.change(v.row.id, patch, label)}
                onRemove={() => actions.remove(v.row.id)}
              />
            ))}
          </ul>
        </section>
      ) : null}
    </div>
  );
}
