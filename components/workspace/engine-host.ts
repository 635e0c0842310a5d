/**
 * The engine side of the worker: owns one cell, drives its clock from wall time at ×1, ×10
 * or as fast as possible, applies events, and posts snapshots no faster than the main thread
 * draws them. Kept free of `self` so it runs under vitest with a fake clock.
 */
import { createCell, nextScanMs, signalNamesOf, type Cell, type CellDocument } from '@/simulator';
import type { RunSpeed } from './contract';
import { MAX_SNAPSHOTS_PER_SECOND, MAX_SPEED_CHUNK_MS, MAX_SPEED_SLICE_MS, scopeName, scopeSignals, type FromEngine, type ToEngine } from './engine-protocol';

/** Time and timers the host uses; the worker passes the real ones, tests a fake. */
export type HostClock = {
  now(): number;
  setTimeout(fn: () => void, ms: number): unknown;
  clearTimeout(handle: unknown): void;
};

/** A tab in the background can stall timers for seconds; never catch up more than this per slice. */
const MAX_CATCH_UP_WALL_MS = 250;
const TICK_MS = 1000 / MAX_SNAPSHOTS_PER_SECOND;

/** Creates the engine host; `post` sends a message to the main thread. Returns the message handler and a stop function. */
export function createEngineHost(post: (message: FromEngine) => void, clock: HostClock) {
  let cell: Cell | null = null;
  let scanPeriodMs = 10;
  let running = false;
  let speed: RunSpeed = 1;
  let lastWall = clock.now();
  let carryMs = 0;
  let awaitingFrame = false;
  let snapshotDue = false;
  let lastPostWall = -Infinity;
  let timer: unknown = null;
  let traceSignals: string[] = [];
  let traceSent = 0;
  let traceReset = true;

  const fail = (e: unknown) => {
    running = false;
    post({ type: 'crashed', message: e instanceof Error ? e.message : String(e) });
  };

  const postSnapshot = () => {
    if (!cell) return;
    // Only the samples recorded since the last post cross to the main thread.
    const tr = cell.traceSince(traceSent);
    const fresh = tr.samples.map(([t, i, v]) => [t, i, typeof v === 'number' ? v : Number(v) || 0] as [number, number, number]);
    traceSent = tr.next;
    const trace = { reset: traceReset, signals: traceReset ? traceSignals : [], samples: fresh };
    traceReset = false;
    post({ type: 'snapshot', snapshot: cell.snapshot(), eventCount: cell.eventCount, trace });
    awaitingFrame = true;
    snapshotDue = false;
    lastPostWall = clock.now();
  };

  const flush = () => {
    if (snapshotDue && !awaitingFrame && clock.now() - lastPostWall >= TICK_MS - 1) postSnapshot();
  };

  const advance = (ms: number) => {
    if (!cell || ms <= 0) return;
    const r = cell.advance(ms);
    if (!r.ok) throw new Error(r.errors.map((p) => p.message).join('; '));
    snapshotDue = true;
  };

  const tick = () => {
    timer = null;
    try {
      const now = clock.now();
      if (running && cell) {
        const wall = Math.min(now - lastWall, MAX_CATCH_UP_WALL_MS);
        if (speed === 'max') {
          const start = clock.now();
          do advance(MAX_SPEED_CHUNK_MS);
          while (clock.now() - start < MAX_SPEED_SLICE_MS);
        } else {
          const exact = wall * speed + carryMs;
          const whole = Math.floor(exact);
          carryMs = exact - whole;
          advance(whole);
        }
      }
      lastWall = now;
      flush();
    } catch (e) {
      fail(e);
    }
    schedule();
  };

  const schedule = () => {
    if (timer !== null) return;
    // At 'max' the next slice starts at once; otherwise once per animation frame is enough.
    timer = clock.setTimeout(tick, running && speed === 'max' ? 0 : TICK_MS);
  };

  const load = (document: CellDocument) => {
    cell?.dispose();
    cell = null;
    carryMs = 0;
    const all = signalNamesOf(document);
    if (!all.ok) {
      post({ type: 'loaded', ok: false, problems: all.errors });
      return;
    }
    // The scope's signals (PLC addresses and controller points) are traced at every instant.
    const names = scopeSignals(all.value);
    const r = createCell(document, { trace: names });
    if (!r.ok) {
      post({ type: 'loaded', ok: false, problems: r.errors });
      return;
    }
    cell = r.value;
    traceSignals = names.map(scopeName);
    traceSent = 0;
    traceReset = true;
    scanPeriodMs = cell.snapshot().plc.scanPeriodMs;
    post({ type: 'loaded', ok: true, signalNames: cell.signalNames(), warnings: cell.warnings });
    snapshotDue = true;
    // A fresh cell must show at once even if the previous frame has not been acknowledged.
    awaitingFrame = false;
    lastPostWall = -Infinity;
    flush();
  };

  const handle = (msg: ToEngine) => {
    try {
      switch (msg.type) {
        case 'load':
          load(msg.document);
          break;
        case 'event': {
          if (!cell) return;
          const r = cell.apply(msg.event);
          if (r.ok) post({ type: 'accepted', event: msg.event, eventCount: cell.eventCount });
          else post({ type: 'rejected', event: msg.event, problems: r.errors });
          snapshotDue = true;
          flush();
          break;
        }
        case 'run':
          if (!running) lastWall = clock.now();
          running = true;
          speed = msg.speed;
          carryMs = 0;
          break;
        case 'pause':
          running = false;
          break;
        case 'step-scan': {
          running = false;
          if (!cell) return;
          const t = cell.timeMs;
          advance(nextScanMs(t, scanPeriodMs) - t);
          flush();
          break;
        }
        case 'frame-done':
          awaitingFrame = false;
          flush();
          break;
        case 'get-log':
          post({ type: 'log', requestId: msg.requestId, log: cell ? cell.eventLog() : [] });
          break;
      }
    } catch (e) {
      fail(e);
    }
    if (timer !== null && running && speed === 'max') return;
    if (timer !== null) {
      // Switching to 'max' should not wait for the slow tick already queued.
      if (msg.type === 'run' && msg.speed === 'max') {
        clock.clearTimeout(timer);
        timer = null;
      } else return;
    }
    schedule();
  };

  const stop = () => {
    if (timer !== null) clock.clearTimeout(timer);
    timer = null;
    running = false;
    cell?.dispose();
    cell = null;
  };

  return { handle, stop };
}
