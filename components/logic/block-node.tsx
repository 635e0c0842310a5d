'use client';
/**
 * One block on the logic canvas. It maps a block type to a drawing and nothing more: the
 * ports come from the engine's catalogue, the live values from the snapshot.
 * Memoised, and each live value is its own tiny subscriber, so a running 500-block sheet
 * re-renders only the ports whose value changed.
 */
import { memo } from 'react';
import { Handle, Position, type Node, type NodeProps } from '@xyflow/react';
import { AlertTriangle, RefreshCcw } from 'lucide-react';
import { blockCatalogue, isBlockType, type PortSpec, type Problem } from '@/simulator';

type PortType = PortSpec['type'];
import { cn } from '@/components/ui/cn';
import { formatLiveValue, portsOf, type Block } from './sheet-graph';
import { useLogicActions } from './logic-context';
import { useLiveOutput } from './use-logic';
import { useTextDraft } from '@/components/workspace/use-text-draft';

export type BlockNodeData = {
  block: Block;
  problems: readonly Problem[];
  inLoop: boolean;
};

export type BlockFlowNode = Node<BlockNodeData, 'block'>;

/** Handle ids: inputs and outputs may share a port name, so each side has a prefix. */
export const inHandle = (port: string) => `in:${port}`;
export const outHandle = (port: string) => `out:${port}`;
export const portOfHandle = (handle: string | null | undefined) => (handle ?? '').replace(/^(in|out):/, '');

/** Port type by shape as well as by word, never by colour alone. */
const HANDLE_SHAPE: Record<PortType, string> = {
  BOOL: 'cw-handle-bool',
  NUM: 'cw-handle-num',
  TIME: 'cw-handle-time',
};

function LiveOutput({ blockId, port }: { blockId: string; port: PortSpec }) {
  const value = useLiveOutput(blockId, port.name);
  if (value === undefined) return null;
  const on = value === true;
  return (
    <span
      data-testid={`live-${blockId}-${port.name}`}
      data-value={String(value)}
      className={cn(
        'ml-1 rounded px-1 font-mono text-[10px] leading-4',
        typeof value === 'boolean' ? (on ? 'bg-teal-800 font-bold text-white' : 'bg-slate-200 text-slate-700') : 'bg-slate-800 text-white',
      )}
    >
      {formatLiveValue(value)}
    </span>
  );
}

function AddressField({ block, address }: { block: Block; address: string }) {
  const { setParam, canEdit } = useLogicActions();
  const [text, setText] = useTextDraft(address);
  const commit = () => {
    const next = text.trim().toUpperCase();
    if (next !== address) setParam(block.id, 'address', next);
  };
  return (
    <input
      aria-label={`Address of ${block.id}`}
      className="nodrag nopan w-full rounded border border-slate-300 bg-white px-1 py-0.5 font-mono text-xs text-slate-900 focus:border-accent-600"
      value={text}
      disabled={!canEdit}
      spellCheck={false}
      onChange={(e) => setText(e.target.value)}
      onBlur={commit}
      onKeyDown={(e) => {
        if (e.key === 'Enter') (e.target as HTMLInputElement).blur();
        if (e.key === 'Escape') setText(address);
      }}
    />
  );
}

/** A short, readable summary of a block's non-address parameters. */
function paramSummary(block: Block): string {
  const p = (block.params ?? {}) as Record<string, unknown>;
  switch (block.type) {
    case 'TON':
    case 'TOF':
    case 'TP':
      return `PT ${p.PT ?? '?'} ms`;
    case 'CTU':
    case 'CTD':
    case 'CTUD':
      return `PV ${p.PV ?? '?'}`;
    case 'CONST':
      return `${p.value ?? 0}`;
    case 'CONST_BOOL':
      return p.value ? 'TRUE' : 'FALSE';
    case 'SPAN_MAP':
      return `${p.inMin === undefined ? 'input span' : `${p.inMin}..${p.inMax}`} → ${p.outMin}..${p.outMax}${p.clamp ? ' clamped' : ''}`;
    case 'WORD_IN':
      return p.signed ? 'signed' : '';
    case 'PREV_BOOL':
    case 'PREV_NUM':
      return p.initial !== undefined ? `initial ${String(p.initial)}` : '';
    default:
      return '';
  }
}

function PortRow({ input, output, blockId }: { input?: PortSpec; output?: PortSpec; blockId: string }) {
  return (
    <div className="relative flex h-5 items-center justify-between gap-2 text-[11px]">
      <span className="flex items-center gap-1 pl-1.5">
        {input ? (
          <>
            <Handle
              type="target"
              position={Position.Left}
              id={inHandle(input.name)}
              className={HANDLE_SHAPE[input.type]}
              title={`${input.name}: ${input.type} — ${input.doc}`}
            />
            <span className="font-mono text-slate-800">{input.name}</span>
            <span className="text-[9px] uppercase tracking-wide text-slate-600">{input.type}</span>
          </>
        ) : null}
      </span>
      <span className="flex items-center gap-1 pr-1.5">
        {output ? (
          <>
            <span className="text-[9px] uppercase tracking-wide text-slate-600">{output.type}</span>
            <span className="font-mono text-slate-800">{output.name}</span>
            <LiveOutput blockId={blockId} port={output} />
            <Handle
              type="source"
              position={Position.Right}
              id={outHandle(output.name)}
              className={HANDLE_SHAPE[output.type]}
              title={`${output.name}: ${output.type} — ${output.doc}`}
            />
          </>
        ) : null}
      </span>
    </div>
  );
}

function BlockNodeView({ data, selected }: NodeProps<BlockFlowNode>) {
  const { block, problems, inLoop } = data;
  const { inputs, outputs } = portsOf(block);
  const rows = Math.max(inputs.length, outputs.length);
  const address = (block.params as Record<string, unknown> | undefined)?.address;
  const summary = paramSummary(block);
  const hasProblem = problems.length > 0;
  return (
    <div
      data-testid={`block-${block.id}`}
      data-problem={hasProblem ? 'true' : undefined}
      data-loop={inLoop ? 'true' : undefined}
      title={isBlockType(block.type) ? blockCatalogue[block.type].summary : undefined}
      className={cn(
        'w-[176px] rounded-md border bg-white text-slate-900 shadow-sm',
        selected ? 'border-accent-600 ring-2 ring-accent-300' : hasProblem ? 'border-red-500' : 'border-slate-300',
        inLoop && 'cw-loop',
      )}
    >
      <div className={cn('flex items-center justify-between gap-1 rounded-t-md px-2 py-1', hasProblem ? 'bg-red-50' : 'bg-slate-100')}>
        <span className="font-mono text-[11px] font-semibold tracking-wide">{block.type}</span>
        <span className="truncate text-[11px] text-slate-700" title={block.id}>
          {block.label ?? block.id}
        </span>
      </div>
      {typeof address === 'string' ? (
        <div className="px-2 pt-1">
          <AddressField block={block} address={address} />
        </div>
      ) : null}
      {summary ? <div className="px-2 pt-1 font-mono text-[11px] text-slate-600">{summary}</div> : null}
      <div className="py-1">
        {Array.from({ length: rows }, (_, i) => (
          <PortRow key={i} input={inputs[i]} output={outputs[i]} blockId={block.id} />
        ))}
      </div>
      {hasProblem ? (
        <ul className="space-y-0.5 border-t border-red-200 bg-red-50 px-2 py-1 text-[11px] leading-snug text-red-800" aria-label={`Problems of ${block.id}`}>
          {problems.slice(0, 3).map((p, i) => (
            <li key={i} className="flex gap-1">
              {p.code === 'algebraic_loop' ? <RefreshCcw aria-hidden className="mt-0.5 h-3 w-3 shrink-0" /> : <AlertTriangle aria-hidden className="mt-0.5 h-3 w-3 shrink-0" />}
              <span>{p.message}</span>
            </li>
          ))}
          {problems.length > 3 ? <li>… and {problems.length - 3} more</li> : null}
        </ul>
      ) : null}
    </div>
  );
}

export const BlockNode = memo(BlockNodeView);
