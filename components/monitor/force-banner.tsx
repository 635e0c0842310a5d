'use client';
import { Lock } from 'lucide-react';
import { useForces } from './use-monitor';

/**
 * A persistent banner across the workspace while any point is forced. Where forcing is not
 * allowed no force can be set, but should one be present it is still shown, without the
 * unforce control (the run's policy refuses unforce as well).
 */
export function ForceBanner() {
  const { targets, forceAllowed, unforce } = useForces();
  if (targets.length === 0) return null;
  return (
    <div role="status" data-testid="force-banner" className="flex flex-wrap items-center gap-3 rounded-md border-2 border-amber-500 bg-amber-100 px-3 py-2 text-sm text-amber-950">
      <Lock aria-hidden className="h-4 w-4" />
      <strong>
        {targets.length} {targets.length === 1 ? 'force' : 'forces'} active
      </strong>
      <span className="font-mono text-xs">{targets.join(', ')}</span>
      <span className="text-xs">The cell runs on forced values, not on what its inputs and logic say.</span>
      {forceAllowed ? (
        <button
          type="button"
          onClick={() => targets.forEach((t) => unforce(t))}
          className="ml-auto rounded border border-amber-700 bg-white px-2 py-0.5 text-xs font-medium hover:bg-amber-50"
        >
          Unforce all
        </button>
      ) : (
        <span className="ml-auto text-xs">Forcing is not allowed in this drill.</span>
      )}
    </div>
  );
}
