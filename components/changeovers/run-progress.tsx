'use client';
/**
 * A proofs or checks job under way: how far it got and what it is doing, from its run row
 * (read again while it runs). Each rule or scenario reports when it starts, so the bar moves
 * one step per rule and side.
 */
import type { EvidenceRun } from '@/db/changeover-evidence';

export function RunProgress({ run, what }: { changeoverId: string; run: EvidenceRun; what: string }) {
  const pct = run.total > 0 ? Math.round((100 * run.done) / run.total) : 0;
  return (
    <div className="space-y-1 rounded-md border border-accent-200 bg-accent-50/50 px-3 py-2" role="status" aria-live="polite" data-testid={`${what.toLowerCase()}-progress`}>
      <p className="text-sm font-medium text-slate-900">
        {what} {run.status === 'queued' ? 'waiting for a worker' : 'running'}: {run.done} of {run.total} steps
      </p>
      <div className="h-2 overflow-hidden rounded bg-slate-200" aria-hidden>
        <div className="h-full bg-accent-700 transition-[width]" style={{ width: `${pct}%` }} />
      </div>
      {run.current ? <p className="text-xs text-slate-600">{run.current}</p> : null}
    </div>
  );
}
