import 'server-only';
import type { Cell } from '@/simulator';

/**
 * The live cells of runs in progress, by run id: the server-side engine a drill attempt
 * runs on (the student's browser never holds the hidden faults). Only a cache: every entry
 * can be rebuilt from the run's stored batches (the engine is deterministic), so a server
 * restart or an eviction loses nothing. Kept on globalThis so Next.js hot reloads share it;
 * least recently used entries are evicted (and their cells disposed) beyond MAX_LIVE_RUNS.
 */
export interface LiveRun<S = unknown> {
  cell: Cell;
  /** Sequence number of the last batch applied to the cell. */
  lastSeq: number;
  /** Cell time the last stored batch reached. */
  untilMs: number;
  /** What the run's simulation depends on (document, faults, drill), read once per rebuild. */
  setup: S;
}

export const MAX_LIVE_RUNS = 200;

const g = globalThis as unknown as { cellwrightLiveRuns?: Map<string, LiveRun>; cellwrightRunLocks?: Map<string, Promise<unknown>> };

function cache(): Map<string, LiveRun> {
  g.cellwrightLiveRuns ??= new Map();
  return g.cellwrightLiveRuns;
}

/** The cached live run, marked most recently used; undefined on a miss. */
export function getLiveRun(runId: string): LiveRun | undefined {
  const c = cache();
  const hit = c.get(runId);
  if (hit) {
    c.delete(runId);
    c.set(runId, hit);
  }
  return hit;
}

/** Caches a live run, evicting the least recently used beyond the bound. */
export function putLiveRun(runId: string, live: LiveRun): void {
  const c = cache();
  const old = c.get(runId);
  if (old && old.cell !== live.cell) old.cell.dispose();
  c.delete(runId);
  c.set(runId, live);
  while (c.size > MAX_LIVE_RUNS) {
    const [oldest, entry] = c.entries().next().value as [string, LiveRun];
    c.delete(oldest);
    entry.cell.dispose();
  }
}

/** Drops a run's cell (after a rejected batch left it half-applied, or on submit). */
export function evictLiveRun(runId: string): void {
  const c = cache();
  const hit = c.get(runId);
  if (hit) {
    c.delete(runId);
    hit.cell.dispose();
  }
}

/** Empties the cache: what a server restart does (tests use it to prove nothing is lost). */
export function clearLiveRuns(): void {
  for (const id of [...cache().keys()]) evictLiveRun(id);
}

export function liveRunCount(): number {
  return cache().size;
}

/**
 * Runs `fn` after every earlier call for the same run has finished, so two requests of one
 * run (a retry racing its original, a view during a batch) never drive its cell at once.
 * Across server processes the unique indexes on run_batches are the guard.
 */
export function withRunLock<T>(runId: string, fn: () => Promise<T>): Promise<T> {
  g.cellwrightRunLocks ??= new Map();
  const locks = g.cellwrightRunLocks;
  const prev = locks.get(runId) ?? Promise.resolve();
  const next = prev.then(fn, fn);
  const tail = next.catch(() => undefined);
  locks.set(runId, tail);
  void tail.then(() => {
    if (locks.get(runId) === tail) locks.delete(runId);
  });
  return next;
}
