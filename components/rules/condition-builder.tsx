'use client';
/**
 * The nested all / any / not builder. Each condition is a row (a leaf editor the caller
 * supplies: a signal with on/off for interlock rules, a signal compared with a value for trace
 * rules) with buttons to add an "and" or an "or" beside it, negate it or remove it; a group
 * is a box headed "all of these hold" or "any of these holds". No formula to type: the
 * tree is edited in place (condition-tree.ts) and always stays in the stored format.
 */
import type { ReactNode } from 'react';
import { Plus, Trash2 } from 'lucide-react';
import { cn } from '@/components/ui/cn';
import {
  addCondition,
  childrenOf,
  groupOp,
  isLeaf,
  leaves,
  pathKey,
  removeAt,
  setGroupOp,
  toggleNot,
  updateAt,
  wrapInGroup,
  type GroupOp,
  type Tree,
  type TreePath,
} from './condition-tree';

export type LeafRenderer<L> = (leaf: L, onChange: (next: L) => void, name: string) => ReactNode;

type Props<L extends object> = {
  value: Tree<L>;
  onChange: (next: Tree<L>) => void;
  /** What the condition is for ("While", "What", "Trigger"): names every control. */
  label: string;
  newLeaf: () => L;
  renderLeaf: LeafRenderer<L>;
  disabled?: boolean;
  /** Deepest nesting allowed (the engine's limit); deeper wraps are not offered. */
  maxDepth?: number;
};

const GROUP_WORDS: Record<GroupOp, string> = { all: 'All of these hold', any: 'Any of these holds' };
// cn only joins classes (no merging), so the pressed look is a class set of its own, not an override.
const smallShape = 'inline-flex items-center gap-1 rounded border px-1.5 py-0.5 text-xs disabled:opacity-50';
const small = `${smallShape} border-slate-300 bg-white text-slate-700 hover:bg-slate-100`;
const pressed = `${smallShape} border-accent-700 bg-accent-700 text-white hover:bg-accent-800`;

export function ConditionBuilder<L extends object>({ value, onChange, label, newLeaf, renderLeaf, disabled, maxDepth = 16 }: Props<L>) {
  const numbers = new Map(leaves(value).map((l, i) => [pathKey(l.path), i + 1]));
  const count = numbers.size;
  const edit = (f: (t: Tree<L>) => Tree<L> | null) => onChange(f(value) ?? newLeaf());
  const depthAt = (path: TreePath) => path.length + 1;

  const leafRow = (leaf: L, path: TreePath, negated: boolean, notPath: TreePath | null): ReactNode => {
    const n = numbers.get(pathKey(path)) ?? 0;
    const name = count > 1 ? `${label} ${n}` : label;
    const target = notPath ?? path;
    const canWrap = depthAt(path) < maxDepth;
    return (
      <div key={pathKey(path)} className="flex flex-wrap items-start gap-2" data-testid={`condition-${pathKey(path)}`}>
        <button
          type="button"
          aria-pressed={negated}
          aria-label={`${name}: not`}
          title="Negate: the condition must not hold"
          disabled={disabled}
          onClick={() => edit((t) => toggleNot(t, target))}
          className={cn(negated ? pressed : small, 'mt-1 font-semibold uppercase')}
        >
          not
        </button>
        <div className="min-w-0 flex-1">{renderLeaf(leaf, (next) => edit((t) => updateAt(t, path, () => next)), name)}</div>
        <div className="mt-1 flex gap-1">
          <button type="button" className={small} disabled={disabled || !canWrap} aria-label={`${name}: add an “and” condition`} onClick={() => edit((t) => wrapInGroup(t, target, 'all', newLeaf()))}>
            <Plus aria-hidden className="h-3 w-3" /> and
          </button>
          <button type="button" className={small} disabled={disabled || !canWrap} aria-label={`${name}: add an “or” condition`} onClick={() => edit((t) => wrapInGroup(t, target, 'any', newLeaf()))}>
            <Plus aria-hidden className="h-3 w-3" /> or
          </button>
          {count > 1 ? (
            <button type="button" className={small} disabled={disabled} aria-label={`${name}: remove`} onClick={() => edit((t) => removeAt(t, target))}>
              <Trash2 aria-hidden className="h-3 w-3" />
            </button>
          ) : null}
        </div>
      </div>
    );
  };

  const renderNode = (node: Tree<L>, path: TreePath, notPath: TreePath | null): ReactNode => {
    if (isLeaf(node)) return leafRow(node, path, notPath !== null, notPath);
    if ('not' in node) {
      const inner = (node as { not: Tree<L> }).not;
      // A negated condition reads as its row with "not" pressed; a negated group as a box.
      if (isLeaf(inner) || !('not' in inner)) return renderNode(inner, [...path, 'not'], path);
      return renderNode(inner, [...path, 'not'], null);
    }
    const op = groupOp(node)!;
    const kids = childrenOf(node);
    const target = notPath ?? path;
    const key = pathKey(path);
    const groupName = `${label} group ${key === 'root' ? '' : key}`.trim();
    return (
      <fieldset key={key} className={cn('rounded-md border p-2', op === 'all' ? 'border-slate-300 bg-slate-50/60' : 'border-accent-200 bg-accent-50/40')} data-testid={`group-${key}`}>
        <legend className="flex flex-wrap items-center gap-2 px-1 text-xs">
          {notPath ? <span className="rounded bg-accent-700 px-1.5 py-0.5 font-semibold uppercase text-white">not</span> : null}
          <select
            aria-label={`${groupName}: combine`}
            value={op}
            disabled={disabled}
            onChange={(e) => edit((t) => setGroupOp(t, path, e.target.value as GroupOp))}
            className="rounded border border-slate-300 bg-white px-1 py-0.5 text-xs font-medium"
          >
            <option value="all">{GROUP_WORDS.all}</option>
            <option value="any">{GROUP_WORDS.any}</option>
          </select>
          <button type="button" className={notPath !== null ? pressed : small} aria-pressed={notPath !== null} aria-label={`${groupName}: not`} disabled={disabled} onClick={() => edit((t) => toggleNot(t, target))}>
            not
          </button>
          {key !== 'root' || notPath ? (
            <button type="button" className={small} aria-label={`${groupName}: remove`} disabled={disabled} onClick={() => edit((t) => removeAt(t, target))}>
              <Trash2 aria-hidden className="h-3 w-3" /> group
            </button>
          ) : null}
        </legend>
        <div className="space-y-2">
          {kids.map((k, i) => (
            <div key={pathKey([...path, i])} className={cn(i > 0 && 'border-t border-dashed border-slate-200 pt-2')}>
              {i > 0 ? <span className="mb-1 block text-[11px] font-semibold uppercase tracking-wide text-slate-500">{op === 'all' ? 'and' : 'or'}</span> : null}
              {renderNode(k, [...path, i], null)}
            </div>
          ))}
        </div>
        <div className="mt-2 flex gap-2">
          <button type="button" className={small} disabled={disabled} aria-label={`${groupName}: add a condition`} onClick={() => edit((t) => addCondition(t, path, newLeaf()))}>
            <Plus aria-hidden className="h-3 w-3" /> condition
          </button>
          {depthAt(path) + 1 < maxDepth ? (
            <button
              type="button"
              className={small}
              disabled={disabled}
              aria-label={`${groupName}: add a group`}
              onClick={() => edit((t) => addCondition(t, path, (op === 'all' ? { any: [newLeaf(), newLeaf()] } : { all: [newLeaf(), newLeaf()] }) as Tree<L>))}
            >
              <Plus aria-hidden className="h-3 w-3" /> {op === 'all' ? '“any of” group' : '“all of” group'}
            </button>
          ) : null}
        </div>
      </fieldset>
    );
  };

  return <div className="space-y-2">{renderNode(value, [], null)}</div>;
}
