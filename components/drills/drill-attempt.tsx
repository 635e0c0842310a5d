'use client';
/**
 * A student's drill attempt: the workspace driven by the server's cell (remote engine), the
 * brief, the clock against the time limit, what is being saved, and the diagnosis dialog.
 */
import { useEffect, useMemo, useState, useSyncExternalStore } from 'react';
import { useRouter } from 'next/navigation';
import { ChevronDown, ChevronUp, CloudCheck, CloudOff, Pause, Play, Send, StepForward, Timer } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { cn } from '@/components/ui/cn';
import { Dialog } from '@/components/cells/dialog';
import { ApiClientError, fetchJson } from '@/lib/api/client';
import { formatCellTime, humanise } from '@/components/workspace/format';
import { useWorkspace } from '@/components/workspace/contract';
import type { CellDocument } from '@/simulator';
import { createRemoteRun, type RemoteRun } from '@/components/runs/remote-engine';
import { RunWorkspace, type AreaEditing } from '@/components/runs/run-workspace';
import { DOWNLOAD_AREAS, type DownloadArea } from '@/components/workspace/download';
import { RunMessages } from '@/components/live/run-messages';
import { Markdown } from './markdown';
import { locationOptions, type LocationOption } from './locations';
import type { StudentDrillPayload } from '@/lib/drills/access';

/** What the attempt page hands the client: the student payload (no fault cards, rules or answer) and the diagnosis catalogue. */
export type StudentDrill = StudentDrillPayload & { diagnosisKinds: readonly string[] };

type RunAnswer = { run: { id: string; status: string; lastSeq: number; untilMs: number } };

/**
 * Which workspace areas a drill's permissions open. Edits reach the server's cell as events:
 * point-map edits as staged rows, logic/wiring/routine edits as a `download` ("Send to cell").
 */
export function areaEditing(editable: readonly string[]): AreaEditing {
  return { controller: editable.includes('point-map') || editable.includes('routine'), logic: editable.includes('logic'), field: editable.includes('wiring') };
}

/** The parts a drill lets the student download into the running cell. */
export function downloadableAreas(editable: readonly string[]): DownloadArea[] {
  return DOWNLOAD_AREAS.filter((a) => editable.includes(a));
}

/** Starts (or resumes) the attempt, then shows it. */
export function DrillAttempt({ payload, document }: { payload: StudentDrill; document: CellDocument }) {
  const [run, setRun] = useState<{ id: string; status: string; resumed: boolean } | null>(null);
  const [error, setError] = useState<string | null>(null);
  useEffect(() => {
    let cancelled = false;
    fetchJson<RunAnswer & { resumed: boolean }>(`/api/assignments/${payload.assignmentId}/run`, { method: 'POST' })
      .then((a) => !cancelled && setRun({ id: a.run.id, status: a.run.status, resumed: a.resumed }))
      .catch((e) => !cancelled && setError(e instanceof ApiClientError ? e.message : 'The attempt could not be started.'));
    return () => {
      cancelled = true;
    };
  }, [payload.assignmentId]);

  if (error) return <Notice tone="error">{error}</Notice>;
  if (!run) return <p className="text-sm text-slate-500">Opening your attempt…</p>;
  if (run.status !== 'active') {
    return (
      <Notice tone="info">
        You have submitted this drill. <a className="font-medium text-accent-700 underline" href={`/runs/${run.id}`}>See your result</a>.
      </Notice>
    );
  }
  return <AttemptWorkspace payload={payload} document={document} runId={run.id} />;
}

function AttemptWorkspace({ payload, document, runId }: { payload: StudentDrill; document: CellDocument; runId: string }) {
  const { drill } = payload;
  const [remote] = useState<RemoteRun>(() => createRemoteRun({ runId, permissions: drill.permissions, timeLimitMs: drill.timeLimitMs }));
  const init = useMemo(() => ({ cellId: drill.cellId, version: drill.cellVersion, document, canEdit: false }), [drill.cellId, drill.cellVersion, document]);
  const options = useMemo(() => locationOptions(document), [document]);
  return (
    <RunWorkspace
      init={init}
      engineFactory={remote.factory}
      editing={areaEditing(drill.permissions.editable)}
      downloadable={downloadableAreas(drill.permissions.editable)}
      forceAllowed={drill.permissions.forceAllowed}
      header={<AttemptHeader payload={payload} remote={remote} runId={runId} options={options} />}
      strip={<RemoteStrip remote={remote} timeLimitMs={drill.timeLimitMs} />}
    />
  );
}

function useRemoteState(remote: RemoteRun) {
  return useSyncExternalStore(remote.subscribe, remote.getState, remote.getState);
}

function AttemptHeader({ payload, remote, runId, options }: { payload: StudentDrill; remote: RemoteRun; runId: string; options: LocationOption[] }) {
  const { drill } = payload;
  const [briefOpen, setBriefOpen] = useState(true);
  const [submitOpen, setSubmitOpen] = useState(false);
  const state = useRemoteState(remote);
  return (
    <div className="mb-3 space-y-3">
      <header className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <p className="text-xs font-medium uppercase tracking-wide text-accent-700">Drill attempt</p>
          <h1 className="text-xl font-semibold text-slate-900">{drill.title}</h1>
          <p className="text-xs text-slate-500">
            Closes {new Date(payload.closesAt).toLocaleString()} · the cell runs on the server; your actions are saved as you go
            {state.resumed ? ' · resumed where you left off' : ''}
          </p>
        </div>
        <Button onClick={() => setSubmitOpen(true)} disabled={state.phase !== 'ready'} data-testid="open-submit">
          <Send aria-hidden className="h-4 w-4" /> Submit diagnosis
        </Button>
      </header>
      <section aria-label="Brief" className="rounded-md border border-slate-200 bg-white">
        <button type="button" onClick={() => setBriefOpen(!briefOpen)} aria-expanded={briefOpen} className="flex w-full items-center justify-between px-4 py-2 text-left text-sm font-semibold text-slate-800">
          Brief and objectives
          {briefOpen ? <ChevronUp aria-hidden className="h-4 w-4" /> : <ChevronDown aria-hidden className="h-4 w-4" />}
        </button>
        {briefOpen ? (
          <div className="grid gap-4 border-t border-slate-100 px-4 py-3 md:grid-cols-[2fr_1fr]">
            <Markdown source={drill.brief || '_No brief._'} drillId={drill.id} />
            <div>
              <h2 className="text-xs font-semibold uppercase tracking-wide text-slate-500">Objectives</h2>
              {drill.objectives.length === 0 ? (
                <p className="text-sm text-slate-500">Find the fault and name it.</p>
              ) : (
                <ul className="mt-1 list-disc space-y-1 pl-5 text-sm">
                  {drill.objectives.map((o, i) => (
                    <li key={i}>{o}</li>
                  ))}
                </ul>
              )}
              <h2 className="mt-3 text-xs font-semibold uppercase tracking-wide text-slate-500">You may</h2>
              <ul className="mt-1 space-y-0.5 text-sm">
                <li>{drill.permissions.forceAllowed ? 'Force points from the monitor' : 'Not force points (this drill does not allow it)'}</li>
                <li>{drill.permissions.editable.includes('point-map') ? 'Stage point-map changes and restart the controller' : 'Not change the point map'}</li>
                {downloadableAreas(drill.permissions.editable).length > 0 ? (
                  <li>Edit the {downloadableAreas(drill.permissions.editable).join(', ')} and send it to the running cell with “Send to cell”</li>
                ) : null}
              </ul>
            </div>
          </div>
        ) : null}
      </section>
      <RunMessages assignmentId={payload.assignmentId} />
      {state.phase === 'failed' ? <Notice tone="error">{state.message}</Notice> : null}
      {state.saving?.fatal ? <Notice tone="error">Your actions are no longer saved: {state.saving.lastError}</Notice> : null}
      <SubmitDialog open={submitOpen} onClose={() => setSubmitOpen(false)} remote={remote} runId={runId} kinds={payload.diagnosisKinds} options={options} />
    </div>
  );
}

/** The run strip of a drill attempt: real time only, the clock against the limit, and saving. */
function RemoteStrip({ remote, timeLimitMs }: { remote: RemoteRun; timeLimitMs: number }) {
  const state = useRemoteState(remote);
  const run = useWorkspace((s) => s.run);
  const pause = useWorkspace((s) => s.pause);
  const stepScan = useWorkspace((s) => s.stepScan);
  const ctrlState = useWorkspace((s) => s.snapshot?.controller.state);
  const ready = state.phase === 'ready';
  const left = Math.max(0, timeLimitMs - state.timeMs);
  const saving = state.saving;
  const savingText = !saving
    ? 'connecting…'
    : saving.fatal
      ? 'not saving'
      : saving.attempt > 0
        ? `retrying (${saving.lastError ?? 'offline'})`
        : saving.pending > 0 || saving.inFlight
          ? 'saving…'
          : 'saved';
  return (
    <div className="flex flex-wrap items-center gap-x-5 gap-y-2 rounded-md border border-slate-300 bg-slate-800 px-3 py-2 text-slate-100" data-testid="status-strip">
      <div role="group" aria-label="Run controls" className="flex items-center gap-1">
        <button type="button" disabled={!ready || state.limitReached} aria-pressed={state.running} onClick={() => run(1)} className={cn('inline-flex items-center gap-1 rounded px-2 py-1 text-xs font-medium ring-1 ring-slate-600 hover:bg-slate-700 disabled:opacity-40', state.running && 'bg-accent-700 ring-2 ring-accent-300')}>
          <Play aria-hidden className="h-3.5 w-3.5" /> Run
        </button>
        <button type="button" disabled={!ready} aria-pressed={!state.running} onClick={pause} className={cn('inline-flex items-center gap-1 rounded px-2 py-1 text-xs font-medium ring-1 ring-slate-600 hover:bg-slate-700 disabled:opacity-40', !state.running && 'bg-slate-600')}>
          <Pause aria-hidden className="h-3.5 w-3.5" /> Pause
        </button>
        <button type="button" disabled={!ready || state.limitReached} onClick={stepScan} className="inline-flex items-center gap-1 rounded px-2 py-1 text-xs font-medium ring-1 ring-slate-600 hover:bg-slate-700 disabled:opacity-40">
          <StepForward aria-hidden className="h-3.5 w-3.5" /> Step one scan
        </button>
      </div>
      <span className="font-mono text-sm" data-testid="cell-time">
        {formatCellTime(state.timeMs)}
      </span>
      <span className={cn('inline-flex items-center gap-1 font-mono text-sm', left < 60_000 && 'text-amber-300')} data-testid="time-left">
        <Timer aria-hidden className="h-4 w-4" /> {state.limitReached ? 'time is up' : `${formatCellTime(left)} left`}
      </span>
      {ctrlState ? <span className="text-xs text-slate-300">controller: {humanise(ctrlState)}</span> : null}
      <span className="ml-auto inline-flex items-center gap-1 text-xs" data-testid="saving-state" role="status">
        {saving && !saving.fatal && saving.attempt === 0 ? <CloudCheck aria-hidden className="h-4 w-4" /> : <CloudOff aria-hidden className="h-4 w-4 text-amber-300" />}
        {savingText}
        {state.viewError ? <span className="text-amber-300"> · view: {state.viewError}</span> : null}
      </span>
    </div>
  );
}

function SubmitDialog({ open, onClose, remote, runId, kinds, options }: { open: boolean; onClose: () => void; remote: RemoteRun; runId: string; kinds: readonly string[]; options: LocationOption[] }) {
  const router = useRouter();
  const [kind, setKind] = useState('');
  const [location, setLocation] = useState('');
  const [second, setSecond] = useState('');
  const [note, setNote] = useState('');
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const needsTwo = kind === 'swapped-wires';
  const groups = ['device', 'wire', 'module', 'point-map row'] as const;

  const submit = async () => {
    setError(null);
    setFields({});
    if (!kind || !location || (needsTwo && !second)) {
      setError(needsTwo ? 'Choose the fault kind and both wires.' : 'Choose the fault kind and where it is.');
      return;
    }
    setBusy(true);
    try {
      await remote.flush();
      await fetchJson(`/api/runs/${runId}/submit`, { method: 'POST', body: { diagnosis: { kind, location: needsTwo ? `${location},${second}` : location, note } } });
      remote.end();
      router.push(`/runs/${runId}`);
    } catch (e) {
      setError(e instanceof ApiClientError ? e.message : e instanceof Error ? e.message : 'The diagnosis could not be submitted.');
      if (e instanceof ApiClientError && e.fields) setFields(e.fields);
      setBusy(false);
    }
  };

  const picker = (id: string, label: string, value: string, set: (v: string) => void) => (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-medium text-slate-700">
        {label}
      </label>
      <select id={id} value={value} onChange={(e) => set(e.target.value)} className="block w-full rounded-md border border-slate-300 bg-white px-3 py-2 text-sm">
        <option value="">Choose…</option>
        {groups.map((g) => (
          <optgroup key={g} label={g}>
            {options
              .filter((o) => o.group === g)
              .map((o) => (
                <option key={`${g}-${o.id}`} value={o.id}>
                  {o.label}
                </option>
              ))}
          </optgroup>
        ))}
      </select>
    </div>
  );

  return (
    <Dialog title="Submit diagnosis" open={open} onClose={onClose}>
      <div className="space-y-3" data-testid="submit-dialog">
        <p className="text-sm text-slate-600">Say which fault you found and where. The server replays your whole run to grade it; you can submit once.</p>
        <div className="space-y-1">
          <label htmlFor="diagnosis-kind" className="block text-sm font-medium text-slate-700">
            Fault kind
          </label>
          <select id="diagnosis-kind" value={kind} onChange={(e) => setKind(e.target.value)} className="block w-full rounded-md border border-slate-300 bg-white px-3 py-2 text-sm">
            <option value="">Choose…</option>
            {kinds.map((k) => (
              <option key={k} value={k}>
                {humanise(k)}
              </option>
            ))}
          </select>
          {fields['diagnosis.kind'] ? <p className="text-xs text-red-700">{fields['diagnosis.kind'].join(' ')}</p> : null}
        </div>
        {picker('diagnosis-location', needsTwo ? 'First wire' : 'Where', location, setLocation)}
        {needsTwo ? picker('diagnosis-location-2', 'Second wire', second, setSecond) : null}
        <div className="space-y-1">
          <label htmlFor="diagnosis-note" className="block text-sm font-medium text-slate-700">
            Note for your trainer (optional)
          </label>
          <textarea id="diagnosis-note" value={note} onChange={(e) => setNote(e.target.value)} maxLength={2000} rows={3} className="block w-full rounded-md border border-slate-300 px-3 py-2 text-sm" />
        </div>
        {error ? <Notice tone="error">{error}</Notice> : null}
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button onClick={() => void submit()} disabled={busy} data-testid="confirm-submit">
            {busy ? 'Grading…' : 'Submit'}
          </Button>
        </div>
      </div>
    </Dialog>
  );
}
