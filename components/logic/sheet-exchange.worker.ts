/// <reference lib="webworker" />
/**
 * The sheet-exchange worker: exports and imports run here, off the main thread (a big sheet
 * takes seconds, docs/engine.md), and the exchange code stays out of the page's bundles.
 * Started by sheet-files.tsx with `new Worker(new URL('./sheet-exchange.worker.ts', import.meta.url), { type: 'module' })`
 * for one request and stopped after its answer.
 */
import { exportSheet, importSheet, type ExchangeRequest, type ExchangeReply } from './sheet-exchange';

const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.addEventListener('message', (e: MessageEvent<ExchangeRequest>) => {
  const req = e.data;
  const reply: ExchangeReply =
    req.op === 'import' ? { op: 'import', outcome: importSheet(req.xml) } : { op: 'export', outcome: exportSheet(req.sheet, req.cellName, req.kind, new Date(req.now)) };
  scope.postMessage(reply);
});
