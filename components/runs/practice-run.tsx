'use client';
/**
 * Free practice on a cell: it runs in this browser's engine worker as in the workspace, and its
 * event log is streamed to the server as a practice run, so it is saved and replayable.
 * The student may edit the logic sheet, wiring and routine (and stage point-map rows); edits
 * wait for "Send to cell" instead of restarting the run, and the download is an event of
 * the log like any other, so the replay runs exactly what the student ran.
 */
import { useCallback, useEffect, useMemo, useState } from 'react';
import Link from 'next/link';
import { Notice } from '@/components/ui/notice';
import { ApiClientError, fetchJson } from '@/lib/api/client';
import { LIMITS } from '@/lib/runs/policy';
import type { CellDocument } from '@/simulator';
import { DOWNLOAD_AREAS } from '@/components/workspace/download';
import { StatusStrip } from '@/components/workspace/status-strip';
import { RunWorkspace, type AreaEditing } from './run-workspace';
import { useRunRecorder } from './use-run-recorder';

type Started = { run: { id: string } };

/** A 32-bit seed from the browser's cryptographic source. */
function randomSeed(): number {
  return crypto.getRandomValues(new Uint32Array(1))[0];
}

/** The server follows a recorded practice run at most `LIMITS.speed.practice` times ahead of its age (lib/runs/policy.ts). */
const PRACTICE_SPEEDS = [1, LIMITS.speed.practice] as const;

/** Practice opens every area that can change the running cell through an event. */
const PRACTICE_EDITING: AreaEditing = { logic: true, field: true, controller: true };

export function PracticeRun({ cellId, cellName, version, document }: { cellId: string; cellName: string; version: number; document: CellDocument }) {
  const [run, setRun] = useState<{ id: string; seed: number } | null>(null);
  const [error, setError] = useState<string | null>(null);
  // This browser picks the run's seed and sends it (the server never sends one back), so the
  // server's replay of the log matches what the worker ran.
  const start = useCallback(
    async (seed: number) => ({ ...(await fetchJson<Started>('/api/runs', { method: 'POST', body: { cellId, version, seed } })), seed }),
    [cellId, version],
  );
  useEffect(() => {
    let cancelled = false;
    start(randomSeed())
      .then((a) => !cancelled && setRun({ id: a.run.id, seed: a.seed }))
      .catch((e) => !cancelled && setError(e instanceof ApiClientError ? e.message : 'The practice run could not start.'));
    return () => {
      cancelled = true;
    };
  }, [start]);
  // After "Restart run" the worker keeps the first run's seed, so the next run is opened with it.
  const startNext = useCallback(async () => (await start(run?.seed ?? randomSeed())).run.id, [start, run?.seed]);
  // The worker seeds the cell from the document: the run's seed makes the saved run replay exactly.
  const init = useMemo(() => (run ? { cellId, version, document: { ...document, seed: run.seed }, canEdit: false, editsWaitForDownload: true } : null), [run, cellId, version, document]);

  if (error) return <Notice tone="error">{error}</Notice>;
  if (!run || !init) return <p className="text-sm text-slate-500">Starting a practice run…</p>;
  return (
    <RunWorkspace
      init={init}
      editing={PRACTICE_EDITING}
      downloadable={DOWNLOAD_AREAS}
      forceAllowed
      strip={<StatusStrip speeds={PRACTICE_SPEEDS} />}
      header={
        <header className="mb-3">
          <p className="text-xs font-medium uppercase tracking-wide text-accent-700">Free practice · recorded</p>
          <h1 className="text-xl font-semibold text-slate-900">{cellName}</h1>
        </header>
      }
    >
      <Recorder runId={run.id} startNext={startNext} />
    </RunWorkspace>
  );
}

function Recorder({ runId, startNext }: { runId: string; startNext: () => Promise<string> }) {
  const rec = useRunRecorder(runId, startNext);
  const s = rec.saving;
  return (
    <p className="mb-2 text-xs text-slate-500" role="status" data-testid="practice-recording">
      Saving this practice as a run ·{' '}
      <Link href={`/runs/${rec.runId}/replay`} className="text-accent-700 underline">
        replay it
      </Link>
      {s ? ` · ${s.fatal ? `not saving (${s.lastError})` : s.attempt > 0 ? 'retrying…' : s.pending > 0 || s.inFlight ? 'saving…' : `saved to ${Math.round(s.storedUntilMs / 100) / 10} s`}` : ''}
      {rec.runsStarted > 1 ? ` · the cell restarted, so this is run ${rec.runsStarted} of the session` : ''}
      {rec.error ? ` · ${rec.error}` : ''}
    </p>
  );
}
