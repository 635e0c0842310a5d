/**
 * Messages between the app process and a PLC-link worker thread (lib/plc-link/link-worker.ts).
 * Plain data only: everything crosses `postMessage`.
 */
import type { CellSnapshot, LoggedEvent } from '@/simulator';

export interface LinkWorkerData {
  sessionId: string;
  /** The cell document (validated again in the thread). */
  document: unknown;
  host: string;
  port: number;
  /** A PLC silent this long (ms) is a lost link: coils and holding registers drop to 0. */
  linkTimeoutMs: number;
  /** How often the thread reports its state (ms). */
  reportEveryMs?: number;
}

export interface LinkHealth {
  /** Whether a PLC has talked within the timeout (false before the first request). */
  linked: boolean;
  /** True after a link was up and then went silent past the timeout (until requests resume). */
  lost: boolean;
  requests: number;
  /** Milliseconds since the last request, null before the first. */
  lastRequestAgeMs: number | null;
  /** Requests in the last second. */
  requestsPerSecond: number;
  /** Median time between the PLC's writes (ms), over the last 20; null before two writes. */
  updatePeriodMs: number | null;
  linkTimeoutMs: number;
}

export type WorkerMessage =
  | { type: 'listening'; host: string; port: number }
  | { type: 'failed'; code: string; message: string }
  | { type: 'state'; snapshot: CellSnapshot; health: LinkHealth; events: LoggedEvent[]; timeMs: number }
  | { type: 'stopped'; events: LoggedEvent[]; timeMs: number };

export type HostMessage = { type: 'stop' };
