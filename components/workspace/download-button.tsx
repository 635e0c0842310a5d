'use client';
/**
 * "Send to cell": sends the edited logic sheet, wiring or routine into the running cell as
 * one `download` event, so the run carries on with the change (in a drill, the server's cell
 * gets exactly what the student sees). Shown in an area that may edit those parts while a run
 * is going; the store's `downloadEdits` does the work (components/workspace/download.ts).
 * A refused download lists the engine's problems here, and its parts count as not yet sent,
 * so the same button sends them again once corrected.
 */
import { useMemo } from 'react';
import { Send } from 'lucide-react';
import type { Problem } from '@/simulator';
import { shallowEqual, useWorkspace, useWorkspaceApi } from './contract';
import { changedAreas, downloadParts, type DownloadArea } from './download';

const NAMES: Record<DownloadArea, string> = { logic: 'logic sheet', wiring: 'wiring', routine: 'routine' };

/** A problem's place in the document, as dotted text (`plc.sheet.blocks.3.params.PT`). */
function problemPath(p: Problem): string {
  return p.path.map(String).join('.');
}

export function DownloadButton({ areas }: { areas: readonly DownloadArea[] }) {
  const api = useWorkspaceApi();
  const [running, edited, refusal] = useWorkspace((s) => [s.engineDocument, s.document, s.downloadRefusal] as const, shallowEqual);
  const changed = useMemo(() => changedAreas(running, edited, areas), [running, edited, areas]);
  // Only a refusal of what this bar sends belongs here (another area's bar shows its own).
  const refused = refusal && downloadParts(refusal.event).some((a) => areas.includes(a)) ? refusal : null;
  if (areas.length === 0) return null;
  return (
    <div className="mb-2 rounded-md border border-slate-200 bg-slate-50 px-3 py-1.5 text-xs text-slate-700" data-testid="download-bar">
      <div className="flex flex-wrap items-center gap-2">
        <button
          type="button"
          disabled={changed.length === 0}
          onClick={() => api.getState().downloadEdits(areas)}
          className="inline-flex items-center gap-1.5 rounded-md border border-accent-700 bg-accent-700 px-2.5 py-1 font-medium text-white disabled:cursor-not-allowed disabled:border-slate-300 disabled:bg-slate-200 disabled:text-slate-500"
        >
          <Send aria-hidden className="h-3.5 w-3.5" />
          Send to cell
        </button>
        <span data-testid="download-status">
          {changed.length === 0
            ? 'The running cell has your edits.'
            : `Edited, not yet in the running cell: ${changed.map((a) => NAMES[a]).join(', ')}. Sending restarts the PLC logic (timers and counters from zero); a changed routine sends the robot back to its first step.`}
        </span>
      </div>
      {refused ? (
        <div role="alert" className="mt-1.5 rounded border border-amber-300 bg-amber-50 px-2 py-1 text-amber-900" data-testid="download-refused">
          <p className="font-medium">The cell refused what was sent; the running cell keeps what it had. Correct these and send again:</p>
          <ul className="mt-0.5 list-disc space-y-0.5 pl-4">
            {refused.problems.map((p, i) => (
              <li key={i}>
                {p.path.length > 0 ? <span className="font-mono">{problemPath(p)}</span> : null}
                {p.path.length > 0 ? ': ' : ''}
                {p.message}
              </li>
            ))}
          </ul>
        </div>
      ) : null}
    </div>
  );
}
