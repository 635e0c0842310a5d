'use client';
import { useState } from 'react';
import { AlertTriangle } from 'lucide-react';
import { cn } from '@/components/ui/cn';
import { endpointText } from '@/components/workspace/endpoint-text';
import type { WiringRow } from '@/simulator';
import type { SafetyCarrier } from './safety-points';
import { useForceActions, useMonitor, useMonitorRow } from './use-monitor';

/**
 * What each PLC address is wired to, from the terminal strip, named by the signal labels where
 * they know it (`← Cycle start (start:contact)`, `→ DI1 Start (R0.S1.C0)`), else the bare end.
 */
function wiredTo(wiring: WiringRow[], labels: Record<string, string>): Map<string, string> {
  const map = new Map<string, string>();
  for (const w of wiring) {
    if ('plc' in w.to) map.set(w.to.plc, `← ${labels[w.to.plc] ?? endpointText(w.from)}`);
    if ('plc' in w.from) map.set(w.from.plc, `→ ${labels[w.from.plc] ?? endpointText(w.to)}`);
  }
  return map;
}

type Row = { target: string; kind: 'address' | 'point'; label: string; where: string; value: number; forced: boolean; bit: boolean; carries?: SafetyCarrier };

/** Whether a target is one bit: `%IX0.0`-style addresses and the discrete point families. */
function isBit(target: string): boolean {
  return /^%[IQM]X/i.test(target) || /^(DI|DO|TI|TO)\d/.test(target);
}

/** Every PLC address and controller point with its live value; force and unforce where the workspace allows forcing. */
export function MonitorArea() {
  const { forceAllowed, addresses, points, wiring, labels, carriers } = useMonitor();
  const [filter, setFilter] = useState('');
  const wired = wiredTo(wiring, labels);

  const rows: Row[] = [
    ...Object.entries(addresses).map(([a, v]) => ({ target: a, kind: 'address' as const, label: '', where: `PLC ${wired.get(a) ?? '(not wired)'}`, value: v.value, forced: v.forced, bit: isBit(a), carries: carriers.get(a) })),
    ...points.map((p) => ({
      target: p.ref,
      kind: 'point' as const,
      // The live point map's label; an unlabelled point is named by what is wired to its channel.
      label: p.label ? p.label + (p.invert ? ' (inverted)' : '') : (labels[p.ref] ?? (p.invert ? '(inverted)' : '')),
      where: `rack ${p.rack} · slot ${p.slot} · ch ${p.channel}`,
      value: p.value,
      forced: p.forced,
      bit: isBit(p.ref),
      carries: carriers.get(p.ref),
    })),
  ];
  const q = filter.trim().toLowerCase();
  const shown = q ? rows.filter((r) => `${r.target} ${r.label} ${r.where}`.toLowerCase().includes(q)) : rows;

  return (
    <div className="space-y-3" data-testid="monitor-area">
      {forceAllowed ? <ForceCaution /> : null}
      {forceAllowed ? null : (
        <p role="note" data-testid="force-not-allowed" className="rounded-md border border-slate-300 bg-slate-50 px-3 py-1.5 text-xs text-slate-700">
          Forcing is not allowed in this drill: values can be watched here but not forced.
        </p>
      )}
      <label className="flex max-w-sm items-center gap-2 text-sm">
        <span className="text-slate-700">Filter</span>
        <input value={filter} onChange={(e) => setFilter(e.target.value)} placeholder="%IX0, DI or a device name" className="min-w-0 flex-1 rounded border border-slate-300 px-2 py-1 font-mono text-sm placeholder:text-slate-500" />
      </label>
      <div className="overflow-x-auto rounded-md border border-slate-300 bg-white">
        <table className="w-full text-left text-sm" data-testid="monitor-table">
          <thead className="bg-slate-100 text-xs uppercase tracking-wide text-slate-600">
            <tr>
              <th className="px-2 py-1.5">Point</th>
              <th className="px-2 py-1.5">Label / where</th>
              <th className="px-2 py-1.5">Value</th>
              {forceAllowed ? <th className="px-2 py-1.5">Force</th> : null}
            </tr>
          </thead>
          <tbody>
            {shown.map((r) => (
              <MonitorRow key={`${r.kind}:${r.target}`} row={r} forceAllowed={forceAllowed} />
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}

/**
 * Forcing's own caution (DESIGN.md, Safety): here a force only overrides a simulated value, but on
 * real equipment it is one of the riskiest things a person at a PLC can do.
 */
function ForceCaution() {
  return (
    <p role="note" data-testid="force-caution" className="flex items-start gap-2 rounded-md border border-amber-400 bg-amber-50 px-3 py-2 text-xs text-amber-950">
      <AlertTriangle aria-hidden className="mt-0.5 h-4 w-4 shrink-0 text-amber-800" />
      <span>
        <strong>Forcing.</strong> Here a force overrides a simulated value only. On real equipment a force bypasses the logic and its interlocks, can start
        motion without warning, and needs the site&apos;s authorisation and a plan to remove it; the people near the machine must know. Forcing a point of an
        e-stop chain or a guard asks you first. Local codes, safety-rated design and licensed practice decide what is allowed.
      </span>
    </p>
  );
}

function MonitorRow({ row, forceAllowed }: { row: Row; forceAllowed: boolean }) {
  const { selected, select } = useMonitorRow(row.kind, row.target);
  const on = row.bit && row.value !== 0;
  return (
    <tr
      className={cn('border-t border-slate-200', row.forced && 'bg-amber-50', selected && 'outline outline-2 -outline-offset-2 outline-accent-600')}
      data-testid={`monitor-${row.target}`}
      data-forced={row.forced}
      onClick={select}
    >
      <td className="px-2 py-1.5 font-mono text-xs font-semibold">
        {row.target}
        {row.carries ? (
          <span className="ml-1 rounded border border-red-700 px-1 font-sans text-[10px] font-semibold text-red-800" data-testid={`monitor-${row.target}-carries`}>
            {row.carries}
          </span>
        ) : null}
      </td>
      <td className="px-2 py-1.5 text-xs text-slate-600">
        {row.label ? <span className="text-slate-900">{row.label} · </span> : null}
        {row.where}
      </td>
      <td className="px-2 py-1.5">
        <span className="flex items-center gap-1.5 font-mono text-xs">
          {row.bit ? <span aria-hidden className={cn('inline-block w-5 rounded-full', on ? 'h-1.5 bg-accent-500' : 'h-0.5 bg-slate-300')} /> : null}
          <span className={cn(on ? 'font-bold text-slate-900' : 'text-slate-600')} data-testid={`monitor-${row.target}-value`}>
            {row.bit ? (on ? '1 ON' : '0 off') : row.value}
          </span>
          {row.forced ? <span className="rounded bg-amber-800 px-1 text-[10px] font-bold text-white">FORCED</span> : null}
        </span>
      </td>
      {forceAllowed ? <ForceCell row={row} /> : null}
    </tr>
  );
}

/** The force controls of one row (only rendered where forcing is allowed). A point of an e-stop chain or a guard asks first. */
function ForceCell({ row }: { row: Row }) {
  const { force, unforce } = useForceActions();
  const [word, setWord] = useState('0');
  const [asking, setAsking] = useState<number | null>(null);
  const request = (value: number) => {
    if (row.carries) setAsking(value);
    else force(row.target, value);
  };
  return (
    <td className="px-2 py-1.5" onClick={(e) => e.stopPropagation()}>
      <div className="flex flex-wrap items-center gap-1">
        {row.bit ? (
          <>
            <ForceButton label={`Force ${row.target} to 1`} onClick={() => request(1)}>
              1
            </ForceButton>
            <ForceButton label={`Force ${row.target} to 0`} onClick={() => request(0)}>
              0
            </ForceButton>
          </>
        ) : (
          <>
            <input aria-label={`Force value for ${row.target}`} value={word} onChange={(e) => setWord(e.target.value)} inputMode="numeric" className="w-16 rounded border border-slate-300 px-1 py-0.5 font-mono text-xs" />
            <ForceButton label={`Force ${row.target}`} onClick={() => Number.isFinite(Number(word)) && request(Number(word))}>
              Force
            </ForceButton>
          </>
        )}
        {row.forced ? (
          <button type="button" onClick={() => unforce(row.target)} className="rounded border border-amber-700 bg-white px-2 py-0.5 text-xs font-medium text-amber-900 hover:bg-amber-50" aria-label={`Unforce ${row.target}`}>
            Unforce
          </button>
        ) : null}
      </div>
      {asking !== null && row.carries ? (
        <div role="alertdialog" aria-labelledby={`force-ask-${row.target}`} data-testid="force-confirm" className="mt-1 max-w-xs rounded-md border-2 border-red-700 bg-white p-2 text-xs text-slate-900 shadow">
          <p id={`force-ask-${row.target}`} className="font-semibold text-red-800">
            {row.target} carries the {row.carries}.
          </p>
          <p className="mt-0.5">
            Forcing it to {asking} overrides what the {row.carries === 'guard' ? 'guard switch' : 'e-stop'} reports. On a real machine that would defeat a
            protective measure: never without the site&apos;s authorisation and the machine made safe.
          </p>
          <div className="mt-1.5 flex gap-1">
            <button
              type="button"
              className="rounded border border-red-800 bg-red-700 px-2 py-0.5 font-medium text-white hover:bg-red-800"
              onClick={() => {
                force(row.target, asking);
                setAsking(null);
              }}
            >
              Force {row.target} to {asking}
            </button>
            <button type="button" autoFocus className="rounded border border-slate-300 bg-white px-2 py-0.5 font-medium hover:bg-slate-100" onClick={() => setAsking(null)}>
              Keep it unforced
            </button>
          </div>
        </div>
      ) : null}
    </td>
  );
}

function ForceButton({ label, onClick, children }: { label: string; onClick: () => void; children: React.ReactNode }) {
  return (
    <button type="button" aria-label={label} onClick={onClick} className="rounded border border-slate-300 bg-white px-2 py-0.5 font-mono text-xs hover:bg-slate-100">
      {children}
    </button>
  );
}
