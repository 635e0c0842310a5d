'use client';
/**
 * Main-thread side of the engine worker: posts commands, and applies snapshots to the store
 * once per animation frame (requestAnimationFrame), acknowledging each so the worker never
 * floods the main thread.
 */
import type { CellSnapshot, LoggedEvent } from '@/simulator';
import type { EngineConnection, EngineSink } from './store';
import type { FromEngine, ToEngine } from './engine-protocol';

/** Starts the engine worker and connects it to a store's sink. */
export function connectEngineWorker(sink: EngineSink): EngineConnection {
  // Written inline so the bundler sees the worker entry (Next.js / Turbopack worker form).
  const worker = new Worker(new URL('./engine.worker.ts', import.meta.url), { type: 'module' });
  let pending: CellSnapshot | null = null;
  let frame: number | null = null;
  let nextRequest = 1;
  const logRequests = new Map<number, (log: LoggedEvent[]) => void>();
  const post = (m: ToEngine) => worker.postMessage(m);

  const draw = () => {
    frame = null;
    if (pending) {
      sink.snapshot(pending);
      pending = null;
    }
    post({ type: 'frame-done' });
  };

  worker.addEventListener('message', (e: MessageEvent<FromEngine>) => {
    const m = e.data;
    switch (m.type) {
      case 'snapshot':
        sink.trace(m.trace);
        pending = m.snapshot;
        sink.patch({ eventCount: m.eventCount, status: 'ready' });
        if (frame === null) frame = requestAnimationFrame(draw);
        break;
      case 'loaded':
        if (m.ok) sink.patch({ status: 'ready', problems: [], warnings: m.warnings, signalNames: m.signalNames, lastRejection: null });
        else sink.patch({ status: 'invalid', problems: m.problems, running: false });
        break;
      case 'accepted':
        sink.patch({ lastRejection: null, eventCount: m.eventCount });
        sink.accepted?.(m.event);
        break;
      case 'rejected':
        sink.patch({ lastRejection: { event: m.event, problems: m.problems } });
        break;
      case 'log':
        logRequests.get(m.requestId)?.(m.log);
        logRequests.delete(m.requestId);
        break;
      case 'crashed':
        sink.patch({ status: 'crashed', running: false, problems: [{ path: [], code: 'engine_crashed', message: m.message }] });
        break;
    }
  });
  worker.addEventListener('error', (e) => {
    sink.patch({ status: 'crashed', running: false, problems: [{ path: [], code: 'engine_crashed', message: e.message || 'the engine worker stopped' }] });
  });

  return {
    load: (document) => post({ type: 'load', document }),
    send: (event) => post({ type: 'event', event }),
    run: (speed) => post({ type: 'run', speed }),
    pause: () => post({ type: 'pause' }),
    stepScan: () => post({ type: 'step-scan' }),
    getEventLog: () =>
      new Promise((resolve) => {
        const id = nextRequest++;
        logRequests.set(id, resolve);
        post({ type: 'get-log', requestId: id });
      }),
    dispose: () => {
      if (frame !== null) cancelAnimationFrame(frame);
      worker.terminate();
    },
  };
}
