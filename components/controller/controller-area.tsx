'use client';
/**
 * The Controller area: the robot controller's state, alarms and handshake signals; its
 * modules as racks of slot cards with the point map's ranges edited on them (staged until the
 * controller reboots); the routine as step rows; the taught poses; and a 2D view of the arm.
 * Its one hook over the store is use-controller.ts.
 */
import { Power } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { cn } from '@/components/ui/cn';
import { RackView } from './rack-view';
import { RoutineEditor } from './routine-editor';
import { PosesTable } from './poses-table';
import { ArmView } from './arm-view';
import { useController, useControllerStatus } from './use-controller';

const STATE_WORDS: Record<string, string> = {
  off: 'Off',
  booting: 'Booting',
  stopped: 'Stopped — not ready',
  ready: 'Ready',
  cycling: 'Cycling',
  holding: 'Holding',
  faulted: 'Faulted',
  eStopped: 'E-stopped',
};

function Section({ title, children, className, testId }: { title: string; children: React.ReactNode; className?: string; testId?: string }) {
  return (
    <section className={cn('min-w-0 overflow-x-auto rounded-md border border-slate-200 bg-white p-3', className)} aria-label={title} data-testid={testId}>
      <h3 className="mb-2 text-sm font-semibold text-slate-800">{title}</h3>
      {children}
    </section>
  );
}

function Signal({ name, on, point }: { name: string; on: boolean | undefined; point?: string }) {
  return (
    <li
      className={cn('flex items-center gap-1.5 rounded border px-1.5 py-0.5 text-xs', on ? 'border-teal-600 bg-teal-50 font-semibold text-teal-900' : 'border-slate-300 text-slate-600')}
      data-testid={`handshake-${name}`}
      data-on={on ? 'true' : 'false'}
    >
      <span aria-hidden className={cn('inline-block h-2.5 w-2.5 rounded-full', on ? 'bg-teal-500' : 'border border-slate-400')} />
      {name}
      {point ? <span className="font-mono text-[10px] text-slate-500">{point}</span> : null}
      <span className="font-mono">{on === undefined ? '—' : on ? 'ON' : 'off'}</span>
    </li>
  );
}

function ControllerStatus({ handshakeInputs }: { handshakeInputs: Record<string, string | undefined> }) {
  const { canEdit, state, detail, powered, servo, hold, cycles, alarms, outputs, points, power } = useControllerStatus();
  const pointValue = (ref: string | undefined) => (ref ? points?.find((p) => p.ref === ref)?.value : undefined);

  return (
    <div className="space-y-2" data-testid="controller-status">
      <div className="flex flex-wrap items-center gap-3">
        <span className="rounded-md bg-slate-800 px-2 py-1 font-mono text-sm font-semibold text-white" data-testid="controller-state" data-state={state ?? 'loading'}>
          {state ? STATE_WORDS[state] ?? state : 'Loading…'}
          {detail ? ` (${detail})` : ''}
        </span>
        <span className="text-sm text-slate-600">
          power {powered ? 'on' : 'off'} · servo {servo ? 'on' : 'off'}
          {hold ? ` · holding for ${hold === 'guard' ? 'open guard' : 'stop request'}` : ''} · cycles {cycles ?? 0}
        </span>
        <Button variant="secondary" disabled={!canEdit || powered === undefined} onClick={() => power(!powered)} className="ml-auto">
          <Power aria-hidden className="h-4 w-4" /> {powered ? 'Power off' : 'Power on'}
        </Button>
      </div>
      <div className="grid gap-2 md:grid-cols-2">
        <div>
          <p className="mb-1 text-xs font-semibold uppercase tracking-wide text-slate-500">From PLC and cell</p>
          <ul className="flex flex-wrap gap-1">
            {Object.entries(handshakeInputs).map(([role, ref]) => {
              const v = pointValue(ref);
              return <Signal key={role} name={role} point={ref} on={v === undefined ? undefined : v !== 0} />;
            })}
          </ul>
        </div>
        <div>
          <p className="mb-1 text-xs font-semibold uppercase tracking-wide text-slate-500">To PLC</p>
          <ul className="flex flex-wrap gap-1">
            {Object.entries(outputs ?? {}).map(([role, on]) => (
              <Signal key={role} name={role} on={on} />
            ))}
          </ul>
        </div>
      </div>
      <div data-testid="controller-alarms">
        {alarms && alarms.length > 0 ? (
          <ul className="space-y-1">
            {alarms.map((a, i) => (
              <li key={i} role="alert" className="rounded border border-amber-400 bg-amber-50 px-2 py-1 text-sm text-amber-950">
                <span className="font-mono text-xs">{(a.atMs / 1000).toFixed(2)} s · {a.code}</span> — {a.message}
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-xs text-slate-500">No active alarms.</p>
        )}
      </div>
    </div>
  );
}

export default function ControllerArea() {
  const { controller: c, canEdit, live, staged, stagePointMap, discardStaged, restartController, points, setRoutine, setPoses } = useController();
  return (
    <div className="min-w-0 space-y-3" data-testid="controller-area">
      <Section title="Controller">
        <ControllerStatus handshakeInputs={c.handshake.inputs as Record<string, string | undefined>} />
      </Section>
      <Section title="Modules and point map" testId="point-map-section">
        <RackView modules={c.modules} live={live} staged={staged} canEdit={canEdit} onStage={stagePointMap} onDiscard={discardStaged} onReboot={restartController} />
      </Section>
      <div className="grid gap-3 xl:grid-cols-[minmax(0,1fr)_minmax(0,520px)]">
        <Section title="Routine">
          <RoutineEditor steps={c.routine} inputPoints={points.inputs} outputPoints={points.outputs} poses={c.poses.map((p) => p.id)} canEdit={canEdit} onChange={setRoutine} />
        </Section>
        <div className="min-w-0 space-y-3">
          <Section title="Arm">
            <ArmView poses={c.poses} homePose={c.homePose} />
          </Section>
          <Section title="Poses">
            <PosesTable poses={c.poses} axes={c.axes} homePose={c.homePose} canEdit={canEdit} onChange={setPoses} />
          </Section>
        </div>
      </div>
    </div>
  );
}
export { ControllerArea };
