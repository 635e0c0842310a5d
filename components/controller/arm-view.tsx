'use client';
/**
 * A 2D view of the arm: a two-link arm reaching the tool point the snapshot reports
 * (`arm.pose`, x and y of the first two axes), the taught poses, the move's target and the
 * gripper. The engine computes motion and timing; this only draws each snapshot, so the
 * animation follows the engine's move times exactly.
 */
import { useMemo } from 'react';
import type { CellDocument } from '@/simulator';

type Pose = CellDocument['controller']['poses'][number];
import { useArmState } from './use-controller';
import { armGeometry, fitView, labelPlacement } from './arm-geometry';

const W = 420;
const H = 260;

export function ArmView({ poses, homePose }: { poses: readonly Pose[]; homePose: string }) {
  const { pose, target, moving, gripper } = useArmState();
  const home = poses.find((p) => p.id === homePose)?.coordinates ?? [0, 0];
  const tool = pose && pose.length > 0 ? pose : home;
  const view = useMemo(() => fitView(poses.map((p) => p.coordinates), W, H), [poses]);
  const geo = useMemo(() => armGeometry(poses.map((p) => p.coordinates)), [poses]);
  const joints = geo.solve(tool[0] ?? 0, tool[1] ?? 0);
  const P = (x: number, y: number) => view.toScreen(x, y);
  const [bx, by] = P(0, 0);
  const [ex, ey] = P(joints.elbow[0], joints.elbow[1]);
  const [tx, ty] = P(joints.tool[0], joints.tool[1]);
  const jaw = 4 + 8 * (1 - (gripper ?? 0));
  const gripWord = gripper === null ? 'no gripper' : gripper >= 0.99 ? 'gripper closed' : gripper <= 0.01 ? 'gripper open' : 'gripper moving';

  return (
    <figure className="space-y-1">
      <svg
        viewBox={`0 0 ${W} ${H}`}
        className="w-full max-w-[520px] rounded-md border border-slate-300 bg-slate-50"
        role="img"
        aria-label={`Arm at x ${(tool[0] ?? 0).toFixed(3)}, y ${(tool[1] ?? 0).toFixed(3)}${moving ? `, moving to ${target}` : ''}, ${gripWord}`}
        data-testid="arm-view"
        data-x={(tool[0] ?? 0).toFixed(4)}
        data-y={(tool[1] ?? 0).toFixed(4)}
      >
        <line x1={0} x2={W} y1={by} y2={by} stroke="#cbd5e1" strokeDasharray="4 4" />
        {poses.map((p) => {
          const [px, py] = P(p.coordinates[0] ?? 0, p.coordinates[1] ?? 0);
          const isTarget = p.id === target;
          const label = p.label ?? p.id;
          const at = labelPlacement(px, py, label, W);
          return (
            <g key={p.id}>
              <circle cx={px} cy={py} r={isTarget ? 7 : 5} fill={isTarget ? '#c8f3ee' : '#fff'} stroke={isTarget ? '#0f7874' : '#64748b'} strokeWidth={isTarget ? 2.5 : 1.5} />
              <text x={at.x} y={at.y} textAnchor={at.anchor} fontSize={11} fill={isTarget ? '#10605d' : '#475569'} fontWeight={isTarget ? 700 : 400}>
                {label}
              </text>
            </g>
          );
        })}
        <rect x={bx - 18} y={by} width={36} height={12} fill="#334155" rx={2} />
        <line x1={bx} y1={by} x2={ex} y2={ey} stroke="#475569" strokeWidth={12} strokeLinecap="round" />
        <line x1={ex} y1={ey} x2={tx} y2={ty} stroke="#64748b" strokeWidth={9} strokeLinecap="round" />
        <circle cx={bx} cy={by} r={8} fill="#1e293b" />
        <circle cx={ex} cy={ey} r={6} fill="#1e293b" />
        <g transform={`translate(${tx} ${ty})`} data-testid="arm-gripper" data-closed={gripper !== null && gripper >= 0.99 ? 'true' : 'false'}>
          <rect x={-jaw - 3} y={-2} width={3} height={14} fill="#0f172a" />
          <rect x={jaw} y={-2} width={3} height={14} fill="#0f172a" />
          <rect x={-jaw - 3} y={-4} width={2 * jaw + 6} height={3} fill="#0f172a" />
        </g>
      </svg>
      <figcaption className="font-mono text-xs text-slate-600">
        x {(tool[0] ?? 0).toFixed(3)} · y {(tool[1] ?? 0).toFixed(3)} · {moving ? `moving → ${target}` : 'at rest'} · {gripWord}
      </figcaption>
    </figure>
  );
}
