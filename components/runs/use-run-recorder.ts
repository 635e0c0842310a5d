'use client';
/**
 * Saves a run that executes in the browser worker (free practice, a trainer's preview): every
 * second it reads the worker's event log and cell time from the workspace store and streams
 * what is new to the server through the batch sender, so the run can be replayed later.
 * Downloads ("Send to cell") are events of the worker's log like any other, so they are
 * stored with the run and its replay runs the downloaded parts at the same instants.
 * A restart of the cell ("Restart run", or an edit where edits reload the cell) starts its
 * clock at 0 again, which a stored run cannot follow: the recorder then opens a new run and
 * records into that one.
 */
import { useEffect, useRef, useState } from 'react';
import { useWorkspaceApi } from '@/components/workspace/contract';
import { createBatchSender, type BatchSender, type SenderState } from './batch-sender';

const READ_EVERY_MS = 1000;

const browserClock = {
  now: () => performance.now(),
  setTimeout: (fn: () => void, ms: number) => setTimeout(fn, ms),
  clearTimeout: (h: unknown) => clearTimeout(h as ReturnType<typeof setTimeout>),
};

export type RecorderState = { runId: string; saving: SenderState | null; runsStarted: number; error: string | null };

/**
 * Records the workspace's run into `firstRunId`; `startNewRun` opens the next run after a restart
 * (POST /api/runs) and returns its id.
 */
export function useRunRecorder(firstRunId: string, startNewRun: () => Promise<string>): RecorderState {
  const api = useWorkspaceApi();
  const [state, setState] = useState<RecorderState>({ runId: firstRunId, saving: null, runsStarted: 1, error: null });
  const startRef = useRef(startNewRun);
  useEffect(() => {
    startRef.current = startNewRun;
  }, [startNewRun]);

  useEffect(() => {
    let stopped = false;
    let sender: BatchSender | null = null;
    let sent = 0;
    let lastT = 0;
    let switching = false;
    // The store marks every reload of the cell as 'loading': that is a restart of the clock.
    let restarted = false;
    const unsubscribe = api.subscribe((s, prev) => {
      if (s.engine.status === 'loading' && prev.engine.status !== 'loading') restarted = true;
    });
    const open = (id: string) => {
      sender?.dispose();
      sent = 0;
      lastT = 0;
      sender = createBatchSender({
        runId: id,
        fetch: (...a) => fetch(...a),
        clock: browserClock,
        storedSeq: 0,
        storedUntilMs: 0,
        flushEveryMs: 2000,
        onChange: (s) => !stopped && setState((p) => ({ ...p, runId: id, saving: s })),
      });
    };
    open(firstRunId);

    const read = async () => {
      if (stopped || switching || !sender) return;
      const { snapshot } = api.getState();
      const timeMs = snapshot?.timeMs ?? 0;
      const log = await api.getState().getEventLog();
      if (stopped) return;
      if (restarted || timeMs < lastT || log.length < sent) {
        if (api.getState().engine.status === 'loading') return;
        restarted = false;
        // The cell restarted: keep what was stored, open a fresh run for the new clock.
        switching = true;
        try {
          await sender.flush().catch(() => undefined);
          const id = await startRef.current();
          if (stopped) return;
          open(id);
          setState((p) => ({ ...p, runId: id, runsStarted: p.runsStarted + 1, error: null }));
        } catch (e) {
          setState((p) => ({ ...p, error: e instanceof Error ? e.message : 'Could not start a new run.' }));
        } finally {
          switching = false;
        }
        return;
      }
      for (const e of log.slice(sent)) sender.push(e);
      sent = log.length;
      const until = Math.max(timeMs, log.at(-1)?.t ?? 0);
      sender.advanceTo(until);
      lastT = until;
    };
    const timer = setInterval(() => void read(), READ_EVERY_MS);
    const onHide = () => void read().then(() => sender?.flush().catch(() => undefined));
    window.addEventListener('pagehide', onHide);
    return () => {
      stopped = true;
      clearInterval(timer);
      window.removeEventListener('pagehide', onHide);
      void sender?.flush().catch(() => undefined);
      sender?.dispose();
      unsubscribe();
    };
  }, [api, firstRunId]);

  return state;
}
