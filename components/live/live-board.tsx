'use client';
import { useCallback, useEffect, useState } from 'react';
import Link from 'next/link';
import { Activity, Hand, OctagonAlert, Send } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { fetchJson } from '@/lib/api/client';
import type { Board, BoardMessage, BoardTile, NotableEvent } from '@/lib/live/types';
import { useLiveStream } from './use-live-stream';

/** mm:ss of a duration in ms (negative shows 0:00). */
function clock(ms: number): string {
  const s = Math.max(0, Math.floor(ms / 1000));
  return `${Math.floor(s / 60)}:${String(s % 60).padStart(2, '0')}`;
}

const STATUS_TEXT: Record<BoardTile['status'], string> = { 'not-started': 'Not started', running: 'Running', submitted: 'Submitted' };

function useNow(): number {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    const t = setInterval(() => setNow(Date.now()), 1000);
    return () => clearInterval(t);
  }, []);
  return now;
}

function Tile({ tile, now }: { tile: BoardTile; now: number }) {
  const left = tile.deadline && tile.status === 'running' ? Date.parse(tile.deadline) - now : null;
  const forces = Object.entries(tile.forces);
  const body = (
    <>
      <div className="flex items-center justify-between gap-2">
        <span className="truncate font-medium text-slate-900">{tile.name}</span>
        <span
          data-testid="tile-status"
          className={`rounded px-1.5 py-0.5 text-xs ${tile.status === 'running' ? 'bg-accent-50 text-accent-800' : tile.status === 'submitted' ? 'bg-slate-200 text-slate-800' : 'bg-slate-100 text-slate-700'}`}
        >
          {STATUS_TEXT[tile.status]}
        </span>
      </div>
      {tile.status === 'not-started' ? null : (
        <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-2 gap-y-0.5 text-xs">
          <dt className="text-slate-500">Cell time</dt>
          <dd className="font-mono">{clock(tile.untilMs)}</dd>
          {left !== null ? (
            <>
              <dt className="text-slate-500">Time left</dt>
              <dd className={`font-mono ${left < 120_000 ? 'font-semibold text-amber-800' : ''}`}>{clock(left)}</dd>
            </>
          ) : null}
          {tile.grade !== null ? (
            <>
              <dt className="text-slate-500">Grade</dt>
              <dd className="font-mono">{tile.grade}</dd>
            </>
          ) : null}
          <dt className="text-slate-500">Controller</dt>
          <dd className="font-mono">{tile.cell ? `${tile.cell.controller}${tile.cell.detail ? ` (${tile.cell.detail})` : ''}` : '—'}</dd>
          <dt className="text-slate-500">Arm</dt>
          <dd className="font-mono">{tile.cell ? (tile.cell.arm.moving ? `moving → ${tile.cell.arm.target ?? '?'}` : 'still') : '—'}</dd>
        </dl>
      )}
      {tile.cell ? (
        <ul className="mt-2 flex flex-wrap gap-1" aria-label="Handshake points">
          {Object.entries(tile.cell.handshake).map(([k, on]) => (
            <li key={k} className={`rounded border px-1 font-mono text-[10px] ${on ? 'border-slate-700 bg-slate-800 font-semibold text-white' : 'border-slate-200 text-slate-500'}`}>
              {k} {on ? 'ON' : 'off'}
            </li>
          ))}
        </ul>
      ) : null}
      {tile.estopPressed.length ? (
        <p className="mt-2 flex items-center gap-1 text-xs font-semibold text-red-700">
          <OctagonAlert className="h-3.5 w-3.5" aria-hidden /> E-stop in: {tile.estopPressed.join(', ')}
        </p>
      ) : null}
      {forces.length ? (
        <p className="mt-1 flex items-center gap-1 text-xs text-amber-800">
          <Hand className="h-3.5 w-3.5" aria-hidden /> Forced: <span className="font-mono">{forces.map(([k, v]) => `${k}=${v}`).join(', ')}</span>
        </p>
      ) : null}
      {tile.status !== 'not-started' ? (
        <ul className="mt-2 space-y-0.5 text-xs" aria-label="Hidden faults">
          {tile.faults.map((f) => (
            <li key={f.id} className={f.found ? 'text-slate-900' : 'text-slate-500'}>
              {f.found ? '✓ found' : '· not found'} — {f.label}
            </li>
          ))}
        </ul>
      ) : null}
      {tile.lastEvent ? <p className="mt-2 truncate text-xs text-slate-500">Last: {tile.lastEvent}</p> : null}
    </>
  );
  const cls = 'block rounded-md border border-slate-200 bg-white p-3 text-sm shadow-sm';
  return tile.runId ? (
    <Link href={`/runs/${tile.runId}/replay`} className={`${cls} hover:border-accent-600 focus-visible:outline-accent-700`} data-testid="live-tile" aria-label={`${tile.name}: ${STATUS_TEXT[tile.status]}, open the run read-only`}>
      {body}
    </Link>
  ) : (
    <div className={cls} data-testid="live-tile">
      {body}
    </div>
  );
}

function MessageForm({ assignmentId, tiles, onSent }: { assignmentId: string; tiles: BoardTile[]; onSent: (m: BoardMessage) => void }) {
  const [to, setTo] = useState('');
  const [kind, setKind] = useState<'hint' | 'message'>('hint');
  const [body, setBody] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [sending, setSending] = useState(false);
  const send = async (e: React.FormEvent) => {
    e.preventDefault();
    setSending(true);
    setError(null);
    try {
      const { message } = await fetchJson<{ message: BoardMessage }>(`/api/assignments/${assignmentId}/messages`, { method: 'POST', body: { kind, body, to: to || null } });
      onSent(message);
      setBody('');
    } catch (err) {
      setError(err instanceof Error ? err.message : 'Not sent.');
    } finally {
      setSending(false);
    }
  };
  return (
    <form onSubmit={send} className="space-y-2" aria-label="Send a hint or message">
      <div className="flex flex-wrap gap-2">
        <label className="text-sm">
          <span className="sr-only">To</span>
          <select value={to} onChange={(e) => setTo(e.target.value)} className="rounded-md border border-slate-300 px-2 py-1.5 text-sm" aria-label="To">
            <option value="">Everyone</option>
            {tiles.map((t) => (
              <option key={t.studentId} value={t.studentId}>
                {t.name}
              </option>
            ))}
          </select>
        </label>
        <select value={kind} onChange={(e) => setKind(e.target.value as 'hint' | 'message')} className="rounded-md border border-slate-300 px-2 py-1.5 text-sm" aria-label="Kind">
          <option value="hint">Hint</option>
          <option value="message">Message</option>
        </select>
      </div>
      <textarea value={body} onChange={(e) => setBody(e.target.value)} maxLength={2000} rows={2} aria-label="Message" className="w-full rounded-md border border-slate-300 px-2 py-1.5 text-sm" />
      {error ? <p className="text-sm text-red-700" role="alert">{error}</p> : null}
      <Button type="submit" disabled={sending || !body.trim()}>
        <Send className="h-4 w-4" aria-hidden /> Send
      </Button>
    </form>
  );
}

/** The trainer's live board: tiles, the drill-wide timeline, and messages, kept current by the board's stream. */
export function LiveBoard({ initial }: { initial: Board }) {
  const [board, setBoard] = useState<Board>(initial);
  const now = useNow();
  const addMessage = useCallback((m: BoardMessage) => setBoard((b) => (b.messages.some((x) => x.id === m.id) ? b : { ...b, messages: [...b.messages, m] })), []);
  const connection = useLiveStream(`/api/assignments/${initial.assignment.id}/live/stream`, {
    board: (d) => setBoard(d as Board),
    tile: (d) => {
      const t = d as BoardTile;
      setBoard((b) => ({ ...b, tiles: b.tiles.map((x) => (x.studentId === t.studentId ? t : x)) }));
    },
    timeline: (d) => setBoard((b) => ({ ...b, timeline: [...b.timeline, ...(d as NotableEvent[])].slice(-200) })),
    message: (d) => addMessage(d as BoardMessage),
  });
  const counts = { running: 0, submitted: 0, 'not-started': 0 };
  for (const t of board.tiles) counts[t.status] += 1;
  return (
    <div className="space-y-6" data-testid="live-board" data-connection={connection}>
      <p className="flex items-center gap-2 text-sm text-slate-600" aria-live="polite">
        <Activity className={`h-4 w-4 ${connection === 'open' ? 'text-accent-700' : 'text-slate-400'}`} aria-hidden />
        {connection === 'open' ? 'Live' : connection === 'connecting' ? 'Connecting…' : 'Connection lost; reconnecting…'} · {counts.running} running, {counts.submitted} submitted, {counts['not-started']} not started
      </p>
      <ul className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3 xl:grid-cols-4" aria-label="Students">
        {board.tiles.map((t) => (
          <li key={t.studentId}>
            <Tile tile={t} now={now} />
          </li>
        ))}
      </ul>
      <div className="grid gap-6 lg:grid-cols-2">
        <section aria-label="Timeline" className="rounded-lg border border-slate-200 bg-white p-4">
          <h2 className="mb-2 text-base font-semibold text-slate-900">Timeline</h2>
          {board.timeline.length === 0 ? (
            <p className="text-sm text-slate-500">Nothing notable yet.</p>
          ) : (
            <ol className="max-h-80 space-y-1 overflow-y-auto text-sm" data-testid="live-timeline">
              {[...board.timeline].reverse().map((e, i) => (
                <li key={`${e.runId}-${e.at}-${e.t}-${i}`} className="flex gap-2">
                  <span className="font-mono text-xs text-slate-500">{new Date(e.at).toISOString().slice(11, 19)}</span>
                  <span className="font-medium">{e.studentName}</span>
                  <span>{e.text}</span>
                  <span className="font-mono text-xs text-slate-500">@{clock(e.t)}</span>
                </li>
              ))}
            </ol>
          )}
        </section>
        <section aria-label="Messages" className="space-y-3 rounded-lg border border-slate-200 bg-white p-4">
          <h2 className="text-base font-semibold text-slate-900">Hints and messages</h2>
          {board.assignment.state === 'open' ? <MessageForm assignmentId={board.assignment.id} tiles={board.tiles} onSent={addMessage} /> : <p className="text-sm text-slate-500">The assignment is {board.assignment.state}.</p>}
          <ul className="max-h-60 space-y-1 overflow-y-auto text-sm" data-testid="live-messages">
            {[...board.messages].reverse().map((m) => (
              <li key={m.id}>
                <span className="text-xs text-slate-500">{new Date(m.createdAt).toISOString().slice(11, 16)} to {m.toName ?? 'everyone'} ({m.kind}):</span> {m.body}
              </li>
            ))}
          </ul>
        </section>
      </div>
    </div>
  );
}
