/**
 * The workspace engine of a student's drill attempt. The cell does not run in the browser
 * (its hidden fault cards must never reach it): the server runs it, and this connection
 *
 * - keeps the run's cell time on the client (×1 real time, pause, step one scan), capped at
 *   the drill's time limit,
 * - streams every event with the cell time it happened at to POST /api/runs/[id]/batches
 *   (batch-sender.ts: idempotency keys, retries with backoff),
 * - polls GET /api/runs/[id]/view?t= about ten times a second for the sanitised snapshot and
 *   feeds it to the store, with a scope trace built from the changes between snapshots,
 * - resumes after a reload: GET /api/runs/[id] gives the last stored batch and cell time.
 *
 * Same `EngineConnection` shape as the worker (components/workspace/store.ts), so the areas
 * work unchanged. Document edits cannot reach the server's cell (only events can), so a
 * reload of the document is acknowledged and otherwise ignored (`keepsRunOnEdit`); an edit of
 * an editable area reaches the server as a `download` event ("Send to cell").
 */
import { nextScanMs, type CellSnapshot, type LoggedEvent } from '@/simulator';
import { eventRefusal, type EventPermissions } from '@/lib/runs/policy';
import type { EngineConnection, EngineFactory, EngineSink } from '@/components/workspace/store';
import type { TraceChunk } from '@/components/workspace/engine-protocol';
import { createBatchSender, type BatchSender, type SenderClock, type SenderState } from './batch-sender';

/** What the drill lets the student do (the policy the server enforces too: lib/runs/policy.ts). */
export type RemotePermissions = EventPermissions;

export type RemoteRunOptions = {
  runId: string;
  permissions: RemotePermissions;
  /** Cell time the attempt may reach, or null. */
  timeLimitMs: number | null;
  fetch?: typeof fetch;
  clock?: SenderClock;
  /** Snapshot poll period (ms). */
  pollMs?: number;
  /** Passed to the batch sender (tests shorten them). */
  senderTiming?: { eventDelayMs?: number; flushEveryMs?: number; firstBackoffMs?: number; maxBackoffMs?: number };
  makeKey?: (seq: number) => string;
};

/** What the drill page shows about the connection. */
export type RemoteRunState = {
  phase: 'connecting' | 'ready' | 'ended' | 'failed';
  /** The run had stored batches when this page opened. */
  resumed: boolean;
  timeMs: number;
  running: boolean;
  limitReached: boolean;
  saving: SenderState | null;
  /** Last time a snapshot arrived (wall ms), to show a stale view. */
  lastViewAt: number | null;
  viewError: string | null;
  message: string | null;
};

export type RemoteRun = {
  /** Hand to `<WorkspaceProvider engineFactory>`. */
  factory: EngineFactory;
  getState(): RemoteRunState;
  subscribe(listener: () => void): () => void;
  /** Stores everything so far (call before submitting). */
  flush(): Promise<void>;
  /** Stops the clock and polling (after submit). */
  end(): void;
};

type RunSummary = { run: { lastSeq: number; untilMs: number; status: string } };
type ViewAnswer = { snapshot: Omit<CellSnapshot, 'faults' | 'wires'> & { wires: Omit<CellSnapshot['wires'][number], 'faults'>[] }; timeLimitMs: number | null };

const browserClock: SenderClock = {
  now: () => (typeof performance !== 'undefined' ? performance.now() : Date.now()),
  setTimeout: (fn, ms) => setTimeout(fn, ms),
  clearTimeout: (h) => clearTimeout(h as ReturnType<typeof setTimeout>),
};

/** The sanitised snapshot in the engine's shape: no fault cards at all (the student sees symptoms only). */
export function fromSanitised(s: ViewAnswer['snapshot']): CellSnapshot {
  return { ...s, wires: s.wires.map((w) => ({ ...w, faults: [] })), faults: [] };
}

/** Scope signals from a snapshot, named as the worker's trace names them (`%IX0.0`, `DI3`). */
export function scopeValues(s: CellSnapshot): Map<string, number> {
  const out = new Map<string, number>();
  for (const [a, v] of Object.entries(s.plc.addresses)) out.set(a, v.value);
  for (const p of s.controller.points) out.set(p.ref, p.value);
  return out;
}

/** Creates the remote run for one drill attempt. */
export function createRemoteRun(opts: RemoteRunOptions): RemoteRun {
  const doFetch = opts.fetch ?? ((...a: Parameters<typeof fetch>) => fetch(...a));
  const clock = opts.clock ?? browserClock;
  const pollMs = opts.pollMs ?? 100;
  const listeners = new Set<() => void>();
  let state: RemoteRunState = { phase: 'connecting', resumed: false, timeMs: 0, running: false, limitReached: false, saving: null, lastViewAt: null, viewError: null, message: null };
  const setState = (patch: Partial<RemoteRunState>) => {
    state = { ...state, ...patch };
    listeners.forEach((l) => l());
  };

  // Client cell time: `baseMs` at wall time `baseWall` while running.
  let baseMs = 0;
  let baseWall = 0;
  let running = false;
  let ended = false;
  let active: Conn | null = null;

  const cellTime = () => {
    let t = running ? baseMs + (clock.now() - baseWall) : baseMs;
    if (opts.timeLimitMs !== null) t = Math.min(t, opts.timeLimitMs);
    return Math.floor(t);
  };
  const setRunning = (on: boolean) => {
    baseMs = cellTime();
    baseWall = clock.now();
    running = on && !ended;
  };

  type Conn = EngineConnection & { flush(): Promise<void> };

  const factory: EngineFactory = (sink: EngineSink) => {
    let sender: BatchSender | null = null;
    let disposed = false;
    let pollTimer: unknown = null;
    let polling = false;
    let lastPolledT = -1;
    let dirty = true;
    let scanPeriodMs = 10;
    let traceSignals: string[] | null = null;
    let lastValues = new Map<string, number>();
    const log: LoggedEvent[] = [];
    let loadedOnce = false;

    const traceFrom = (snap: CellSnapshot): TraceChunk => {
      const values = scopeValues(snap);
      if (!traceSignals) {
        traceSignals = [...values.keys()];
        lastValues = values;
        return { reset: true, signals: traceSignals, samples: traceSignals.map((n, i) => [snap.timeMs, i, values.get(n) ?? 0]) };
      }
      const samples: [number, number, number][] = [];
      traceSignals.forEach((n, i) => {
        const v = values.get(n);
        if (v !== undefined && v !== lastValues.get(n)) samples.push([snap.timeMs, i, v]);
      });
      lastValues = values;
      return { reset: false, signals: [], samples };
    };

    const poll = async () => {
      pollTimer = null;
      if (disposed) return;
      const t = cellTime();
      const senderBusy = sender ? sender.getState().pending > 0 : true;
      // Never ask the server past an event it has not stored yet: its cell would have to be rebuilt.
      if (!polling && !senderBusy && (dirty || t !== lastPolledT)) {
        polling = true;
        try {
          const res = await doFetch(`/api/runs/${opts.runId}/view?t=${t}`, { credentials: 'same-origin', cache: 'no-store' });
          if (res.ok) {
            const body = (await res.json()) as ViewAnswer;
            if (!disposed) {
              const snap = fromSanitised(body.snapshot);
              scanPeriodMs = snap.plc.scanPeriodMs || scanPeriodMs;
              lastPolledT = t;
              dirty = false;
              sink.trace(traceFrom(snap));
              sink.snapshot(snap);
              sink.patch({ status: 'ready', eventCount: log.length });
              setState({ lastViewAt: clock.now(), viewError: null });
            }
          } else if (!disposed) {
            setState({ viewError: `The server's view answered ${res.status}.` });
          }
        } catch (e) {
          if (!disposed) setState({ viewError: e instanceof Error ? e.message : 'The server cannot be reached.' });
        } finally {
          polling = false;
        }
      }
      if (!disposed) {
        const limit = opts.timeLimitMs !== null && cellTime() >= opts.timeLimitMs;
        if (limit && running) {
          setRunning(false);
          sink.patch({ running: false });
        }
        sender?.advanceTo(cellTime());
        setState({ timeMs: cellTime(), running, limitReached: limit });
        if (!ended || dirty) pollTimer = clock.setTimeout(() => void poll(), pollMs);
      }
    };

    const start = async () => {
      try {
        const res = await doFetch(`/api/runs/${opts.runId}`, { credentials: 'same-origin', cache: 'no-store' });
        if (!res.ok) throw new Error(`The run could not be opened (${res.status}).`);
        const { run } = (await res.json()) as RunSummary;
        if (disposed) return;
        baseMs = run.untilMs;
        baseWall = clock.now();
        if (run.status !== 'active') {
          ended = true;
          running = false;
        }
        sender = createBatchSender({
          runId: opts.runId,
          fetch: doFetch,
          clock,
          storedSeq: run.lastSeq,
          storedUntilMs: run.untilMs,
          makeKey: opts.makeKey,
          ...opts.senderTiming,
          onChange: (s) => {
            setState({ saving: s });
            if (s.pending === 0) dirty = true;
          },
          onRejected: (events, message) => {
            for (const e of events) sink.patch({ lastRejection: { event: e.event, problems: [{ path: [], code: 'refused', message }] } });
          },
          // Only a stored event has reached the server's cell: that settles a download in flight.
          onStored: (events) => {
            for (const e of events) sink.accepted?.(e.event);
          },
        });
        sink.patch({ status: 'ready', problems: [], signalNames: [], running, speed: 1 });
        setState({ phase: ended ? 'ended' : 'ready', resumed: run.lastSeq > 0, timeMs: baseMs, running, saving: sender.getState() });
        void poll();
      } catch (e) {
        const message = e instanceof Error ? e.message : 'The run could not be opened.';
        sink.patch({ status: 'crashed', running: false, problems: [{ path: [], code: 'remote', message }] });
        setState({ phase: 'failed', message });
      }
    };

    const conn: Conn = {
      keepsRunOnEdit: true,
      load() {
        if (!loadedOnce) {
          loadedOnce = true;
          void start();
        } else {
          // Document edits stay in this browser (the server's cell hears events only).
          sink.patch({ status: 'ready', problems: [] });
        }
      },
      send(event) {
        const why = ended ? 'The attempt has ended.' : eventRefusal(event, opts.permissions);
        if (why || !sender) {
          sink.patch({ lastRejection: { event, problems: [{ path: [], code: 'refused', message: why ?? 'Still connecting to the run.' }] } });
          return;
        }
        const entry = { t: cellTime(), event };
        log.push(entry);
        sender.push(entry);
        dirty = true;
        sink.patch({ lastRejection: null, eventCount: log.length });
      },
      run() {
        if (ended || (opts.timeLimitMs !== null && cellTime() >= opts.timeLimitMs)) {
          sink.patch({ running: false });
          return;
        }
        // A drill runs in real time only: the server's cell must never outpace the wall clock by much.
        setRunning(true);
        sink.patch({ running: true, speed: 1 });
        setState({ running: true });
      },
      pause() {
        setRunning(false);
        sink.patch({ running: false });
        sender?.advanceTo(cellTime());
        setState({ running: false, timeMs: cellTime() });
      },
      stepScan() {
        setRunning(false);
        const t = cellTime();
        const next = nextScanMs(t, scanPeriodMs);
        baseMs = opts.timeLimitMs !== null ? Math.min(next, opts.timeLimitMs) : next;
        dirty = true;
        sender?.advanceTo(baseMs);
        sink.patch({ running: false });
      },
      getEventLog: () => Promise.resolve(log.slice()),
      flush: () => {
        sender?.advanceTo(cellTime());
        return sender ? sender.flush() : Promise.resolve();
      },
      dispose() {
        disposed = true;
        if (pollTimer !== null) clock.clearTimeout(pollTimer);
        // Whatever is queued still goes out (best effort); timers stop.
        void sender?.flush().catch(() => undefined);
        sender?.dispose();
        if (active === conn) active = null;
      },
    };
    active = conn;
    return conn;
  };

  return {
    factory,
    getState: () => state,
    subscribe(l) {
      listeners.add(l);
      return () => void listeners.delete(l);
    },
    flush: () => (active ? active.flush() : Promise.resolve()),
    end() {
      setRunning(false);
      ended = true;
      setState({ phase: 'ended', running: false });
    },
  };
}
