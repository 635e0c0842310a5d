'use client';
import { useEffect, useState, type ReactNode } from 'react';
import type { Board, BoardTile } from '@/lib/live/types';
import { useLiveStream } from './use-live-stream';

/** Catch-ups at most this often while following, so a student's steady batches do not reload the replay every second. */
const CATCH_UP_MS = 5000;

/**
 * Follows a running student's run from the live board's stream (the trainer's and admin's view):
 * when new batches arrive, the read-only replay below is mounted again on the stored log, at
 * once when "Follow live" is on, else with "Catch up". Pushed, not polled: nothing happens
 * until the stream says the run moved.
 */
export function FollowLive({ assignmentId, runId, children }: { assignmentId: string; runId: string; children: ReactNode }) {
  const [tile, setTile] = useState<BoardTile | null>(null);
  const [shownSeq, setShownSeq] = useState<number | null>(null);
  const [generation, setGeneration] = useState(0);
  const [follow, setFollow] = useState(true);
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
