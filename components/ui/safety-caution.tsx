import type { ReactNode } from 'react';
import { ShieldAlert } from 'lucide-react';
import { cn } from './cn';

/**
 * The caution every screen that models e-stops, guards or interlocks carries
 * (DESIGN.md, Safety). Cellwright's interlocks are training models, never safety functions.
 * `children` add what a screen needs beyond it (a changeover's limits of a proof); they never
 * replace the standard text.
 */
export function SafetyCaution({ className, compact = false, children }: { className?: string; compact?: boolean; children?: ReactNode }) {
  return (
    <aside
      aria-label="Safety caution"
      data-testid="safety-caution"
      className={cn('flex gap-3 rounded-md border border-amber-300 bg-amber-50 px-4 py-3 text-sm text-amber-950', className)}
    >
      <ShieldAlert aria-hidden className="mt-0.5 h-5 w-5 shrink-0 text-amber-700" />
      <div className="space-y-1">
        <p className="font-semibold">Training model — not a safety function</p>
        {compact ? (
          <p>
            Cellwright&apos;s interlocks are simulations. Real e-stop and guard circuits need hardwired or safety-rated devices
            (ISO 13849-1 / IEC 62061, IEC 60204-1, ISO 10218), lockout/tagout, and local codes.
          </p>
        ) : (
          <p>
            Cellwright is a training and rehearsal tool; its interlocks are not safety functions. Real emergency-stop and guard
            circuits are hardwired or run through safety-rated devices designed to ISO 13849-1 / IEC 62061 and IEC 60204-1, robot
            cells follow ISO 10218, work on real equipment needs lockout/tagout, and local codes and licensed practice take
            precedence.
          </p>
        )}
        {children}
      </div>
    </aside>
  );
}
