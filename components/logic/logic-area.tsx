'use client';
/**
 * The Logic area: the PLC's logic sheet on an @xyflow/react canvas. A palette of the
 * engine's block types, typed ports, addresses and parameters edited on the blocks and in
 * the side panel, live values on wires while the cell runs, and the engine's validation
 * problems drawn on the block or wire they concern (algebraic loops outlined).
 *
 * Every change goes through the workspace store's `editDocument`, so undo and redo cover it.
 * Moving a block does not change what the sheet computes, so it keeps the run going.
 * The toolbar's sheet files (./sheet-files.tsx) export the sheet as Structured Text or
 * IEC 61131-10 XML and import such XML in its place.
 */
import '@xyflow/react/dist/base.css';
import './logic.css';
import { useCallback, useLayoutEffect, useMemo, useRef, useState, type DragEvent } from 'react';
import {
  Background,
  BackgroundVariant,
  Controls,
  ReactFlow,
  ReactFlowProvider,
  applyEdgeChanges,
  applyNodeChanges,
  useReactFlow,
  type Connection as FlowConnection,
  type EdgeChange,
  type NodeChange,
  type OnSelectionChangeParams,
} from '@xyflow/react';
import { AlertTriangle, CheckCircle2, X } from 'lucide-react';
import { blockCatalogue, isBlockType, type BlockType, type Problem } from '@/simulator';
import { cn } from '@/components/ui/cn';
import { BlockNode, inHandle, outHandle, portOfHandle, type BlockFlowNode, type BlockNodeData } from './block-node';
import { WireEdge, type WireFlowEdge } from './wire-edge';
import { BlockInspector } from './block-inspector';
import { LogicActionsContext, type LogicActions } from './logic-context';
import { blurOnEnter, useTextDraft } from '@/components/workspace/use-text-draft';
import { useLogic } from './use-logic';
import { SheetFilesControls, SheetFilesPanel, useSheetFiles } from './sheet-files';
import {
  addBlock,
  checkConnection,
  connect,
  indexSheetProblems,
  moveBlocks,
  paletteGroups,
  portsOf,
  removeElements,
  setBlockLabel,
  setBlockParam,
  setBlockType,
  type Sheet,
  type SheetProblemIndex,
} from './sheet-graph';

const nodeTypes = { block: BlockNode };
const edgeTypes = { wire: WireEdge };
const PALETTE = paletteGroups();
const DRAG_MIME = 'application/x-cellwright-block';
const NO_PROBLEMS: readonly Problem[] = [];

type NodeCache = Map<string, { key: string; data: BlockNodeData }>;

/**
 * Canvas nodes of a sheet. Node data keeps its identity while its block and problems are
 * unchanged, so memoised nodes skip re-rendering after an edit elsewhere on a large sheet.
 */
function deriveNodes(sheet: Sheet, index: SheetProblemIndex, previous: NodeCache): { nodes: BlockFlowNode[]; cache: NodeCache } {
  const cache: NodeCache = new Map();
  const nodes = sheet.blocks.map((block): BlockFlowNode => {
    const blockProblems = index.byBlock.get(block.id) ?? NO_PROBLEMS;
    const inLoop = index.loopBlocks.has(block.id);
    const key = `${JSON.stringify(block)}|${blockProblems.map((p) => p.message).join('|')}|${inLoop}`;
    const old = previous.get(block.id);
    const data = old && old.key === key ? old.data : { block, problems: blockProblems, inLoop };
    cache.set(block.id, { key, data });
    return { id: block.id, type: 'block', position: block.position, data };
  });
  return { nodes, cache };
}

/** Canvas edges of a sheet, each knowing its source output for live values. */
function deriveEdges(sheet: Sheet, index: SheetProblemIndex): WireFlowEdge[] {
  const byId = new Map(sheet.blocks.map((b) => [b.id, b]));
  return sheet.connections.map((c) => {
    const from = byId.get(c.from.block);
    const port = from ? portsOf(from).outputs.find((p) => p.name === c.from.port) : undefined;
    const problem = index.byConnection.get(c.id)?.[0]?.message ?? null;
    return {
      id: c.id,
      type: 'wire',
      source: c.from.block,
      sourceHandle: outHandle(c.from.port),
      target: c.to.block,
      targetHandle: inHandle(c.to.port),
      data: { sourceBlock: c.from.block, sourcePort: c.from.port, type: port?.type ?? 'BOOL', problem, inLoop: index.loopConnections.has(c.id) },
    };
  });
}

export default function LogicArea() {
  return (
    <ReactFlowProvider>
      <LogicCanvas />
    </ReactFlowProvider>
  );
}

function LogicCanvas() {
  const { sheet, editSheet, replaceSheet, cellName, canEdit, running, selectedId, selectBlock, problems } = useLogic();
  const flow = useReactFlow();
  const onReplace = useCallback(
    (next: Sheet, label: string) => {
      replaceSheet(next, label);
      // The imported blocks may sit elsewhere on the sheet: show them all once they are drawn.
      window.requestAnimationFrame(() => void flow.fitView({ padding: 0.1, minZoom: 0.05, maxZoom: 1 }));
    },
    [replaceSheet, flow],
  );
  // Exports in any workspace; import only where this workspace may edit the sheet.
  const files = useSheetFiles({ sheet, cellName, canImport: canEdit, onReplace });
  const sheetRef = useRef(sheet);
  useLayoutEffect(() => {
    sheetRef.current = sheet;
  });
  const [notice, setNotice] = useState<string | null>(null);
  const [showProblems, setShowProblems] = useState(false);

  const index = useMemo(() => indexSheetProblems(sheet, problems), [sheet, problems]);

  const [nodes, setNodes] = useState<BlockFlowNode[]>(() => deriveNodes(sheet, index, new Map()).nodes);
  const [edges, setEdges] = useState<WireFlowEdge[]>(() => deriveEdges(sheet, index));
  const [seen, setSeen] = useState(() => ({ sheet, index, cache: deriveNodes(sheet, index, new Map()).cache }));
  // A document change replaces the view's nodes and edges, keeping what is selected.
  if (seen.sheet !== sheet || seen.index !== index) {
    const derived = deriveNodes(sheet, index, seen.cache);
    const selNodes = new Set(nodes.filter((n) => n.selected).map((n) => n.id));
    const selEdges = new Set(edges.filter((e) => e.selected).map((e) => e.id));
    setSeen({ sheet, index, cache: derived.cache });
    setNodes(derived.nodes.map((n) => (selNodes.has(n.id) ? { ...n, selected: true } : n)));
    setEdges(deriveEdges(sheet, index).map((e) => (selEdges.has(e.id) ? { ...e, selected: true } : e)));
  }

  const onNodesChange = useCallback((changes: NodeChange<BlockFlowNode>[]) => {
    // Removal goes through onDelete (one undo step); everything else is local view state.
    const local = changes.filter((c) => c.type !== 'remove');
    if (local.length > 0) setNodes((ns) => applyNodeChanges(local, ns));
  }, []);
  const onEdgesChange = useCallback((changes: EdgeChange<WireFlowEdge>[]) => {
    const local = changes.filter((c) => c.type !== 'remove');
    if (local.length > 0) setEdges((es) => applyEdgeChanges(local, es));
  }, []);

  const onNodeDragStop = useCallback(
    (_e: unknown, _node: BlockFlowNode, dragged: BlockFlowNode[]) => {
      const moves = new Map<string, { x: number; y: number }>();
      for (const n of dragged) {
        const b = sheetRef.current.blocks.find((x) => x.id === n.id);
        if (b && (Math.round(b.position.x) !== Math.round(n.position.x) || Math.round(b.position.y) !== Math.round(n.position.y))) moves.set(n.id, n.position);
      }
      if (moves.size > 0) editSheet(moveBlocks(sheetRef.current, moves), moves.size === 1 ? 'Move block' : `Move ${moves.size} blocks`, true);
    },
    [editSheet],
  );

  const onConnect = useCallback(
    (c: FlowConnection) => {
      const attempt = { source: c.source, sourcePort: portOfHandle(c.sourceHandle), target: c.target, targetPort: portOfHandle(c.targetHandle) };
      const check = checkConnection(sheetRef.current, attempt);
      if (!check.ok) {
        setNotice(check.message);
        return;
      }
      setNotice(null);
      editSheet(connect(sheetRef.current, attempt).sheet, `Wire ${attempt.source}.${attempt.sourcePort} → ${attempt.target}.${attempt.targetPort}`);
    },
    [editSheet],
  );

  const onDelete = useCallback(
    ({ nodes: ns, edges: es }: { nodes: BlockFlowNode[]; edges: WireFlowEdge[] }) => {
      if (ns.length === 0 && es.length === 0) return;
      editSheet(
        removeElements(
          sheetRef.current,
          ns.map((n) => n.id),
          es.map((e) => e.id),
        ),
        ns.length > 0 ? `Delete ${ns.length === 1 ? `block ${ns[0].id}` : `${ns.length} blocks`}` : 'Delete wire',
      );
    },
    [editSheet],
  );

  const onSelectionChange = useCallback(
    ({ nodes: ns }: OnSelectionChangeParams<BlockFlowNode, WireFlowEdge>) => {
      selectBlock(ns.length === 1 ? ns[0].id : null);
    },
    [selectBlock],
  );

  const addAt = useCallback(
    (type: BlockType, position: { x: number; y: number }) => {
      const r = addBlock(sheetRef.current, type, position);
      editSheet(r.sheet, `Add ${type}`);
      selectBlock(r.id);
    },
    [editSheet, selectBlock],
  );

  const addAtCentre = (type: BlockType) => {
    const el = document.querySelector('[data-testid="logic-canvas"]');
    const rect = el?.getBoundingClientRect();
    const centre = rect ? flow.screenToFlowPosition({ x: rect.left + rect.width / 2, y: rect.top + rect.height / 2 }) : { x: 0, y: 0 };
    // Nudge so repeated adds do not stack exactly on top of each other.
    const n = sheetRef.current.blocks.length % 8;
    addAt(type, { x: centre.x - 88 + n * 12, y: centre.y - 40 + n * 12 });
  };

  const onDrop = (e: DragEvent) => {
    const type = e.dataTransfer.getData(DRAG_MIME);
    if (!canEdit || !isBlockType(type)) return;
    e.preventDefault();
    addAt(type, flow.screenToFlowPosition({ x: e.clientX, y: e.clientY }));
  };

  const actions = useMemo<LogicActions>(
    () => ({
      canEdit,
      setParam: (blockId, name, value) => editSheet(setBlockParam(sheetRef.current, blockId, name, value), `Set ${name} of ${blockId}`),
    }),
    [canEdit, editSheet],
  );

  const selectedBlock = selectedId ? sheet.blocks.find((b) => b.id === selectedId) : undefined;

  const focusBlock = (id: string) => {
    const node = flow.getNode(id);
    if (!node) return;
    setNodes((ns) => ns.map((n) => ({ ...n, selected: n.id === id })));
    selectBlock(id);
    void flow.setCenter(node.position.x + 88, node.position.y + 40, { zoom: 1.1, duration: 300 });
  };

  const scanPeriod = sheet.scanPeriodMs;

  return (
    <LogicActionsContext.Provider value={actions}>
      {/* Below the large breakpoint the palette sits above the sheet and the details below it, so the canvas keeps its width. */}
      <div className="flex h-full min-h-[560px] w-full flex-col overflow-hidden rounded-md border border-slate-300 bg-white lg:flex-row" data-testid="logic-area">
        <nav aria-label="Block palette" className="max-h-44 shrink-0 overflow-y-auto border-b border-slate-200 bg-slate-50 p-2 lg:max-h-none lg:w-44 lg:border-b-0 lg:border-r">
          <p className="mb-2 text-xs font-semibold uppercase tracking-wide text-slate-500">Blocks</p>
          {PALETTE.map(({ group, types }) => (
            <div key={group} className="mb-2">
              <p className="mb-1 text-[11px] font-medium capitalize text-slate-500">{group}</p>
              <div className="flex flex-wrap gap-1">
                {types.map((t) => (
                  <button
                    key={t}
                    type="button"
                    disabled={!canEdit}
                    draggable={canEdit}
                    onDragStart={(e) => {
                      e.dataTransfer.setData(DRAG_MIME, t);
                      e.dataTransfer.effectAllowed = 'copy';
                    }}
                    onClick={() => addAtCentre(t)}
                    title={`${blockCatalogue[t].summary} — click to add, or drag onto the sheet`}
                    aria-label={`Add ${t}`}
                    className="rounded border border-slate-300 bg-white px-1.5 py-0.5 font-mono text-[11px] text-slate-800 hover:border-accent-500 hover:bg-accent-50 disabled:opacity-50"
                  >
                    {t}
                  </button>
                ))}
              </div>
            </div>
          ))}
        </nav>

        <div className="relative flex min-h-[420px] min-w-0 flex-1 flex-col">
          <div className="flex flex-wrap items-center gap-3 border-b border-slate-200 px-3 py-1.5 text-sm">
            <ScanPeriod value={scanPeriod} disabled={!canEdit} onCommit={(v) => editSheet({ ...sheetRef.current, scanPeriodMs: v }, 'Set scan period')} />
            <span className="text-slate-500">
              {sheet.blocks.length} blocks · {sheet.connections.length} wires
            </span>
            <SheetFilesControls files={files} />
            <span className={cn('inline-flex items-center gap-1', running ? 'text-teal-700' : 'text-slate-500')} data-testid="logic-run-state">
              <span aria-hidden className={cn('inline-block h-2 w-2 rounded-full', running ? 'bg-teal-500' : 'border border-slate-400')} />
              {running ? 'Live values' : 'Paused — values as of the last scan'}
            </span>
            <button
              type="button"
              onClick={() => setShowProblems((v) => !v)}
              data-testid="logic-problem-count"
              className={cn(
                'ml-auto inline-flex items-center gap-1 rounded px-2 py-0.5',
                problems.length > 0 ? 'bg-red-50 text-red-800 hover:bg-red-100' : 'text-teal-800',
              )}
              aria-expanded={showProblems}
            >
              {problems.length > 0 ? <AlertTriangle aria-hidden className="h-4 w-4" /> : <CheckCircle2 aria-hidden className="h-4 w-4" />}
              {problems.length === 0 ? 'Sheet compiles' : `${problems.length} problem${problems.length === 1 ? '' : 's'} — not running this sheet`}
            </button>
          </div>
          <SheetFilesPanel files={files} />
          {index.sheet.length > 0 ? (
            <ul className="border-b border-red-200 bg-red-50 px-3 py-1 text-xs text-red-800">
              {index.sheet.map((p, i) => (
                <li key={i}>{p.message}</li>
              ))}
            </ul>
          ) : null}
          {showProblems && problems.length > 0 ? (
            <ul className="max-h-40 overflow-y-auto border-b border-slate-200 bg-white px-3 py-1 text-xs" data-testid="logic-problem-list">
              {problems.map((p, i) => {
                const target = p.path[0] === 'blocks' && typeof p.path[1] === 'number' ? sheet.blocks[p.path[1]]?.id : p.related?.find((id) => sheet.blocks.some((b) => b.id === id));
                const conn = p.path[0] === 'connections' && typeof p.path[1] === 'number' ? sheet.connections[p.path[1]] : undefined;
                const goTo = target ?? conn?.to.block;
                return (
                  <li key={i} className="py-0.5">
                    {goTo ? (
                      <button type="button" className="text-left text-red-800 underline-offset-2 hover:underline" onClick={() => focusBlock(goTo)}>
                        <span className="font-mono">{goTo}</span>: {p.message}
                      </button>
                    ) : (
                      <span className="text-red-800">{p.message}</span>
                    )}
                  </li>
                );
              })}
            </ul>
          ) : null}
          {notice ? (
            <div role="alert" className="absolute left-1/2 top-12 z-10 flex -translate-x-1/2 items-start gap-2 rounded-md border border-amber-300 bg-amber-50 px-3 py-2 text-sm text-amber-950 shadow" data-testid="logic-notice">
              <AlertTriangle aria-hidden className="mt-0.5 h-4 w-4 shrink-0 text-amber-700" />
              <span>Wire refused. {notice}</span>
              <button type="button" aria-label="Dismiss" onClick={() => setNotice(null)} className="text-amber-800">
                <X className="h-4 w-4" />
              </button>
            </div>
          ) : null}
          <div className="cw-logic h-[420px] shrink-0 lg:h-auto lg:min-h-0 lg:flex-1 lg:shrink" data-testid="logic-canvas" onDragOver={(e) => e.preventDefault()} onDrop={onDrop}>
            <ReactFlow<BlockFlowNode, WireFlowEdge>
              nodes={nodes}
              edges={edges}
              nodeTypes={nodeTypes}
              edgeTypes={edgeTypes}
              onNodesChange={onNodesChange}
              onEdgesChange={onEdgesChange}
              onNodeDragStop={onNodeDragStop}
              onConnect={onConnect}
              onDelete={onDelete}
              onSelectionChange={onSelectionChange}
              nodesDraggable={canEdit}
              nodesConnectable={canEdit}
              deleteKeyCode={canEdit ? ['Delete', 'Backspace'] : null}
              onlyRenderVisibleElements
              fitView
              fitViewOptions={{ padding: 0.1, minZoom: 0.6, maxZoom: 1 }}
              minZoom={0.05}
              maxZoom={2}
              snapToGrid
              snapGrid={[10, 10]}
            >
              <Background variant={BackgroundVariant.Dots} gap={20} size={1} color="#cbd5e1" />
              <Controls showInteractive={false} />
            </ReactFlow>
          </div>
        </div>

        <aside aria-label="Block details" className="shrink-0 overflow-y-auto border-t border-slate-200 bg-slate-50 p-3 lg:w-60 lg:border-l lg:border-t-0">
          {selectedBlock ? (
            <BlockInspector
              key={selectedBlock.id}
              block={selectedBlock}
              problems={index.byBlock.get(selectedBlock.id) ?? NO_PROBLEMS}
              canEdit={canEdit}
              onParam={(name, value) => actions.setParam(selectedBlock.id, name, value)}
              onType={(t) => editSheet(setBlockType(sheetRef.current, selectedBlock.id, t), `Change ${selectedBlock.id} to ${t}`)}
              onLabel={(label) => editSheet(setBlockLabel(sheetRef.current, selectedBlock.id, label), `Label ${selectedBlock.id}`)}
              onDelete={() => {
                editSheet(removeElements(sheetRef.current, [selectedBlock.id]), `Delete block ${selectedBlock.id}`);
                selectBlock(null);
              }}
            />
          ) : (
            <div className="space-y-2 text-xs text-slate-600">
              <p className="font-semibold text-slate-700">No block selected</p>
              <p>Select a block to edit its address and parameters. Drag from an output port (right) to an input port (left) to wire them; BOOL ports are square, NUM round, TIME diamond.</p>
              <p>While the cell runs, a TRUE wire is drawn thick and bright and number wires show their value.</p>
            </div>
          )}
        </aside>
      </div>
    </LogicActionsContext.Provider>
  );
}

function ScanPeriod({ value, disabled, onCommit }: { value: number; disabled: boolean; onCommit(v: number): void }) {
  const [text, setText] = useTextDraft(String(value));
  const commit = () => {
    const n = Number(text);
    if (Number.isFinite(n) && n > 0 && n <= 10_000 && n !== value) onCommit(n);
    else setText(String(value));
  };
  return (
    <label className="inline-flex items-center gap-1 text-slate-600">
      Scan
      <input
        className="w-16 rounded border border-slate-300 px-1 py-0.5 font-mono text-sm text-slate-900"
        value={text}
        disabled={disabled}
        inputMode="numeric"
        onChange={(e) => setText(e.target.value)}
        onBlur={commit}
        onKeyDown={blurOnEnter}
      />
      ms
    </label>
  );
}
export { LogicArea };
