'use client';
/** The taught poses: coordinates per axis, speed and acceleration limits; add and remove. */
import { Plus, Trash2 } from 'lucide-react';
import type { CellDocument } from '@/simulator';

type Pose = CellDocument['controller']['poses'][number];
import { NumberCell } from './number-cell';

function Cell(props: { label: string; value: number; min: number; max: number; disabled: boolean; exclusiveMin?: boolean; onCommit(v: number): void }) {
  return <NumberCell {...props} className="w-20 disabled:border-transparent" />;
}

export function PosesTable({ poses, axes, homePose, canEdit, onChange }: { poses: readonly Pose[]; axes: number; homePose: string; canEdit: boolean; onChange(poses: Pose[], label: string): void }) {
  const set = (i: number, patch: Partial<Pose>, label: string) => onChange(poses.map((p, j) => (j === i ? { ...p, ...patch } : p)), label);
  const add = () => {
    const ids = new Set(poses.map((p) => p.id));
    let n = poses.length + 1;
    while (ids.has(`pose${n}`)) n++;
    const from = poses.find((p) => p.id === homePose) ?? poses[0];
    onChange([...poses, { id: `pose${n}`, label: `Pose ${n}`, coordinates: [...(from?.coordinates ?? new Array(axes).fill(0))], speed: from?.speed ?? 0.5, accel: from?.accel ?? 1 }], 'Add pose');
  };
  const axisNames = axes === 2 ? ['x', 'y'] : Array.from({ length: axes }, (_, i) => `axis ${i + 1}`);
  return (
    <div className="space-y-2">
      <table className="border-collapse text-sm" data-testid="poses-table">
        <thead>
          <tr className="border-b border-slate-300 text-left text-xs uppercase tracking-wide text-slate-500">
            <th className="px-1 py-1">Pose</th>
            {axisNames.map((a) => (
              <th key={a} className="px-1">
                {a}
              </th>
            ))}
            <th className="px-1">Speed /s</th>
            <th className="px-1">Accel /s²</th>
            <th className="px-1" aria-label="Actions" />
          </tr>
        </thead>
        <tbody>
          {poses.map((p, i) => (
            <tr key={p.id} className="border-b border-slate-200" data-testid={`pose-${p.id}`}>
              <td className="px-1 py-1">
                <span className="font-mono text-xs">{p.id}</span>
                {p.id === homePose ? <span className="ml-1 rounded bg-slate-200 px-1 text-[10px] uppercase">home</span> : null}
                {p.label ? <span className="block text-xs text-slate-500">{p.label}</span> : null}
              </td>
              {axisNames.map((a, k) => (
                <td key={a} className="px-1 py-1">
                  <Cell
                    label={`${a} of ${p.id}`}
                    value={p.coordinates[k] ?? 0}
                    min={-1000}
                    max={1000}
                    disabled={!canEdit}
                    onCommit={(v) => {
                      const coordinates = [...p.coordinates];
                      while (coordinates.length <= k) coordinates.push(0);
                      coordinates[k] = v;
                      set(i, { coordinates }, `Set ${a} of ${p.id}`);
                    }}
                  />
                </td>
              ))}
              <td className="px-1 py-1">
                <Cell label={`Speed of ${p.id}`} value={p.speed} min={0} exclusiveMin max={100} disabled={!canEdit} onCommit={(speed) => set(i, { speed }, `Set speed of ${p.id}`)} />
              </td>
              <td className="px-1 py-1">
                <Cell label={`Acceleration of ${p.id}`} value={p.accel} min={0} exclusiveMin max={1000} disabled={!canEdit} onCommit={(accel) => set(i, { accel }, `Set acceleration of ${p.id}`)} />
              </td>
              <td className="px-1 py-1">
                {canEdit && p.id !== homePose ? (
                  <button type="button" aria-label={`Remove pose ${p.id}`} className="rounded p-1 text-slate-500 hover:bg-red-50 hover:text-red-700" onClick={() => onChange(poses.filter((_, j) => j !== i), `Remove pose ${p.id}`)}>
                    <Trash2 className="h-4 w-4" />
                  </button>
                ) : null}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {canEdit ? (
        <button type="button" onClick={add} className="inline-flex items-center gap-1 rounded border border-slate-300 bg-white px-2 py-1 text-sm hover:bg-slate-100">
          <Plus aria-hidden className="h-4 w-4" /> Add pose
        </button>
      ) : null}
    </div>
  );
}
