/**
 * The cell's clock arithmetic: whole milliseconds, each subsystem due at the multiples of its
 * own period. One rule for the engine, the browser's "step one scan" and the drill's
 * client-side clock alike.
 */

/** The first multiple of `periodMs` strictly after `timeMs`: the next instant a scan (or refresh, or exchange) with that period runs. */
export function nextScanMs(timeMs: number, periodMs: number): number {
  return (Math.floor(timeMs / periodMs) + 1) * periodMs;
}

/** The cell's current time, shared by the parts that read it (ms of cell time). */
export type Clock = { now: number };
