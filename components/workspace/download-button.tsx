'use client';
/**
 * "Download to PLC": sends the edited logic sheet, wiring or routine into the running cell as
 * one `download` event, so the run carries on with the change (in a drill, the server's cell
 * gets exactly what the student sees). Shown in an area that may edit those parts while a run
 * is going; the store's `downloadEdits` does the work (components/workspace/download.ts).
 */
import { useMemo } from 'react';
import { Download } from 'lucide-react';
import { shallowEqual, useWorkspace, useWorkspaceApi } from './contract';
import { changedAreas, type DownloadArea } from './download';

const NAMES: Record<DownloadArea, string> = { logic: 'logic sheet', wiring: 'wiring', routine: 'routine' };

export function DownloadButton({ areas }: { areas: readonly DownloadArea[] }) {
  const api = useWorkspaceApi();
  const [running, edited] = useWorkspace((s) => [s.engineDocument, s.document] as const, shallowEqual);
  const changed = useMemo(() => changedAreas(running, edited, areas), [running, edited, areas]);
  if (areas.length === 0) return null;
  return (
    <div className="mb-2 flex flex-wrap items-center gap-2 rounded-md border border-slate-200 bg-slate-50 px-3 py-1.5 text-xs text-slate-700" data-testid="download-bar">
      <button
        type="button"
        disabled={changed.length === 0}
        onClick={() => api.getState().downloadEdits(areas)}
        className="inline-flex items-center gap-1.5 rounded-md border border-accent-700 bg-accent-700 px-2.5 py-1 font-medium text-white disabled:cursor-not-allowed disabled:border-slate-300 disabled:bg-slate-200 disabled:text-slate-500"
      >
        <Download aria-hidden className="h-3.5 w-3.5" />
        Download to PLC
      </button>
      <span data-testid="download-status">
        {changed.length === 0
          ? 'The running cell has your edits.'
          : `Edited, not yet in the running cell: ${changed.map((a) => NAMES[a]).join(', ')}. A download restarts the PLC logic (timers and counters from zero); a changed routine stops the robot at its first step.`}
      </span>
    </div>
  );
}
