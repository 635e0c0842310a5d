import type { ReactNode } from 'react';
import { ShieldAlert } from 'lucide-react';
import { cn } from './cn';

/**
 * The standard caution text (DESIGN.md, Safety), in full on every screen that carries it: the
 * deference to local codes and licensed practice is the part a shortened version used to drop.
 */
export const SAFETY_CAUTION_TEXT =
  'Cellwright is a training and rehearsal tool; its interlocks are not safety functions. Real emergency-stop and guard circuits are hardwired or run through safety-rated devices designed to ISO 13849-1 / IEC 62061 and IEC 60204-1, robot cells follow ISO 10218, work on real equipment needs lockout/tagout, and local codes and licensed practice take precedence.';

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
