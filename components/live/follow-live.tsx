'use client';
import { useEffect, useState, type ReactNode } from 'react';
import type { Board, BoardTile } from '@/lib/live/types';
import { useLiveStream } from './use-live-stream';

/**
 * Automatic catch-ups at most this often: each one reloads the replay, and the replay's trace is
 * a whole-log simulation on the server's heavy pool metered to the watcher (a catch-up every few
 * seconds spends the trainer's engine share and gets 503s).
 */
const CATCH_UP_MS = 30_000;

/**
 * Follows a running student's run from the live board's stream (the trainer's and admin's view):
 * the line above the replay shows where the run stands as each batch arrives (free: pushed
 * facts), and the read-only replay below is mounted again on the stored log with "Catch up",
 * or by itself at most every 30 s when "Follow live" is on. Pushed, not polled: nothing happens
 * until the stream says the run moved.
 */
export function FollowLive({ assignmentId, runId, children }: { assignmentId: string; runId: string; children: ReactNode }) {
  const [tile, setTile] = useState<BoardTile | null>(null);
  const [shownSeq, setShownSeq] = useState<number | null>(null);
  const [generation, setGeneration] = useState(0);
  const [follow, setFollow] = useState(false);
  const [caughtUpAt, setCaughtUpAt] = useState(0);
  const connection = useLiveStream(`/api/assignments/${assignmentId}/live/stream`, {
    board: (d) => {
      const t = (d as Board).tiles.find((x) => x.runId === runId) ?? null;
      setTile(t);
      setShownSeq((s) => s ?? t?.lastSeq ?? 0);
    },
    tile: (d) => {
      const t = d as BoardTile;
      if (t.runId === runId) setTile(t);
    },
  });
  const behind = tile !== null && shownSeq !== null && tile.lastSeq > shownSeq;
  useEffect(() => {
    if (!follow || !behind || !tile) return;
    // A throttle, not a debounce: a new batch re-arms the timer for the same moment.
    const t = setTimeout(
      () => {
        setShownSeq(tile.lastSeq);
        setGeneration((g) => g + 1);
        setCaughtUpAt(Date.now());
      },
      Math.max(0, caughtUpAt + CATCH_UP_MS - Date.now()),
    );
    return () => clearTimeout(t);
  }, [follow, behind, tile, caughtUpAt]);
  const catchUp = () => {
    if (!tile) return;
    setShownSeq(tile.lastSeq);
    setGeneration((g) => g + 1);
    setCaughtUpAt(Date.now());
  };
  const secs = tile ? Math.floor(tile.untilMs / 1000) : 0;
  return (
    <>
      <div className="mb-3 flex flex-wrap items-center gap-3 rounded-md border border-slate-200 bg-white px-3 py-2 text-sm" data-testid="follow-live" aria-live="polite">
        <span className="font-medium">{connection === 'open' ? 'Live' : 'Reconnecting…'}</span>
        {tile ? (
          <span>
            {tile.status === 'running' ? 'running' : tile.status} · cell time <span className="font-mono">{`${Math.floor(secs / 60)}:${String(secs % 60).padStart(2, '0')}`}</span>
            {behind ? ` · ${tile.lastSeq - (shownSeq ?? 0)} new batch(es) since this replay was loaded` : ' · the replay is up to date'}
          </span>
        ) : null}
        <label className="flex items-center gap-1">
          <input type="checkbox" checked={follow} onChange={(e) => setFollow(e.target.checked)} /> Follow live
        </label>
        <button type="button" onClick={catchUp} disabled={!behind} className="rounded border border-slate-300 px-2 py-0.5 disabled:text-slate-400">
          Catch up
        </button>
      </div>
      <div key={generation}>{children}</div>
    </>
  );
}
