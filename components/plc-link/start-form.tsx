'use client';

import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { ApiClientError, fetchJson } from '@/lib/api/client';
import { PLC_LINK_LIMITS } from '@/lib/plc-link/schemas';

interface Props {
  cells: { id: string; name: string }[];
  iface: string;
}

/** Starts a PLC-link session: the cell, the Modbus TCP port and the link-loss timeout. */
export function PlcLinkStartForm({ cells, iface }: Props) {
  const router = useRouter();
  const [cellId, setCellId] = useState(cells[0]?.id ?? '');
  const [port, setPort] = useState<number>(PLC_LINK_LIMITS.defaultPort);
  const [timeoutMs, setTimeoutMs] = useState<number>(PLC_LINK_LIMITS.defaultTimeoutMs);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function start(e: React.FormEvent) {
    e.preventDefault();
    setBusy(true);
    setError(null);
    try {
      const r = await fetchJson<{ session: { id: string } }>('/api/plc-links', { method: 'POST', body: { cellId, port, linkTimeoutMs: timeoutMs } });
      router.push(`/plc-link/${r.session.id}`);
    } catch (err) {
      setError(err instanceof ApiClientError ? err.message : 'The PLC link could not start.');
      setBusy(false);
    }
  }

  if (cells.length === 0) return <Notice>You have no cells yet: create one under Cells first.</Notice>;
  return (
    <form onSubmit={start} className="grid max-w-xl gap-4" aria-label="Start a PLC link">
      <label className="grid gap-1 text-sm font-medium text-slate-800">
        Cell
        <select value={cellId} onChange={(e) => setCellId(e.target.value)} className="rounded-md border border-slate-300 px-3 py-2 font-normal">
          {cells.map((c) => (
            <option key={c.id} value={c.id}>
              {c.name}
            </option>
          ))}
        </select>
      </label>
      <label className="grid gap-1 text-sm font-medium text-slate-800">
        Modbus TCP port
        <input
          type="number"
          min={PLC_LINK_LIMITS.minPort}
          max={PLC_LINK_LIMITS.maxPort}
          value={port}
          onChange={(e) => setPort(Number(e.target.value))}
          className="rounded-md border border-slate-300 px-3 py-2 font-mono font-normal"
        />
        <span className="text-xs font-normal text-slate-600">
          On <span className="font-mono">{iface}</span> (set by the server). 502 needs root; pick {PLC_LINK_LIMITS.minPort}–{PLC_LINK_LIMITS.maxPort} and
          point the PLC&apos;s Modbus client at it.
        </span>
      </label>
      <label className="grid gap-1 text-sm font-medium text-slate-800">
        Link-loss timeout (ms)
        <input
          type="number"
          min={PLC_LINK_LIMITS.minTimeoutMs}
          max={PLC_LINK_LIMITS.maxTimeoutMs}
          value={timeoutMs}
          onChange={(e) => setTimeoutMs(Number(e.target.value))}
          className="rounded-md border border-slate-300 px-3 py-2 font-mono font-normal"
        />
        <span className="text-xs font-normal text-slate-600">A PLC silent this long counts as a lost link: every coil drops to off.</span>
      </label>
      {error ? <Notice tone="error">{error}</Notice> : null}
      <div>
        <Button type="submit" disabled={busy || !cellId}>
          {busy ? 'Starting…' : 'Start PLC link'}
        </Button>
      </div>
    </form>
  );
}
