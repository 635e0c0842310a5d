/// <reference lib="webworker" />
/**
 * The engine worker: runs one cell off the main thread (see engine-host.ts for the loop).
 * Created by engine-connection.ts with `new Worker(new URL('./engine.worker.ts', import.meta.url), { type: 'module' })`.
 */
import { createEngineHost } from './engine-host';
import type { FromEngine, ToEngine } from './engine-protocol';

const scope = self as unknown as DedicatedWorkerGlobalScope;

const host = createEngineHost((message: FromEngine) => scope.postMessage(message), {
  now: () => performance.now(),
  setTimeout: (fn, ms) => setTimeout(fn, ms),
  clearTimeout: (handle) => clearTimeout(handle as ReturnType<typeof setTimeout>),
});

scope.addEventListener('message', (e: MessageEvent<ToEngine>) => host.handle(e.data));
