'use client';
/** The side panel for the selected block: type switch, label, every parameter, its problems. */
import { useState } from 'react';
import { Trash2 } from 'lucide-react';
import { blockCatalogue, isBlockType, type BlockType, type Problem } from '@/simulator';
import { Button } from '@/components/ui/button';
import { paramFields, swappableTypes, type Block, type ParamField } from './sheet-graph';
import { blurOnEnter, useTextDraft } from '@/components/workspace/use-text-draft';

type Props = {
  block: Block;
  problems: readonly Problem[];
  canEdit: boolean;
  onParam(name: string, value: unknown): void;
  onType(type: BlockType): void;
  onLabel(label: string): void;
  onDelete(): void;
};

function TextCommit({ label, value, onCommit, disabled, mono }: { label: string; value: string; onCommit(v: string): void; disabled: boolean; mono?: boolean }) {
  const [text, setText] = useTextDraft(value);
  return (
    <label className="block text-xs text-slate-600">
      {label}
      <input
        className={`mt-0.5 w-full rounded border border-slate-300 px-2 py-1 text-sm text-slate-900 ${mono ? 'font-mono' : ''}`}
        value={text}
        disabled={disabled}
        spellCheck={false}
        onChange={(e) => setText(e.target.value)}
        onBlur={() => text !== value && onCommit(text)}
        onKeyDown={blurOnEnter}
      />
    </label>
  );
}

function NumberCommit({ field, value, onCommit, disabled }: { field: Extract<ParamField, { kind: 'number' }>; value: unknown; onCommit(v: number | undefined): void; disabled: boolean }) {
  const shown = typeof value === 'number' ? String(value) : '';
  const [text, setText] = useTextDraft(shown);
  const [error, setError] = useState<string | null>(null);
  const commit = () => {
    if (text === shown) return;
    if (field.optional && text.trim() === '') {
      setError(null);
      return onCommit(undefined);
    }
    const n = Number(text);
    if (text.trim() === '' || !Number.isFinite(n)) return setError('enter a number');
    if (field.integer && !Number.isInteger(n)) return setError('enter a whole number');
    if (field.min !== undefined && n < field.min) return setError(`at least ${field.min}`);
    if (field.max !== undefined && n > field.max) return setError(`at most ${field.max}`);
    setError(null);
    onCommit(n);
  };
  return (
    <label className="block text-xs text-slate-600">
      {field.label}
      {field.unit ? ` (${field.unit})` : ''}
      {field.optional ? <span className="block text-[11px] text-slate-500">empty: {field.optional}</span> : null}
      <input
        inputMode="decimal"
        aria-invalid={error ? true : undefined}
        className="mt-0.5 w-full rounded border border-slate-300 px-2 py-1 font-mono text-sm text-slate-900"
        value={text}
        disabled={disabled}
        onChange={(e) => setText(e.target.value)}
        onBlur={commit}
        onKeyDown={blurOnEnter}
      />
      {error ? <span className="text-red-700">{error}</span> : null}
    </label>
  );
}

export function BlockInspector({ block, problems, canEdit, onParam, onType, onLabel, onDelete }: Props) {
  if (!isBlockType(block.type)) return <p className="text-sm text-red-700">Unknown block type {block.type}</p>;
  const spec = blockCatalogue[block.type];
  const params = (block.params ?? {}) as Record<string, unknown>;
  const swaps = swappableTypes(block.type);
  return (
    <div className="space-y-3" data-testid="block-inspector">
      <div>
        <p className="font-mono text-sm font-semibold">{block.id}</p>
        <p className="text-xs text-slate-600">{spec.summary}</p>
      </div>
      {swaps.length > 1 ? (
        <label className="block text-xs text-slate-600">
          {spec.group === 'compare' ? 'Comparison' : 'Kind'}
          <select
            className="mt-0.5 w-full rounded border border-slate-300 px-2 py-1 font-mono text-sm text-slate-900"
            value={block.type}
            disabled={!canEdit}
            onChange={(e) => onType(e.target.value as BlockType)}
          >
            {swaps.map((t) => (
              <option key={t} value={t}>
                {t}
              </option>
            ))}
          </select>
        </label>
      ) : null}
      <TextCommit label="Label" value={block.label ?? ''} onCommit={onLabel} disabled={!canEdit} />
      {paramFields(block.type).map((f) => {
        if (f.kind === 'address') {
          return (
            <TextCommit
              key={f.name}
              label="Address"
              mono
              value={String(params[f.name] ?? '')}
              onCommit={(v) => onParam(f.name, v.trim().toUpperCase())}
              disabled={!canEdit}
            />
          );
        }
        if (f.kind === 'boolean') {
          return (
            <label key={f.name} className="flex items-center gap-2 text-xs text-slate-600">
              <input type="checkbox" checked={params[f.name] === true} disabled={!canEdit} onChange={(e) => onParam(f.name, e.target.checked)} />
              {f.name === 'value' ? 'Value TRUE' : f.label}
            </label>
          );
        }
        return <NumberCommit key={f.name} field={f} value={params[f.name]} onCommit={(v) => onParam(f.name, v)} disabled={!canEdit} />;
      })}
      {problems.length > 0 ? (
        <ul className="space-y-1 rounded border border-red-200 bg-red-50 p-2 text-xs text-red-800">
          {problems.map((p, i) => (
            <li key={i}>{p.message}</li>
          ))}
        </ul>
      ) : null}
      {canEdit ? (
        <Button variant="danger" onClick={onDelete} className="w-full">
          <Trash2 aria-hidden className="h-4 w-4" /> Delete block
        </Button>
      ) : null}
    </div>
  );
}
