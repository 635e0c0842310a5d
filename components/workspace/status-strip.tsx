'use client';
import { Download, Gauge, Pause, Play, RotateCcw, StepForward, Zap } from 'lucide-react';
import { cn } from '@/components/ui/cn';
import { useSnapshot, useWorkspace, type RunSpeed } from './contract';
import { formatCellTime, formatSpeed, humanise } from './format';

const SPEEDS: { speed: RunSpeed; label: string; icon: typeof Play }[] = [
  { speed: 1, label: 'Run ×1', icon: Play },
  { speed: 10, label: 'Run ×10', icon: Gauge },
  { speed: 'max', label: 'Run max', icon: Zap },
];

/**
 * Run controls and the live readouts: cell time, speed, controller state. `speeds` narrows the
 * offered speeds: a recorded practice run offers ×1 and ×10 only, since the server follows
 * its log and lets it run at most ×10 ahead of its age (lib/runs/policy.ts, LIMITS.speed).
 */
export function StatusStrip({ speeds }: { speeds?: readonly RunSpeed[] } = {}) {
  const engine = useWorkspace((s) => s.engine);
  const run = useWorkspace((s) => s.run);
  const pause = useWorkspace((s) => s.pause);
  const stepScan = useWorkspace((s) => s.stepScan);
  const restartRun = useWorkspace((s) => s.restartRun);
  const getEventLog = useWorkspace((s) => s.getEventLog);
  const cellId = useWorkspace((s) => s.cellId);
  const version = useWorkspace((s) => s.version);
  const timeMs = useSnapshot((s) => s.timeMs) ?? 0;
  const scans = useSnapshot((s) => s.plc.scans) ?? 0;
  const ctrlState = useSnapshot((s) => s.controller.state);
  const holdReason = useSnapshot((s) => s.controller.holdReason);
  const detail = useSnapshot((s) => s.controller.detail);
  const armMoving = useSnapshot((s) => s.arm.moving);
  const armTarget = useSnapshot((s) => s.arm.target);
  const canRun = engine.status === 'ready';

  return (
    <div className="flex flex-wrap items-center gap-x-5 gap-y-2 rounded-md border border-slate-300 bg-slate-800 px-3 py-2 text-slate-100" data-testid="status-strip">
      <div role="group" aria-label="Run controls" className="flex flex-wrap items-center gap-1">
        {SPEEDS.filter((s) => !speeds || speeds.includes(s.speed)).map(({ speed, label, icon: Icon }) => {
          const active = engine.running && engine.speed === speed;
          return (
            <button
              key={String(speed)}
              type="button"
              disabled={!canRun}
              aria-pressed={active}
              onClick={() => run(speed)}
              className={cn(
                'inline-flex items-center gap-1 rounded px-2 py-1 text-xs font-medium ring-1 ring-slate-600 hover:bg-slate-700 disabled:opacity-40',
                active && 'bg-accent-700 ring-2 ring-accent-300 hover:bg-accent-700',
              )}
            >
              <Icon aria-hidden className="h-3.5 w-3.5" />
              {label}
            </button>
          );
        })}
        <button
          type="button"
          disabled={!canRun}
          aria-pressed={!engine.running}
          onClick={pause}
          className={cn('inline-flex items-center gap-1 rounded px-2 py-1 text-xs font-medium ring-1 ring-slate-600 hover:bg-slate-700 disabled:opacity-40', !engine.running && 'bg-slate-600')}
        >
          <Pause aria-hidden className="h-3.5 w-3.5" />
          Pause
        </button>
        <button type="button" disabled={!canRun} onClick={stepScan} className="inline-flex items-center gap-1 rounded px-2 py-1 text-xs font-medium ring-1 ring-slate-600 hover:bg-slate-700 disabled:opacity-40">
          <StepForward aria-hidden className="h-3.5 w-3.5" />
          Step one scan
        </button>
        <button type="button" onClick={restartRun} className="inline-flex items-center gap-1 rounded px-2 py-1 text-xs font-medium ring-1 ring-slate-600 hover:bg-slate-700">
          <RotateCcw aria-hidden className="h-3.5 w-3.5" />
          Restart run
        </button>
        <button
          type="button"
          disabled={engine.eventCount === 0}
          title="The run's events with their cell times: replaying them on this version reproduces the run"
          onClick={async () => {
            const log = await getEventLog();
            const blob = new Blob([JSON.stringify(log, null, 2)], { type: 'application/json' });
            const a = document.createElement('a');
            a.href = URL.createObjectURL(blob);
            a.download = `cell-${cellId}-v${version}-events.json`;
            a.click();
            URL.revokeObjectURL(a.href);
          }}
          className="inline-flex items-center gap-1 rounded px-2 py-1 text-xs font-medium ring-1 ring-slate-600 hover:bg-slate-700 disabled:opacity-40"
        >
          <Download aria-hidden className="h-3.5 w-3.5" />
          Event log ({engine.eventCount})
        </button>
      </div>
      <dl className="flex flex-wrap items-center gap-x-5 gap-y-1 text-xs">
        <Readout label="Cell time" testId="cell-time" mono>
          {formatCellTime(timeMs)}
        </Readout>
        <Readout label="Speed" testId="run-speed">
          {engine.running ? formatSpeed(engine.speed) : 'paused'}
        </Readout>
        <Readout label="Scans" mono>
          {scans}
        </Readout>
        <Readout label="Controller" testId="controller-state">
          {ctrlState ? humanise(ctrlState) : '—'}
          {detail ? ` (${humanise(detail)})` : ''}
          {holdReason ? ` · held by ${holdReason}` : ''}
        </Readout>
        <Readout label="Arm" testId="arm-state">
          {armMoving ? `moving${armTarget ? ` to ${armTarget}` : ''}` : armTarget ? `at ${armTarget}` : 'still'}
        </Readout>
        <Readout label="Engine" testId="engine-status">
          {engine.status}
        </Readout>
      </dl>
    </div>
  );
}

function Readout({ label, children, mono, testId }: { label: string; children: React.ReactNode; mono?: boolean; testId?: string }) {
  return (
    <div className="flex items-baseline gap-1.5">
      <dt className="text-slate-300">{label}</dt>
      <dd className={cn('font-semibold text-white', mono && 'font-mono tabular-nums')} data-testid={testId}>
        {children}
      </dd>
    </div>
  );
}
