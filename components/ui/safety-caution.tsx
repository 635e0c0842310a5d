import type { ReactNode } from 'react';
import { ShieldAlert } from 'lucide-react';
import { SAFETY_CAUTION_TEXT } from '@/lib/cautions';
import { cn } from './cn';

export { SAFETY_CAUTION_TEXT } from '@/lib/cautions';

/**
 * The caution every screen that models e-stops, guards or interlocks carries, once per page
 * (DESIGN.md, Safety). Cellwright's interlocks are training models, never safety functions.
 * `compact` only tightens the box for working screens; the text is always the full one.
 * `children` add what a screen needs beyond it (a changeover's limits of a proof); they never
 * replace the standard text.
 */
export function SafetyCaution({ className, compact = false, children }: { className?: string; compact?: boolean; children?: ReactNode }) {
  return (
    <aside
      aria-label="Safety caution"
      data-testid="safety-caution"
      className={cn('flex gap-3 rounded-md border border-amber-300 bg-amber-50 text-sm text-amber-950', compact ? 'px-3 py-2' : 'px-4 py-3', className)}
    >
      <ShieldAlert aria-hidden className="mt-0.5 h-5 w-5 shrink-0 text-amber-700" />
      <div className="min-w-0 space-y-1">
        <p className="font-semibold">Training model — not a safety function</p>
        <p data-testid="safety-caution-text">{SAFETY_CAUTION_TEXT}</p>
        {children}
      </div>
    </aside>
  );
}
