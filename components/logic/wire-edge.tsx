'use client';
/**
 * One wire on the logic canvas. While the cell runs, a TRUE BOOL wire is drawn brighter and
 * thicker (never by colour alone) and a numeric wire carries its value as a label. The wire
 * subscribes to its own source output only, so it re-renders when that value changes.
 */
import { memo } from 'react';
import { BaseEdge, EdgeLabelRenderer, getSmoothStepPath, type Edge, type EdgeProps } from '@xyflow/react';
import type { PortSpec } from '@/simulator';

type PortType = PortSpec['type'];
import { useLiveOutput } from './use-logic';
import { formatLiveValue } from './sheet-graph';

export type WireEdgeData = {
  sourceBlock: string;
  sourcePort: string;
  type: PortType;
  problem: string | null;
  inLoop: boolean;
};

export type WireFlowEdge = Edge<WireEdgeData, 'wire'>;

function WireEdgeView(props: EdgeProps<WireFlowEdge>) {
  const { id, sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition, data, selected } = props;
  const value = useLiveOutput(data?.sourceBlock ?? '', data?.sourcePort ?? '');
  const [path, labelX, labelY] = getSmoothStepPath({ sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition, borderRadius: 6 });
  const bad = Boolean(data?.problem) || Boolean(data?.inLoop);
  const on = value === true;
  const numeric = typeof value === 'number';
  let stroke = '#94a3b8';
  let width = 1.5;
  if (on) {
    stroke = '#14b8a6';
    width = 4;
  } else if (numeric) {
    stroke = '#475569';
    width = 2;
  }
  if (bad) stroke = '#dc2626';
  if (selected) width += 1;
  return (
    <>
      <BaseEdge
        id={id}
        path={path}
        interactionWidth={14}
        style={{
          stroke,
          strokeWidth: width,
          strokeDasharray: bad ? '6 4' : undefined,
          filter: on ? 'drop-shadow(0 0 2px rgba(20,184,166,0.7))' : undefined,
        }}
      />
      {numeric || bad ? (
        <EdgeLabelRenderer>
          <div
            className="nodrag nopan pointer-events-none absolute"
            style={{ transform: `translate(-50%, -50%) translate(${labelX}px, ${labelY}px)` }}
          >
            {numeric ? (
              <span data-testid={`wire-value-${id}`} className="rounded bg-slate-800 px-1 font-mono text-[10px] text-white">
                {formatLiveValue(value)}
              </span>
            ) : null}
            {bad ? (
              <span title={data?.problem ?? 'part of an algebraic loop'} className="ml-1 rounded bg-red-600 px-1 text-[10px] font-semibold text-white">
                {data?.inLoop ? 'loop' : '!'}
              </span>
            ) : null}
          </div>
        </EdgeLabelRenderer>
      ) : null}
    </>
  );
}

export const WireEdge = memo(WireEdgeView);
