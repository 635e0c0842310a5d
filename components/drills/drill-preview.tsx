'use client';
/**
 * "Preview as student": the drill's workspace with the student's permissions, but run in this
 * browser's engine worker with the hidden fault cards injected at time 0 and shown to the
 * trainer live. The preview is recorded like free practice (its own run), so it can be replayed.
 * Edits behave as in the student's attempt: they stay in the browser until "Send to cell"
 * sends the parts the drill lets the student download; nothing restarts the run at time 0.
 */
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import Link from 'next/link';
import { Eye } from 'lucide-react';
import { Notice } from '@/components/ui/notice';
import { fetchJson, ApiClientError } from '@/lib/api/client';
import { useSnapshot, useWorkspace, shallowEqual } from '@/components/workspace/contract';
import { formatCellTime, humanise } from '@/components/workspace/format';
import type { CellDocument, FaultCard } from '@/simulator';
import { RunWorkspace } from '@/components/runs/run-workspace';
import { useRunRecorder } from '@/components/runs/use-run-recorder';
import { Markdown } from './markdown';
import { areaEditing, downloadableAreas } from './drill-attempt';

export type PreviewDrill = {
  id: string;
  title: string;
  brief: string;
  objectives: string[];
  faults: FaultCard[];
  answer: { kind: string; location: string };
  timeLimitMs: number;
  permissions: { forceAllowed: boolean; editable: string[] };
  cellId: string;
  cellVersion: number;
};

type Started = { run: { id: string; seed?: number } };

export function DrillPreview({ drill, document }: { drill: PreviewDrill; document: CellDocument }) {
  const [run, setRun] = useState<{ id: string; seed: number } | null>(null);
  const [error, setError] = useState<string | null>(null);
  const start = useCallback(async () => {
    const a = await fetchJson<Started>('/api/runs', { method: 'POST', body: { cellId: drill.cellId, version: drill.cellVersion } });
    return a;
  }, [drill.cellId, drill.cellVersion]);
  useEffect(() => {
    let cancelled = false;
    start()
      .then((a) => !cancelled && setRun({ id: a.run.id, seed: a.run.seed ?? document.seed }))
      .catch((e) => !cancelled && setError(e instanceof ApiClientError ? e.message : 'The preview could not start.'));
    return () => {
      cancelled = true;
    };
  }, [start, document.seed]);
  const startNext = useCallback(async () => (await start()).run.id, [start]);

  if (error) return <Notice tone="error">{error}</Notice>;
  if (!run) return <p className="text-sm text-slate-500">Starting the preview…</p>;
  // The worker seeds its cell from the document: use the run's seed so the saved run replays exactly.
  return <PreviewWorkspace drill={drill} document={{ ...document, seed: run.seed }} runId={run.id} startNext={startNext} />;
}

function PreviewWorkspace({ drill, document, runId, startNext }: { drill: PreviewDrill; document: CellDocument; runId: string; startNext: () => Promise<string> }) {
  const init = useMemo(() => ({ cellId: drill.cellId, version: drill.cellVersion, document, canEdit: false, editsWaitForDownload: true }), [drill.cellId, drill.cellVersion, document]);
  return (
    <RunWorkspace
      init={init}
      editing={areaEditing(drill.permissions.editable)}
      downloadable={downloadableAreas(drill.permissions.editable)}
      forceAllowed={drill.permissions.forceAllowed}
      header={<PreviewHeader drill={drill} />}
    >
      <FaultInjector faults={drill.faults} />
      <PreviewRecorder runId={runId} startNext={startNext} />
    </RunWorkspace>
  );
}

/** Injects the drill's fault cards into every fresh cell (first load, restart), as the server arms them for a student. */
function FaultInjector({ faults }: { faults: FaultCard[] }) {
  const status = useWorkspace((s) => s.engine.status);
  const eventCount = useWorkspace((s) => s.engine.eventCount);
  const send = useWorkspace((s) => s.sendEvent);
  const done = useRef(false);
  useEffect(() => {
    if (status === 'loading') done.current = false;
    if (status === 'ready' && eventCount === 0 && !done.current) {
      done.current = true;
      for (const fault of faults) send({ type: 'inject-fault', fault });
    }
  }, [status, eventCount, faults, send]);
  return null;
}

function PreviewRecorder({ runId, startNext }: { runId: string; startNext: () => Promise<string> }) {
  const rec = useRunRecorder(runId, startNext);
  return (
    <p className="mb-2 text-xs text-slate-500" data-testid="preview-recording">
      Recording this preview as run{' '}
      <Link href={`/runs/${rec.runId}/replay`} className="font-mono text-accent-700 underline">
        {rec.runId.slice(0, 8)}
      </Link>
      {rec.saving ? ` · ${rec.saving.fatal ? 'not saving' : rec.saving.pending > 0 ? 'saving…' : 'saved'}` : ''}
      {rec.error ? ` · ${rec.error}` : ''}
    </p>
  );
}

function PreviewHeader({ drill }: { drill: PreviewDrill }) {
  const faults = useSnapshot((s) => s.faults.map((f) => `${f.card.id}|${f.status}|${f.since ?? ''}`), shallowEqual) ?? [];
  return (
    <div className="mb-3 space-y-3">
      <header className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <p className="inline-flex items-center gap-1 text-xs font-medium uppercase tracking-wide text-accent-700">
            <Eye aria-hidden className="h-3.5 w-3.5" /> Preview as student
          </p>
          <h1 className="text-xl font-semibold text-slate-900">{drill.title}</h1>
          <p className="text-xs text-slate-500">
            Time limit {formatCellTime(drill.timeLimitMs)} · force {drill.permissions.forceAllowed ? 'allowed' : 'hidden'} · answer: {humanise(drill.answer.kind)} at{' '}
            <span className="font-mono">{drill.answer.location}</span>
          </p>
        </div>
        <Link href={`/drills/${drill.id}`} className="text-sm font-medium text-accent-700 hover:underline">
          Back to the editor
        </Link>
      </header>
      <div className="grid gap-3 md:grid-cols-[2fr_1fr]">
        <section aria-label="Brief" className="rounded-md border border-slate-200 bg-white p-3">
          <Markdown source={drill.brief || '_No brief._'} drillId={drill.id} />
        </section>
        <section aria-label="Hidden fault cards" className="rounded-md border border-amber-300 bg-amber-50 p-3 text-sm" data-testid="trainer-faults">
          <h2 className="text-xs font-semibold uppercase tracking-wide text-amber-900">Hidden from students</h2>
          <ul className="mt-1 space-y-1">
            {drill.faults.map((f) => {
              const live = faults.find((x) => x.startsWith(`${f.id}|`))?.split('|');
              return (
                <li key={f.id}>
                  <span className="font-mono">{f.id}</span> {humanise(f.kind)} {f.label ? `— ${f.label}` : ''}{' '}
                  <span className="text-xs text-amber-900">({live ? (live[1] === 'active' ? `active since ${formatCellTime(Number(live[2]))}` : 'armed') : 'not injected'})</span>
                </li>
              );
            })}
          </ul>
        </section>
      </div>
    </div>
  );
}
