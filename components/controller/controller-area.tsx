'use client';
/**
 * The Controller area: the robot controller's state, alarms and handshake signals; its
 * modules in racks and slots; the point map with staged edits and the restart that applies
 * them; the routine as step rows; the taught poses; and a 2D view of the arm.
 */
import { useCallback, useMemo } from 'react';
import { Power } from 'lucide-react';
import { parsePointRef, resolvePointMap, type CellDocument, type PointMapRow, type RoutineStep } from '@/simulator';
import { useCanEdit, useCellDocument, useEditDocument, useSendEvent, useSnapshot, shallowEqual } from '@/components/workspace/contract';
import { Button } from '@/components/ui/button';
import { cn } from '@/components/ui/cn';
import { RackView } from './rack-view';
import { PointMapTable } from './point-map-table';
import { rowConflicts } from './point-map-state';
import { RoutineEditor } from './routine-editor';
import { PosesTable } from './poses-table';
import { ArmView } from './arm-view';

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
    <section className={cn('rounded-md border border-slate-200 bg-white p-3', className)} aria-label={title} data-testid={testId}>
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
  const send = useSendEvent();
  const canEdit = useCanEdit();
  const state = useSnapshot((s) => s.controller.state);
  const detail = useSnapshot((s) => s.controller.detail);
  const powered = useSnapshot((s) => s.controller.powered);
  const servo = useSnapshot((s) => s.controller.servoOn);
  const hold = useSnapshot((s) => s.controller.holdReason);
  const cycles = useSnapshot((s) => s.controller.cyclesCompleted);
  const alarms = useSnapshot((s) => s.controller.alarms, shallowEqual);
  const outputs = useSnapshot((s) => s.controller.handshake, shallowEqual);
  const points = useSnapshot((s) => s.controller.points, shallowEqual);
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
        <Button variant="secondary" disabled={!canEdit || powered === undefined} onClick={() => send({ type: 'power-controller', on: !powered })} className="ml-auto">
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
  const doc = useCellDocument();
  const editDocument = useEditDocument();
  const send = useSendEvent();
  const canEdit = useCanEdit();
  const c = doc.controller;
  // What runs now comes from the engine; before the first snapshot, the document's live map.
  const runningMap = useSnapshot((s) => s.controller.pointMap);
  const live = runningMap ?? c.pointMap;
  const staged = c.staged;

  const stage = useCallback(
    (rows: PointMapRow[], label: string) => {
      const unchanged = JSON.stringify(rows) === JSON.stringify(live);
      // The run keeps its map: the engine only records the staged rows, and the document keeps them for saving.
      editDocument(
        (d) => {
          d.controller.staged = unchanged ? null : rows;
        },
        label,
        { engine: 'keep' },
      );
      if (unchanged) send({ type: 'discard-staged' });
      else if (rowConflicts(rows, c.modules).size === 0) send({ type: 'stage-point-map', rows });
    },
    [editDocument, send, live, c.modules],
  );

  const discard = useCallback(() => {
    editDocument(
      (d) => {
        d.controller.staged = null;
      },
      'Discard staged point-map rows',
      { engine: 'keep' },
    );
    send({ type: 'discard-staged' });
  }, [editDocument, send]);

  const restart = useCallback(() => {
    if (staged) {
      // Re-send the staged rows first so the engine applies exactly what the table shows.
      send({ type: 'stage-point-map', rows: staged });
      send({ type: 'restart-controller' });
      editDocument(
        (d) => {
          if (d.controller.staged) d.controller.pointMap = d.controller.staged;
          d.controller.staged = null;
        },
        'Restart controller: apply staged point map',
        { engine: 'keep' },
      );
    } else {
      send({ type: 'restart-controller' });
    }
  }, [staged, send, editDocument]);

  const points = useMemo(() => {
    const refs = [...resolvePointMap(live).byRef.keys()];
    const isInput = (r: string) => {
      const p = parsePointRef(r);
      return p ? p.input : false;
    };
    return { inputs: refs.filter(isInput), outputs: refs.filter((r) => !isInput(r)) };
  }, [live]);

  const setRoutine = useCallback(
    (routine: RoutineStep[], label: string) =>
      editDocument((d) => {
        d.controller.routine = routine;
      }, label),
    [editDocument],
  );
  const setPoses = useCallback(
    (poses: CellDocument['controller']['poses'], label: string) =>
      editDocument((d) => {
        d.controller.poses = poses;
      }, label),
    [editDocument],
  );

  return (
    <div className="space-y-3" data-testid="controller-area">
      <Section title="Controller">
        <ControllerStatus handshakeInputs={c.handshake.inputs as Record<string, string | undefined>} />
      </Section>
      <div className="grid gap-3 xl:grid-cols-[minmax(0,1fr)_minmax(0,520px)]">
        <Section title="Modules">
          <RackView modules={c.modules} rows={live} />
        </Section>
        <Section title="Arm">
          <ArmView poses={c.poses} homePose={c.homePose} />
        </Section>
      </div>
      <Section title="Point map" testId="point-map-section">
        <PointMapTable live={live} staged={staged} modules={c.modules} canEdit={canEdit} onStage={stage} onDiscard={discard} onRestart={restart} />
      </Section>
      <div className="grid gap-3 xl:grid-cols-[minmax(0,1fr)_minmax(0,520px)]">
        <Section title="Routine">
          <RoutineEditor steps={c.routine} inputPoints={points.inputs} outputPoints={points.outputs} poses={c.poses.map((p) => p.id)} canEdit={canEdit} onChange={setRoutine} />
        </Section>
        <Section title="Poses">
          <PosesTable poses={c.poses} axes={c.axes} homePose={c.homePose} canEdit={canEdit} onChange={setPoses} />
        </Section>
      </div>
    </div>
  );
}
export { ControllerArea };
