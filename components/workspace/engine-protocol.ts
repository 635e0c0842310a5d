/**
 * Messages between the workspace (main thread) and the engine worker. Plain JSON values
 * only, so they cross `postMessage` without surprises.
 */
import type { CellDocument, CellEvent, LoggedEvent, CellSnapshot, Problem } from '@/simulator';

/** Run speed: real time, ten times real time, or as fast as the worker can go. */
export type RunSpeed = 1 | 10 | 'max';

/** Main thread → worker. */
export type ToEngine =
  | { type: 'load'; document: CellDocument }
  | { type: 'event'; event: CellEvent }
  | { type: 'run'; speed: RunSpeed }
  | { type: 'pause' }
  | { type: 'step-scan' }
  /** The main thread drew the last snapshot; the worker may post the next one. */
  | { type: 'frame-done' }
  | { type: 'get-log'; requestId: number };

/**
 * New samples of the scope's signals since the last message: exact change times from the
 * engine's own trace (every instant), not the coarser snapshot rate. `reset` starts a new run.
 */
export type TraceChunk = { reset: boolean; signals: string[]; samples: [number, number, number][] };

/** Worker → main thread. */
export type FromEngine =
  | { type: 'loaded'; ok: true; signalNames: string[]; warnings: Problem[] }
  | { type: 'loaded'; ok: false; problems: Problem[] }
  | { type: 'snapshot'; snapshot: CellSnapshot; eventCount: number; trace: TraceChunk }
  | { type: 'rejected'; event: CellEvent; problems: Problem[] }
  | { type: 'accepted'; event: CellEvent; eventCount: number }
  | { type: 'log'; requestId: number; log: LoggedEvent[] }
  | { type: 'crashed'; message: string };

/** The worker posts at most this many snapshots per second (animation rate). */
export const MAX_SNAPSHOTS_PER_SECOND = 60;
/** Wall-clock budget of one worker slice at 'max' speed (ms), leaving room for messages. */
export const MAX_SPEED_SLICE_MS = 12;
/** Cell time advanced per chunk at 'max' speed, checked against the slice budget between chunks. */
export const MAX_SPEED_CHUNK_MS = 20;

/**
 * The scope's signals among a cell's signal names: PLC addresses and controller points, the
 * ones traced at every instant for the scope (the worker and the replay both use these).
 */
export function scopeSignals(names: readonly string[]): string[] {
  return names.filter((n) => n.startsWith('plc.%') || /^ctl\.[A-Z]{2}\d+$/.test(n));
}

/** A scope signal as the scope names it: `%IX0.0`, `DI3` (the engine's `plc.` / `ctl.` dropped). */
export function scopeName(signal: string): string {
  return signal.replace(/^(plc|ctl)\./, '');
}
