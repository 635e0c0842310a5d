'use client';
/**
 * The replay of a stored run: the run's event log and the server's trace are read page by page
 * from the run's route handlers; a local cell replays the log (replay-engine.ts) and feeds the
 * workspace's panel, arm view and scope, read-only. Scrub, play, single-step by scan or by
 * event; the first rule violation is marked on the timeline.
 */
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { ChevronsLeft, ChevronsRight, Pause, Play, SkipBack, SkipForward } from 'lucide-react';
import { Notice } from '@/components/ui/notice';
import { cn } from '@/components/ui/cn';
import { fetchJson } from '@/lib/api/client';
import { PanelArea } from '@/components/panel/panel-area';
import { MonitorArea } from '@/components/monitor/monitor-area';
import { ScopeArea, type ScopeMark } from '@/components/scope/scope-area';
import { ScopeRecorderProvider } from '@/components/scope/scope-context';
import { ArmView } from '@/components/controller/arm-view';
import { WorkspaceProvider } from '@/components/workspace/workspace-provider';
import { formatCellTime, humanise } from '@/components/workspace/format';
import type { EngineFactory, EngineSink } from '@/components/workspace/store';
import { nextScanMs, type CellDocument, type FaultCard, type LoggedEvent } from '@/simulator';
import { createReplay, type Replay } from './replay-engine';

type EventsPage = { events: LoggedEvent[]; page: number; pages: number; untilMs: number };
type TracePage = { signals: string[]; samples: [number, number, number | string | boolean][]; endMs: number; page: number; pages: number; hiddenVisible: boolean };

export type ReplayProps = {
  runId: string;
  document: CellDocument;
  /** The drill's fault cards and the run's seed, only when the reader may see them. */
  faults: FaultCard[] | null;
  seed: number | null;
  hiddenVisible: boolean;
  mode: 'drill' | 'practice';
  /** First rule violation (from the breakdown, when it may be seen). */
  violation: { timeMs: number; rule: string; message: string } | null;
};

/** Reads every page of a paged run route. */
async function allPages<T extends { pages: number }>(url: (page: number) => string): Promise<T[]> {
  const first = await fetchJson<T>(url(1));
  const rest = await Promise.all(Array.from({ length: Math.max(0, first.pages - 1) }, (_, i) => fetchJson<T>(url(i + 2))));
  return [first, ...rest];
}

/** The run routes serve at most 5000 items a page (lib/schemas/runs.ts). */
const PAGE = 2000;
const PAGE_MAX = 5000;

export function RunReplay(props: ReplayProps) {
  const [data, setData] = useState<{ events: LoggedEvent[]; endMs: number; faultTimes: { id: string; t: number }[] } | null>(null);
  const [error, setError] = useState<string | null>(null);
  useEffect(() => {
    let cancelled = false;
    (async () => {
      const [eventPages, tracePages] = await Promise.all([
        allPages<EventsPage>((p) => `/api/runs/${props.runId}/events?page=${p}&pageSize=${PAGE}`),
        allPages<TracePage>((p) => `/api/runs/${props.runId}/trace?page=${p}&pageSize=${PAGE_MAX}`),
      ]);
      const events = eventPages.flatMap((p) => p.events);
      const signals = tracePages[0].signals;
      const faultTimes: { id: string; t: number }[] = [];
      for (const pg of tracePages)
        for (const [t, i, v] of pg.samples) {
          const name = signals[i];
          if (name?.startsWith('fault.') && v && v !== 'armed' && !faultTimes.some((f) => f.id === name)) faultTimes.push({ id: name, t });
        }
      const endMs = Math.max(eventPages[0].untilMs, tracePages[0].endMs, events.at(-1)?.t ?? 0);
      if (!cancelled) setData({ events, endMs, faultTimes });
    })().catch((e) => !cancelled && setError(e instanceof Error ? e.message : 'The run could not be loaded.'));
    return () => {
      cancelled = true;
    };
  }, [props.runId]);

  if (error) return <Notice tone="error">{error}</Notice>;
  if (!data) return <p className="text-sm text-slate-500">Loading the run…</p>;
  return <ReplayPlayer {...props} events={data.events} endMs={data.endMs} faultTimes={data.faultTimes} />;
}

/** The player itself, for any event log (a stored run's, or a counterexample's input sequence). */
export type ReplayPlayerProps = Omit<ReplayProps, 'runId'> & {
  events: LoggedEvent[];
  endMs: number;
  faultTimes: { id: string; t: number }[];
  /** What the scope shows first and marks (default: its own choice of signals, no marks). */
  scope?: { initialSignals?: string[]; marks?: ScopeMark[]; windows?: number[] };
  /** Cell time the player opens at (default 0). */
  startAtMs?: number;
};

export function ReplayPlayer({ document, faults, seed, hiddenVisible, mode, violation, events, endMs, faultTimes, scope, startAtMs = 0 }: ReplayPlayerProps) {
  // Built in an effect, so the cell it owns is disposed exactly when it is replaced (React's
  // development double mount would otherwise dispose a memoised one that is still in use).
  const [built, setBuilt] = useState<ReturnType<typeof createReplay> | null>(null);
  useEffect(() => {
    const made = createReplay({ document, events, endMs, seed: seed ?? undefined, faults: faults ?? undefined });
    setBuilt(made);
    return () => {
      if (made.ok) made.value.dispose();
    };
  }, [document, events, endMs, seed, faults]);
  const sinkRef = useRef<EngineSink | null>(null);
  const [t, setT] = useState(0);
  const [playing, setPlaying] = useState(false);
  const [speed, setSpeed] = useState<1 | 10>(1);
  const replay: Replay | null = built?.ok ? built.value : null;

  const show = useCallback(
    (target: number) => {
      if (!replay) return;
      const { snapshot, trace } = replay.seek(target);
      sinkRef.current?.trace(trace);
      sinkRef.current?.snapshot(snapshot);
      setT(snapshot.timeMs);
    },
    [replay],
  );

  const factory = useMemo<EngineFactory>(
    () => (sink) => {
      sinkRef.current = sink;
      return {
        load: () => {
          sink.patch({ status: 'ready', problems: [], signalNames: [] });
          queueMicrotask(() => show(startAtMs));
        },
        send: (event) => sink.patch({ lastRejection: { event, problems: [{ path: [], code: 'replay', message: 'A replay is read-only.' }] } }),
        run: () => undefined,
        pause: () => undefined,
        stepScan: () => undefined,
        getEventLog: () => Promise.resolve(events),
        dispose: () => {
          if (sinkRef.current === sink) sinkRef.current = null;
        },
      };
    },
    [events, show, startAtMs],
  );

  // Playback: advance by wall time × speed once per frame.
  useEffect(() => {
    if (!playing) return;
    let last = performance.now();
    let frame = requestAnimationFrame(function tick(now) {
      const dt = (now - last) * speed;
      last = now;
      const target = Math.min(endMs, (replay?.timeMs ?? 0) + Math.max(1, Math.round(dt)));
      show(target);
      if (target >= endMs) setPlaying(false);
      else frame = requestAnimationFrame(tick);
    });
    return () => cancelAnimationFrame(frame);
  }, [playing, speed, endMs, replay, show]);

  if (!built) return <p className="text-sm text-slate-500">Preparing the replay…</p>;
  if (!built.ok) return <Notice tone="error">The run&apos;s cell does not load: {built.errors.map((p) => p.message).join('; ')}</Notice>;

  const scan = document.plc.sheet.scanPeriodMs || 10;
  const init = { cellId: 'replay', version: 0, document, canEdit: false };
  const pct = (x: number) => `${endMs > 0 ? (100 * x) / endMs : 0}%`;

  return (
    <WorkspaceProvider init={init} engineFactory={factory}>
      <ScopeRecorderProvider>
        <div className="space-y-4" data-testid="replay">
          {mode === 'drill' && !hiddenVisible ? (
            <Notice>
              This replay runs your actions without the drill&apos;s hidden faults: they stay hidden until the drill closes. After that the
              replay shows them, and the grade&apos;s rule marks.
            </Notice>
          ) : null}
          <div className="space-y-2 rounded-md border border-slate-300 bg-slate-800 px-3 py-3 text-slate-100">
            <div className="flex flex-wrap items-center gap-2">
              <button type="button" onClick={() => setPlaying(!playing)} className="inline-flex items-center gap-1 rounded bg-accent-700 px-2 py-1 text-xs font-medium" data-testid="replay-play">
                {playing ? <Pause aria-hidden className="h-3.5 w-3.5" /> : <Play aria-hidden className="h-3.5 w-3.5" />}
                {playing ? 'Pause' : 'Play'}
              </button>
              <button type="button" aria-pressed={speed === 10} onClick={() => setSpeed(speed === 1 ? 10 : 1)} className={cn('rounded px-2 py-1 text-xs ring-1 ring-slate-600', speed === 10 && 'bg-slate-600')}>
                ×{speed}
              </button>
              <button type="button" onClick={() => show(replay?.previousEventBefore(t) ?? 0)} className="inline-flex items-center gap-1 rounded px-2 py-1 text-xs ring-1 ring-slate-600" aria-label="Previous event">
                <SkipBack aria-hidden className="h-3.5 w-3.5" /> Event
              </button>
              <button type="button" onClick={() => show(Math.max(0, (Math.ceil(t / scan) - 1) * scan))} className="inline-flex items-center gap-1 rounded px-2 py-1 text-xs ring-1 ring-slate-600" aria-label="Step back one scan">
                <ChevronsLeft aria-hidden className="h-3.5 w-3.5" /> Scan
              </button>
              <button type="button" onClick={() => show(nextScanMs(t, scan))} className="inline-flex items-center gap-1 rounded px-2 py-1 text-xs ring-1 ring-slate-600" aria-label="Step one scan" data-testid="replay-step">
                Scan <ChevronsRight aria-hidden className="h-3.5 w-3.5" />
              </button>
              <button type="button" onClick={() => show(replay?.nextEventAfter(t) ?? endMs)} className="inline-flex items-center gap-1 rounded px-2 py-1 text-xs ring-1 ring-slate-600" aria-label="Next event" data-testid="replay-next-event">
                Event <SkipForward aria-hidden className="h-3.5 w-3.5" />
              </button>
              {violation ? (
                <button type="button" onClick={() => show(violation.timeMs)} className="rounded bg-red-700 px-2 py-1 text-xs font-medium" data-testid="jump-violation">
                  Go to first violation
                </button>
              ) : null}
              <span className="ml-auto font-mono text-sm" data-testid="replay-time">
                {formatCellTime(t)} / {formatCellTime(endMs)}
              </span>
            </div>
            <div className="relative pt-3">
              <div aria-hidden className="pointer-events-none absolute inset-x-0 top-0 h-3">
                {events.map((e, i) => (
                  <span key={i} className="absolute top-1 h-2 w-px bg-slate-300" style={{ left: pct(e.t) }} title={`${e.event.type} at ${formatCellTime(e.t)}`} />
                ))}
                {faultTimes.map((f) => (
                  <span key={f.id} className="absolute top-0 h-3 w-1 bg-amber-400" style={{ left: pct(f.t) }} title={`${f.id} active from ${formatCellTime(f.t)}`} />
                ))}
                {violation ? <span className="absolute -top-0.5 h-3.5 w-1.5 rounded-sm bg-red-500" style={{ left: pct(violation.timeMs) }} data-testid="violation-mark" /> : null}
              </div>
              <input
                type="range"
                min={0}
                max={endMs}
                step={1}
                value={t}
                onChange={(e) => {
                  setPlaying(false);
                  show(Number(e.target.value));
                }}
                aria-label="Replay position"
                className="w-full accent-teal-500"
                data-testid="replay-scrub"
              />
            </div>
            <p className="text-xs text-slate-300">
              {events.length} events · ticks mark events
              {faultTimes.length > 0 ? ' · amber: a fault card becomes active' : ''}
              {violation ? ` · red: first rule violation (${violation.rule}: ${violation.message})` : ''}
            </p>
          </div>
          <section aria-label="Panel" className="relative overflow-x-auto rounded-md border border-slate-200 bg-white p-3">
            <h2 className="mb-2 text-sm font-semibold text-slate-700">Panel</h2>
            <PanelArea />
          </section>
          <div className="grid gap-4 lg:grid-cols-[3fr_2fr]">
            <section aria-label="Arm" className="rounded-md border border-slate-200 bg-white p-3">
              <h2 className="mb-2 text-sm font-semibold text-slate-700">Arm</h2>
              <ArmView poses={document.controller.poses} homePose={document.controller.homePose} />
            </section>
            <section aria-label="Event log" className="rounded-md border border-slate-200 bg-white p-3">
              <h2 className="mb-2 text-sm font-semibold text-slate-700">Event log</h2>
              {events.length === 0 ? <p className="text-sm text-slate-500">No operator events: the cell ran on its own.</p> : null}
              <ol className="max-h-80 space-y-0.5 overflow-auto font-mono text-xs">
                {events.map((e, i) => (
                  <li key={i}>
                    <button type="button" onClick={() => show(e.t)} className={cn('w-full rounded px-1 text-left hover:bg-slate-100', e.t <= t ? 'text-slate-900' : 'text-slate-500')}>
                      {formatCellTime(e.t)} {humanise(e.event.type)} {'device' in e.event ? e.event.device : 'target' in e.event ? e.event.target : ''}
                    </button>
                  </li>
                ))}
              </ol>
            </section>
          </div>
          <section aria-label="Scope" className="rounded-md border border-slate-200 bg-white p-3">
            <h2 className="mb-2 text-sm font-semibold text-slate-700">Scope</h2>
            <ScopeArea {...scope} />
          </section>
          <details className="rounded-md border border-slate-200 bg-white p-3">
            <summary className="cursor-pointer text-sm font-semibold text-slate-700">Monitor</summary>
            <div className="mt-3 [&_button[aria-label^='Force']]:hidden [&_button[aria-label^='Unforce']]:hidden">
              <MonitorArea />
            </div>
          </details>
        </div>
      </ScopeRecorderProvider>
    </WorkspaceProvider>
  );
}
