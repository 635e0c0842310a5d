'use client';
/**
 * The logic sheet of a changeover on a read-only canvas: the proposed sheet with its new and
 * changed blocks and wires marked (and the blocks only moved), or the base sheet with what the
 * proposal removes. Marks are an outline style and a worded badge as well as a colour. The
 * list of logic changes beside it selects and centres each one on the canvas.
 *
 * Blocks are drawn by the workspace's own BlockNode (unchanged): it reads live values from a
 * workspace store, so the canvas gets an empty one — there is no running cell here.
 */
import '@xyflow/react/dist/base.css';
import '@/components/logic/logic.css';
import './logic-diff.css';
import { memo, useCallback, useEffect, useMemo, useState } from 'react';
import {
  Background,
  BackgroundVariant,
  BaseEdge,
  Controls,
  EdgeLabelRenderer,
  ReactFlow,
  ReactFlowProvider,
  getSmoothStepPath,
  useReactFlow,
  type Edge,
  type EdgeProps,
  type Node,
  type NodeProps,
} from '@xyflow/react';
import { createStore } from 'zustand/vanilla';
import { Crosshair, Minus, Move, PencilLine, Plus } from 'lucide-react';
import type { DiffEntry, LogicSheetInput } from '@/simulator';
import { BlockNode, inHandle, outHandle, type BlockNodeData } from '@/components/logic/block-node';
import { WorkspaceStoreContext, type WorkspaceStore, type WorkspaceStoreApi } from '@/components/workspace/contract';
import { cn } from '@/components/ui/cn';
import { KindBadge } from './diff-kind-icon';
import { logicMarks, type Mark, type Side } from './logic-marks';


type DiffNodeData = BlockNodeData & { mark?: Mark; focus: boolean };
type DiffNode = Node<DiffNodeData, 'block'>;
type DiffEdgeData = { mark?: Mark; focus: boolean };
type DiffEdge = Edge<DiffEdgeData, 'wire'>;

const NODE_W = 176;
const NODE_H = 90;
const NO_PROBLEMS: BlockNodeData['problems'] = [];
const MARK_WORDS: Record<Mark, string> = { new: 'new', changed: 'changed', removed: 'removed', moved: 'moved' };
const MARK_ICONS = { new: Plus, changed: PencilLine, removed: Minus, moved: Move } as const;

function DiffBlockNodeView(props: NodeProps<DiffNode>) {
  const { mark, focus } = props.data;
  const Icon = mark ? MARK_ICONS[mark] : null;
  return (
    <div className={cn('cw-diff-node', focus && 'cw-diff-focus')} data-mark={mark} data-testid={`diff-block-${props.id}`}>
      {mark && Icon ? (
        <span className="cw-diff-badge" data-mark={mark}>
          <Icon aria-hidden className="h-2.5 w-2.5" />
          {MARK_WORDS[mark]}
        </span>
      ) : null}
      <BlockNode {...(props as unknown as NodeProps<Node<BlockNodeData, 'block'>>)} />
    </div>
  );
}
const DiffBlockNode = memo(DiffBlockNodeView);

const EDGE_STYLE: Record<Mark | 'none', { stroke: string; width: number; dash?: string }> = {
  none: { stroke: '#94a3b8', width: 1.5 },
  new: { stroke: '#0f766e', width: 3.5 },
  changed: { stroke: '#b45309', width: 3.5, dash: '8 5' },
  removed: { stroke: '#be123c', width: 3, dash: '2 4' },
  moved: { stroke: '#94a3b8', width: 1.5 },
};

function DiffWireEdgeView(props: EdgeProps<DiffEdge>) {
  const { id, sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition, data, selected } = props;
  const [path, labelX, labelY] = getSmoothStepPath({ sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition, borderRadius: 6 });
  const mark = data?.mark && data.mark !== 'moved' ? data.mark : undefined;
  const s = EDGE_STYLE[mark ?? 'none'];
  return (
    <>
      <BaseEdge
        id={id}
        path={path}
        interactionWidth={14}
        style={{ stroke: s.stroke, strokeWidth: s.width + (selected || data?.focus ? 1.5 : 0), strokeDasharray: s.dash }}
      />
      {mark ? (
        <EdgeLabelRenderer>
          <div className="nodrag nopan pointer-events-none absolute" style={{ transform: `translate(-50%, -50%) translate(${labelX}px, ${labelY}px)` }}>
            <span className="cw-diff-badge" style={{ position: 'static' }} data-mark={mark} data-testid={`diff-wire-${id}`}>
              {mark === 'changed' ? 're-pointed' : `${MARK_WORDS[mark]} wire`}
            </span>
          </div>
        </EdgeLabelRenderer>
      ) : null}
    </>
  );
}
const DiffWireEdge = memo(DiffWireEdgeView);

const nodeTypes = { block: DiffBlockNode };
const edgeTypes = { wire: DiffWireEdge };

type Focus = { side: Side; kind: 'block' | 'connection'; id: string } | null;

function buildGraph(sheet: LogicSheetInput, marks: { blocks: Map<string, Mark>; connections: Map<string, Mark> }, focus: Focus, side: Side) {
  const nodes: DiffNode[] = sheet.blocks.map((block) => ({
    id: block.id,
    type: 'block',
    position: block.position,
    data: { block, problems: NO_PROBLEMS, inLoop: false, mark: marks.blocks.get(block.id), focus: focus?.side === side && focus.kind === 'block' && focus.id === block.id },
    selected: focus?.side === side && focus.kind === 'block' && focus.id === block.id,
    draggable: false,
    connectable: false,
  }));
  const edges: DiffEdge[] = sheet.connections.map((c) => ({
    id: c.id,
    type: 'wire',
    source: c.from.block,
    sourceHandle: outHandle(c.from.port),
    target: c.to.block,
    targetHandle: inHandle(c.to.port),
    data: { mark: marks.connections.get(c.id), focus: focus?.side === side && focus.kind === 'connection' && focus.id === c.id },
    selected: focus?.side === side && focus.kind === 'connection' && focus.id === c.id,
    // Marked wires are drawn over the others.
    zIndex: marks.connections.has(c.id) ? 1 : 0,
  }));
  return { nodes, edges };
}

/** Where to centre for a block or a wire (its two ends' middle). */
function focusPoint(sheet: LogicSheetInput, f: NonNullable<Focus>): { x: number; y: number } | null {
  const pos = (id: string) => sheet.blocks.find((b) => b.id === id)?.position;
  if (f.kind === 'block') {
    const p = pos(f.id);
    return p ? { x: p.x + NODE_W / 2, y: p.y + NODE_H / 2 } : null;
  }
  const c = sheet.connections.find((x) => x.id === f.id);
  const a = c ? pos(c.from.block) : undefined;
  const b = c ? pos(c.to.block) : undefined;
  return a && b ? { x: (a.x + b.x + NODE_W) / 2, y: (a.y + b.y + NODE_H) / 2 } : null;
}

export interface LogicDiffProps {
  base: LogicSheetInput;
  proposed: LogicSheetInput;
  entries: DiffEntry[];
  baseVersion: number;
  proposedVersion: number;
}

export function LogicDiff(props: LogicDiffProps) {
  // BlockNode reads live values from a workspace store: an empty one (no snapshot) draws none.
  const [store] = useState<WorkspaceStoreApi>(() => createStore<WorkspaceStore>()(() => ({ snapshot: null }) as unknown as WorkspaceStore));
  return (
    <WorkspaceStoreContext.Provider value={store}>
      <ReactFlowProvider>
        <LogicDiffCanvas {...props} />
      </ReactFlowProvider>
    </WorkspaceStoreContext.Provider>
  );
}

function LogicDiffCanvas({ base, proposed, entries, baseVersion, proposedVersion }: LogicDiffProps) {
  const flow = useReactFlow();
  const marks = useMemo(() => logicMarks(entries), [entries]);
  const [side, setSide] = useState<Side>('proposed');
  const [focus, setFocus] = useState<Focus>(null);
  const sheet = side === 'base' ? base : proposed;
  const graph = useMemo(() => buildGraph(sheet, marks[side], focus, side), [sheet, marks, side, focus]);
  const listed = useMemo(() => [...entries].sort((a, b) => (a.importance === b.importance ? 0 : a.importance === 'high' ? -1 : 1)), [entries]);
  const removedCount = entries.filter((e) => e.kind === 'removed').length;

  // After a jump (which may switch sheets), centre on the thing once the sheet is drawn.
  useEffect(() => {
    if (!focus || focus.side !== side) return;
    const p = focusPoint(sheet, focus);
    if (!p) return;
    const t = requestAnimationFrame(() => void flow.setCenter(p.x, p.y, { zoom: 1.1, duration: 250 }));
    return () => cancelAnimationFrame(t);
  }, [focus, side, sheet, flow]);

  const showSide = useCallback(
    (s: Side) => {
      setSide(s);
      setFocus(null);
      requestAnimationFrame(() => void flow.fitView({ padding: 0.1, maxZoom: 1 }));
    },
    [flow],
  );

  const jump = (e: DiffEntry) => {
    const kind = e.target === 'block' ? 'block' : e.target === 'connection' ? 'connection' : null;
    if (!kind) return;
    const target: Side = e.kind === 'removed' ? 'base' : 'proposed';
    setSide(target);
    setFocus({ side: target, kind, id: e.id });
  };

  const focused = focus ? entries.find((e) => e.id === focus.id && (e.target === 'block') === (focus.kind === 'block')) : undefined;

  return (
    <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_20rem]" data-testid="logic-diff">
      <div className="flex min-w-0 flex-col overflow-hidden rounded-md border border-slate-300 bg-white">
        <div className="flex flex-wrap items-center gap-2 border-b border-slate-200 px-3 py-1.5 text-sm">
          <div role="group" aria-label="Which sheet" className="inline-flex overflow-hidden rounded-md border border-slate-300">
            {(['proposed', 'base'] as const).map((s) => (
              <button
                key={s}
                type="button"
                aria-pressed={side === s}
                onClick={() => showSide(s)}
                className={cn('px-3 py-1 text-sm', side === s ? 'bg-accent-700 font-medium text-white' : 'bg-white text-slate-700 hover:bg-slate-100')}
              >
                {s === 'proposed' ? `Proposed v${proposedVersion}` : `Base v${baseVersion}`}
              </button>
            ))}
          </div>
          <span className="text-slate-500">
            {sheet.blocks.length} blocks · {sheet.connections.length} wires
          </span>
          <Legend side={side} />
        </div>
        {side === 'proposed' && removedCount > 0 ? (
          <p className="border-b border-slate-200 bg-slate-50 px-3 py-1 text-xs text-slate-600">
            {removedCount} thing{removedCount === 1 ? '' : 's'} removed by the proposal {removedCount === 1 ? 'is' : 'are'} shown on the base sheet.
          </p>
        ) : null}
        <p className="sr-only" aria-live="polite" data-testid="logic-diff-focus">
          {focus && focused ? `Showing ${focused.target === 'block' ? 'block' : 'wire'} ${focus.id} (${focused.kind}) on the ${focus.side} sheet` : ''}
        </p>
        <div className="cw-logic h-[560px]" data-testid="diff-canvas" data-side={side} data-focus={focus ? `${focus.side}:${focus.id}` : ''}>
          <ReactFlow<DiffNode, DiffEdge>
            nodes={graph.nodes}
            edges={graph.edges}
            nodeTypes={nodeTypes}
            edgeTypes={edgeTypes}
            nodesDraggable={false}
            nodesConnectable={false}
            elementsSelectable
            deleteKeyCode={null}
            onlyRenderVisibleElements
            fitView
            fitViewOptions={{ padding: 0.1, maxZoom: 1 }}
            minZoom={0.05}
            maxZoom={2}
          >
            <Background variant={BackgroundVariant.Dots} gap={20} size={1} color="#cbd5e1" />
            <Controls showInteractive={false} />
          </ReactFlow>
        </div>
      </div>
      <aside aria-label="Logic changes" className="rounded-md border border-slate-200 bg-white">
        <h3 className="border-b border-slate-200 px-3 py-2 text-sm font-semibold text-slate-900">
          Logic changes <span className="font-normal text-slate-500">({entries.length})</span>
        </h3>
        {listed.length === 0 ? (
          <p className="p-3 text-sm text-slate-500">The logic sheet is unchanged.</p>
        ) : (
          <ul className="max-h-[560px] divide-y divide-slate-100 overflow-y-auto" data-testid="logic-change-list">
            {listed.map((e) => {
              const jumpable = e.target === 'block' || e.target === 'connection';
              const active = focus?.id === e.id && (e.target === 'block') === (focus.kind === 'block');
              return (
                <li key={`${e.target}:${e.id}`}>
                  <button
                    type="button"
                    disabled={!jumpable}
                    onClick={() => jump(e)}
                    data-testid={`logic-change-${e.id}`}
                    aria-current={active ? 'true' : undefined}
                    className={cn('flex w-full flex-col items-start gap-1 px-3 py-2 text-left hover:bg-accent-50 disabled:cursor-default disabled:hover:bg-transparent', active && 'bg-accent-50')}
                  >
                    <span className="flex w-full items-center gap-2">
                      <KindBadge entry={e} />
                      <span className="truncate font-mono text-xs text-slate-800">{e.id}</span>
                      {jumpable ? <Crosshair aria-hidden className="ml-auto h-3.5 w-3.5 shrink-0 text-slate-400" /> : null}
                    </span>
                    <span className="text-xs text-slate-600">{e.detail}</span>
                    <span className="sr-only">{jumpable ? `Show on the ${e.kind === 'removed' ? 'base' : 'proposed'} sheet` : ''}</span>
                  </button>
                </li>
              );
            })}
          </ul>
        )}
      </aside>
    </div>
  );
}

function Legend({ side }: { side: Side }) {
  const shown: Mark[] = side === 'proposed' ? ['new', 'changed', 'moved'] : ['removed', 'changed'];
  const outline: Record<Mark, string> = { new: 'solid', changed: 'dashed', removed: 'dotted', moved: 'thin dotted' };
  return (
    <ul className="ml-auto flex flex-wrap items-center gap-2 text-xs text-slate-600" aria-label="Marks on the canvas">
      {shown.map((m) => (
        <li key={m} className="inline-flex items-center gap-1">
          <span className="cw-diff-badge" style={{ position: 'static' }} data-mark={m}>
            {MARK_WORDS[m]}
          </span>
          {outline[m]} outline
        </li>
      ))}
    </ul>
  );
}
