'use client';
import { useState } from 'react';
import { AlertTriangle, Plus, Trash2 } from 'lucide-react';
import { cn } from '@/components/ui/cn';
import type { FieldDevice, Problem, WiringRow } from '@/simulator';
import { StateMark } from '@/components/workspace/state-mark';
import { endpointText, parseEndpoint } from '@/components/workspace/endpoint-text';
import { freshId } from '@/components/workspace/fresh-id';
import { useFieldDevices, useFieldItem, useTerminalStrip, type DeviceSnapshot, type WireSnapshot } from './use-field';

/** Field devices with their live state and what they see, and the terminal strip with live levels. */
export function FieldArea() {
  const { field, states: byId } = useFieldDevices();
  return (
    <div className="space-y-5">
      <section aria-labelledby="field-devices-heading">
        <h2 id="field-devices-heading" className="mb-2 text-sm font-semibold text-slate-800">
          Field devices
        </h2>
        <ul className="grid gap-3 sm:grid-cols-2 xl:grid-cols-3">
          {field.map((d) => (
            <FieldDeviceCard key={d.id} device={d} state={byId.get(d.id)} />
          ))}
        </ul>
      </section>
      <TerminalStrip />
    </div>
  );
}

const SENSES: Partial<Record<FieldDevice['type'], string>> = {
  'guard-switch': 'Guard closed',
  'part-sensor': 'Part present',
  'proximity-sensor': 'Target in front',
  'photo-eye': 'Beam interrupted',
};

function FieldDeviceCard({ device, state }: { device: FieldDevice; state: DeviceSnapshot | undefined }) {
  const { send, select, selected } = useFieldItem('device', device.id);
  const sense = SENSES[device.type];
  const kind = 'output' in device ? `${device.type} · ${device.output}` : 'contact' in device ? `${device.type} · ${device.contact}` : device.type;
  return (
    <li
      className={cn('rounded-md border border-slate-300 bg-white p-3 text-sm', selected && 'ring-2 ring-accent-600')}
      data-testid={`field-${device.id}`}
      onClick={select}
    >
      <div className="flex items-start justify-between gap-2">
        <div>
          <p className="font-semibold text-slate-900">{device.label}</p>
          <p className="font-mono text-xs text-slate-500">
            {device.id} · {kind}
          </p>
        </div>
        {state?.led !== undefined ? (
          <span className="flex items-center gap-1.5" data-testid={`field-${device.id}-led`} data-on={state.led}>
            <span aria-hidden className={cn('h-3 w-3 rounded-full', state.led ? 'bg-amber-300 ring-2 ring-amber-500 shadow-[0_0_8px_2px_rgba(252,211,77,0.8)]' : 'bg-slate-300')} />
            <StateMark on={state.led} onText="LED on" offText="LED off" />
          </span>
        ) : null}
      </div>
      {sense ? (
        <label className="mt-2 flex items-center gap-2">
          <input
            type="checkbox"
            checked={Boolean(state?.active)}
            onChange={(e) => send({ type: 'set-field', device: device.id, active: e.target.checked })}
            className="h-4 w-4 accent-accent-700"
            data-testid={`field-${device.id}-sense`}
          />
          <span>{sense}</span>
        </label>
      ) : null}
      {state?.travel !== undefined ? (
        <div className="mt-2 space-y-1">
          <div className="flex justify-between text-xs text-slate-600">
            <span>
              Command: <StateMark on={Boolean(state.command)} onText="ON" offText="off" />
            </span>
            <span className="font-mono">travel {Math.round(state.travel * 100)} %</span>
          </div>
          <div className="h-2 overflow-hidden rounded bg-slate-200" role="meter" aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(state.travel * 100)} aria-label={`${device.label} travel`}>
            <div className="h-full bg-accent-600" style={{ width: `${state.travel * 100}%` }} />
          </div>
        </div>
      ) : null}
      {state?.feedback ? (
        <ul className="mt-2 flex flex-wrap gap-2 text-xs">
          {Object.entries(state.feedback).map(([terminal, closed]) => (
            <li key={terminal} className={cn('rounded px-1.5 py-0.5 font-mono', closed ? 'bg-slate-800 font-bold text-white' : 'bg-slate-100 text-slate-700')}>
              {terminal}: {closed ? 'closed' : 'open'}
            </li>
          ))}
        </ul>
      ) : null}
    </li>
  );
}

/** Problems of the document grouped by wiring row index (paths like ['wiring', 3, 'to']). */
function problemsByRow(problems: Problem[]): Map<number, Problem[]> {
  const map = new Map<number, Problem[]>();
  for (const p of problems) {
    if (p.path[0] === 'wiring' && typeof p.path[1] === 'number') map.set(p.path[1], [...(map.get(p.path[1]) ?? []), p]);
  }
  return map;
}

function TerminalStrip() {
  const { wiring, canEdit, live: byId, edit, problems } = useTerminalStrip();
  const rowProblems = problemsByRow(problems);
  const other = problems.filter((p) => !(p.path[0] === 'wiring' && typeof p.path[1] === 'number'));

  const add = () =>
    edit((doc) => {
      doc.wiring.push({ id: freshId('w-new', doc.wiring.map((w) => w.id)), from: { device: doc.panel[0]?.id ?? 'device', terminal: 'contact' }, to: { plc: '%IX0.7' } });
    }, 'Add wiring row');

  return (
    <section aria-labelledby="terminal-strip-heading">
      <div className="mb-2 flex items-center justify-between">
        <h2 id="terminal-strip-heading" className="text-sm font-semibold text-slate-800">
          Terminal strip
        </h2>
        {canEdit ? (
          <button type="button" onClick={add} className="inline-flex items-center gap-1 rounded border border-slate-300 bg-white px-2 py-1 text-xs hover:bg-slate-100">
            <Plus aria-hidden className="h-3.5 w-3.5" /> Add row
          </button>
        ) : null}
      </div>
      {other.length > 0 ? (
        <ul className="mb-2 space-y-1 rounded border border-amber-300 bg-amber-50 p-2 text-xs text-amber-900" aria-label="Other problems of the cell">
          {other.map((p, i) => (
            <li key={i}>
              <span className="font-mono">{p.path.join('.')}</span>: {p.message}
            </li>
          ))}
        </ul>
      ) : null}
      <div className="overflow-x-auto rounded-md border border-slate-300 bg-white">
        <table className="w-full text-left text-sm" data-testid="terminal-strip">
          <thead className="bg-slate-100 text-xs uppercase tracking-wide text-slate-600">
            <tr>
              <th className="px-2 py-1.5">Row</th>
              <th className="px-2 py-1.5">From</th>
              <th className="px-2 py-1.5">To</th>
              <th className="px-2 py-1.5">Level</th>
              <th className="px-2 py-1.5">Reading</th>
              <th className="px-2 py-1.5">Notes</th>
              {canEdit ? <th className="px-2 py-1.5"><span className="sr-only">Actions</span></th> : null}
            </tr>
          </thead>
          <tbody>
            {wiring.map((row, i) => (
              <WireRow key={row.id} row={row} index={i} live={byId.get(row.id)} problems={rowProblems.get(i) ?? []} canEdit={canEdit} />
            ))}
          </tbody>
        </table>
      </div>
      <p className="mt-1 text-xs text-slate-500">
        Endpoints: <span className="font-mono">device:terminal</span>, a PLC address such as <span className="font-mono">%IX0.0</span>, or a controller channel{' '}
        <span className="font-mono">R0.S1.C4</span> (rack, slot, channel from 0).
      </p>
    </section>
  );
}

function WireRow({ row, index, live, problems, canEdit }: { row: WiringRow; index: number; live: WireSnapshot | undefined; problems: Problem[]; canEdit: boolean }) {
  const { edit, select, selected } = useFieldItem('wire', row.id);
  const on = live?.reading === 'on';
  const setEnd = (end: 'from' | 'to', text: string) => {
    const parsed = parseEndpoint(text);
    if (!parsed) return false;
    edit((doc) => {
      doc.wiring[index][end] = parsed;
    }, `Rewire ${row.id}`);
    return true;
  };
  return (
    <tr
      className={cn('border-t border-slate-200 align-top', problems.length > 0 && 'bg-red-50', selected && 'outline outline-2 -outline-offset-2 outline-accent-600')}
      data-testid={`wire-${row.id}`}
      data-reading={live?.reading ?? 'none'}
      onClick={select}
    >
      <td className="px-2 py-1.5 font-mono text-xs">
        {row.id}
        {live?.isLink ? <span className="ml-1 rounded bg-slate-200 px-1 text-[10px]">link</span> : null}
      </td>
      <td className="px-2 py-1.5">
        <EndpointCell value={endpointText(row.from)} label={`${row.id} from`} canEdit={canEdit} onCommit={(t) => setEnd('from', t)} />
      </td>
      <td className="px-2 py-1.5">
        <EndpointCell value={endpointText(row.to)} label={`${row.id} to`} canEdit={canEdit} onCommit={(t) => setEnd('to', t)} />
      </td>
      <td className="px-2 py-1.5 font-mono text-xs tabular-nums">{live ? `${live.unit === 'word' ? live.level : live.level.toFixed(live.unit === 'mA' ? 2 : 1)} ${live.unit === 'word' ? '' : live.unit}` : '—'}</td>
      <td className="px-2 py-1.5">
        {live ? (
          <span className="flex items-center gap-1.5">
            {/* A live ON row: a thick bright bar plus the word, never colour alone. */}
            <span aria-hidden className={cn('inline-block w-6 rounded-full', on ? 'h-1.5 bg-accent-500' : live.reading === 'undefined' ? 'h-0.5 border-t-2 border-dashed border-amber-500' : 'h-0.5 bg-slate-300')} />
            <span className={cn('text-xs', on ? 'font-bold text-slate-900' : live.reading === 'undefined' ? 'font-semibold text-amber-800' : 'text-slate-500')}>{live.reading}</span>
            {live.loop ? <span className="text-xs text-slate-500">({live.loop})</span> : null}
          </span>
        ) : (
          <span className="text-xs text-slate-400">—</span>
        )}
      </td>
      <td className="px-2 py-1.5 text-xs">
        {problems.map((p, i) => (
          <p key={i} className="flex items-start gap-1 text-red-800" data-testid={`wire-${row.id}-problem`}>
            <AlertTriangle aria-hidden className="mt-0.5 h-3.5 w-3.5 shrink-0" />
            {p.message}
          </p>
        ))}
        {live?.faults.length ? <p className="text-amber-800">faults: {live.faults.join(', ')}</p> : null}
      </td>
      {canEdit ? (
        <td className="px-2 py-1.5">
          <button
            type="button"
            aria-label={`Remove row ${row.id}`}
            onClick={(e) => {
              e.stopPropagation();
              edit((doc) => {
                doc.wiring.splice(index, 1);
              }, `Remove ${row.id}`);
            }}
            className="rounded p-1 text-slate-500 hover:bg-red-50 hover:text-red-700"
          >
            <Trash2 aria-hidden className="h-4 w-4" />
          </button>
        </td>
      ) : null}
    </tr>
  );
}

function EndpointCell({ value, label, canEdit, onCommit }: { value: string; label: string; canEdit: boolean; onCommit: (text: string) => boolean }) {
  const [text, setText] = useState(value);
  const [bad, setBad] = useState(false);
  const [prev, setPrev] = useState(value);
  if (prev !== value) {
    // The document changed under us (undo, reload): show the new value.
    setPrev(value);
    setText(value);
    setBad(false);
  }
  if (!canEdit) return <span className="font-mono text-xs">{value}</span>;
  return (
    <>
      <input
        aria-label={label}
        aria-invalid={bad}
        value={text}
        onChange={(e) => setText(e.target.value)}
        onBlur={() => {
          if (text === value) return;
          setBad(!onCommit(text));
        }}
        onKeyDown={(e) => e.key === 'Enter' && (e.target as HTMLInputElement).blur()}
        className={cn('w-36 rounded border px-1.5 py-0.5 font-mono text-xs', bad ? 'border-red-500' : 'border-slate-300')}
      />
      {bad ? <p className="text-[11px] text-red-700">Not an endpoint form.</p> : null}
    </>
  );
}
