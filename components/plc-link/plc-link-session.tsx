'use client';

import { useEffect, useRef, useState } from 'react';
import { Download, Square } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { ApiClientError, fetchJson } from '@/lib/api/client';
import type { RegisterMapRow } from '@/lib/plc-link/register-map';
import type { PlcLinkView } from '@/lib/plc-link/sessions';
import type { CellSnapshot } from '@/simulator';

/** The drill attempt's rate (components/runs/remote-engine.ts polls every 100 ms); the worker reports as often. */
const POLL_MS = 100;

const TABLE_NAMES: Record<RegisterMapRow['table'], string> = {
  coil: 'Coil',
  'discrete-input': 'Discrete input',
  'holding-register': 'Holding register',
  'input-register': 'Input register',
};

function linkText(v: PlcLinkView): { text: string; tone: 'ok' | 'lost' | 'idle' } {
  if (v.status !== 'running') return { text: v.status === 'failed' ? 'Failed' : 'Stopped', tone: 'idle' };
  if (v.health?.lost) return { text: 'Link lost', tone: 'lost' };
  if (v.health?.linked) return { text: 'Linked', tone: 'ok' };
  return { text: 'Waiting for the PLC', tone: 'idle' };
}

const ms = (n: number | null | undefined) => (n === null || n === undefined ? '—' : n >= 10_000 ? `${(n / 1000).toFixed(1)} s` : `${n} ms`);

/** A PLC-link session, read-only and following live: link health, the register map with live values, the cell. */
export function PlcLinkSession({ initial, map }: { initial: PlcLinkView; map: RegisterMapRow[] }) {
  const [view, setView] = useState(initial);
  const [error, setError] = useState<string | null>(null);
  const [stopping, setStopping] = useState(false);
  const running = view.status === 'running' || view.status === 'starting';
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);

  useEffect(() => {
    if (!running) return;
    let cancelled = false;
    const poll = async () => {
      try {
        const r = await fetchJson<{ session: PlcLinkView }>(`/api/plc-links/${initial.id}`);
        if (cancelled) return;
        setView(r.session);
        setError(null);
      } catch (err) {
        if (cancelled) return;
        setError(err instanceof ApiClientError && err.status === 404 ? 'This session is no longer on the server.' : 'The server did not answer; retrying.');
      }
      if (!cancelled) timer.current = setTimeout(poll, POLL_MS);
    };
    timer.current = setTimeout(poll, POLL_MS);
    return () => {
      cancelled = true;
      if (timer.current) clearTimeout(timer.current);
    };
  }, [initial.id, running]);

  async function stop() {
    setStopping(true);
    try {
      const r = await fetchJson<{ session: PlcLinkView }>(`/api/plc-links/${initial.id}`, { method: 'DELETE' });
      setView(r.session);
    } catch {
      setError('The session could not be stopped; try again.');
    } finally {
      setStopping(false);
    }
  }

  const link = linkText(view);
  const snap: CellSnapshot | null = view.snapshot;
  const h = view.health;
  return (
    <div className="grid gap-4">
      {error ? <Notice tone="error">{error}</Notice> : null}
      <Card
        title="Link"
        actions={
          <div className="flex gap-2">
            <a
              href={`/api/plc-links/${view.id}/register-map`}
              className="inline-flex items-center gap-2 rounded-md border border-slate-300 bg-white px-3 py-2 text-sm font-medium text-slate-800 hover:bg-slate-100"
            >
              <Download aria-hidden className="h-4 w-4" /> Register map (CSV)
            </a>
            {running ? (
              <Button variant="danger" onClick={stop} disabled={stopping}>
                <Square aria-hidden className="h-4 w-4" /> {stopping ? 'Stopping…' : 'Stop'}
              </Button>
            ) : null}
          </div>
        }
      >
        <p
          data-testid="plc-link-state"
          role="status"
          className={
            link.tone === 'lost'
              ? 'mb-3 inline-block rounded-md border-2 border-red-500 bg-red-50 px-3 py-1 text-sm font-semibold text-red-800'
              : link.tone === 'ok'
                ? 'mb-3 inline-block rounded-md border-2 border-accent-600 bg-accent-50 px-3 py-1 text-sm font-semibold text-accent-900'
                : 'mb-3 inline-block rounded-md border border-slate-300 bg-slate-50 px-3 py-1 text-sm font-semibold text-slate-700'
          }
        >
          {link.text}
        </p>
        {link.tone === 'lost' ? (
          <p className="mb-3 text-sm text-red-800">The PLC has been silent longer than the timeout: every coil and holding register is off until it writes again.</p>
        ) : null}
        {view.stopReason ? (
          <p className="mb-3 text-sm text-slate-700">
            Session {view.stopReason}.{' '}
            {view.runId ? (
              <a className="text-accent-800 underline" href={`/runs/${view.runId}/replay`}>
                Replay the PLC&apos;s run
              </a>
            ) : null}
          </p>
        ) : null}
        <dl className="grid grid-cols-2 gap-x-6 gap-y-2 text-sm sm:grid-cols-3 lg:grid-cols-6">
          <div>
            <dt className="text-slate-500">Server</dt>
            <dd className="font-mono">
              {view.host}:{view.port}
            </dd>
          </div>
          <div>
            <dt className="text-slate-500">Last request</dt>
            <dd className="font-mono" data-testid="plc-link-last-request">
              {h?.lastRequestAgeMs === null || !h ? 'none yet' : `${ms(h.lastRequestAgeMs)} ago`}
            </dd>
          </div>
          <div>
            <dt className="text-slate-500">Requests per second</dt>
            <dd className="font-mono">{h ? h.requestsPerSecond : '—'}</dd>
          </div>
          <div>
            <dt className="text-slate-500">PLC update period</dt>
            <dd className="font-mono">{ms(h?.updatePeriodMs)}</dd>
          </div>
          <div>
            <dt className="text-slate-500">Link-loss timeout</dt>
            <dd className="font-mono">{ms(view.linkTimeoutMs)}</dd>
          </div>
          <div>
            <dt className="text-slate-500">Cell time</dt>
            <dd className="font-mono" data-testid="plc-link-cell-time">
              {(view.timeMs / 1000).toFixed(1)} s
            </dd>
          </div>
        </dl>
      </Card>

      {snap ? (
        <Card title="Robot controller">
          <p className="mb-2 text-sm">
            State <span className="font-mono font-semibold" data-testid="plc-link-controller-state">{snap.controller.state}</span> · cycles{' '}
            <span className="font-mono">{snap.controller.cyclesCompleted}</span>
          </p>
          <ul className="flex flex-wrap gap-2 text-sm" aria-label="Handshake outputs">
            {Object.entries(snap.controller.handshake).map(([role, on]) => (
              <li key={role} className={on ? 'rounded border-2 border-accent-600 px-2 py-0.5 font-semibold' : 'rounded border border-slate-300 px-2 py-0.5 text-slate-500'}>
                {role} {on ? 'ON' : 'off'}
              </li>
            ))}
          </ul>
        </Card>
      ) : null}

      {snap ? (
        <Card title="Panel and field devices">
          <ul className="grid gap-1 text-sm sm:grid-cols-2">
            {snap.devices.map((d) => (
              <li key={d.id} className="flex justify-between gap-3 border-b border-slate-100 py-1">
                <span>{d.label}</span>
                <span className="font-mono text-slate-700">{deviceState(d)}</span>
              </li>
            ))}
          </ul>
        </Card>
      ) : null}

      <Card title="Register map">
        <p className="mb-2 text-xs text-slate-600">
          Offsets count from 0 (the address in the request); tools that number registers from 1 show offset + 1. The PLC writes coils and holding registers and reads discrete inputs and input registers.
        </p>
        <div className="relative overflow-x-auto">
          <table className="min-w-full text-sm" data-testid="plc-link-register-map">
            <thead>
              <tr className="text-left text-slate-500">
                <th className="py-1 pr-4 font-medium">Table</th>
                <th className="py-1 pr-4 font-medium">Offset</th>
                <th className="py-1 pr-4 font-medium">Address</th>
                <th className="py-1 pr-4 font-medium">Label</th>
                <th className="py-1 pr-4 font-medium">Direction</th>
                <th className="py-1 pr-4 font-medium">Value</th>
              </tr>
            </thead>
            <tbody>
              {map.map((r) => {
                const value = snap?.plc.addresses[r.address]?.value;
                const bit = r.table === 'coil' || r.table === 'discrete-input';
                return (
                  <tr key={`${r.table}:${r.offset}`} className="border-t border-slate-100">
                    <td className="py-1 pr-4">{TABLE_NAMES[r.table]}</td>
                    <td className="py-1 pr-4 font-mono">{r.offset}</td>
                    <td className="py-1 pr-4 font-mono">{r.address}</td>
                    <td className="py-1 pr-4">{r.label}</td>
                    <td className="py-1 pr-4">{r.direction === 'plc-writes' ? 'PLC writes' : 'PLC reads'}</td>
                    <td className={bit && value ? 'py-1 pr-4 font-mono font-bold' : 'py-1 pr-4 font-mono text-slate-600'}>
                      {value === undefined ? '—' : bit ? (value ? 'ON' : 'off') : value}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      </Card>
    </div>
  );
}

function deviceState(d: CellSnapshot['devices'][number]): string {
  const parts: string[] = [];
  if (d.pressed !== undefined) parts.push(d.pressed ? 'pressed' : 'released');
  if (d.latched) parts.push('latched');
  if (d.position !== undefined) parts.push(`position ${d.position}`);
  if (d.value !== undefined) parts.push(`value ${d.value}`);
  if (d.active !== undefined) parts.push(d.active ? 'active' : 'inactive');
  if (d.lamps) parts.push(d.lamps.map((on) => (on ? 'ON' : 'off')).join(' '));
  if (d.command !== undefined) parts.push(d.command ? 'commanded' : 'idle');
  return parts.join(', ') || '—';
}
