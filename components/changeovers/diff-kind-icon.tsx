import { ArrowUpDown, Minus, Move, PencilLine, Plus, Shuffle } from 'lucide-react';
import type { DiffEntry } from '@/simulator';
import { cn } from '@/components/ui/cn';
import { kindLabel } from './diff-format';

const STYLES: Record<DiffEntry['kind'], { Icon: typeof Plus; className: string }> = {
  added: { Icon: Plus, className: 'border-teal-600 bg-teal-50 text-teal-900' },
  removed: { Icon: Minus, className: 'border-rose-600 bg-rose-50 text-rose-900' },
  changed: { Icon: PencilLine, className: 'border-amber-500 border-dashed bg-amber-50 text-amber-950' },
  moved: { Icon: Move, className: 'border-slate-300 border-dotted bg-white text-slate-600' },
  reordered: { Icon: ArrowUpDown, className: 'border-amber-500 border-dashed bg-amber-50 text-amber-950' },
};

/** A diff entry's kind as an icon and a word (border style as well as colour), e.g. "+ added", "✎ re-terminated". */
export function KindBadge({ entry, className }: { entry: Pick<DiffEntry, 'kind' | 'target' | 'ends'>; className?: string }) {
  const reTerminated = entry.kind === 'changed' && entry.target === 'wire' && (entry.ends?.length ?? 0) > 0;
  const { Icon, className: tone } = STYLES[entry.kind];
  const Shown = reTerminated ? Shuffle : Icon;
  return (
    <span data-kind={entry.kind} className={cn('inline-flex items-center gap-1 whitespace-nowrap rounded border px-1.5 py-0.5 text-xs font-medium', tone, className)}>
      <Shown aria-hidden className="h-3 w-3" />
      {kindLabel(entry)}
    </span>
  );
}
