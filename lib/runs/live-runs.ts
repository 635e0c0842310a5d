import 'server-only';

/**
 * What the app process remembers of runs in progress, by run id: the run row and its setup
 * (drill, assignment, limits) as read when the run was last loaded, and the stored end. The
 * cells themselves live in the engine's worker threads (engine-host.ts). Only a cache, of small
 * objects (no cell document): every entry is re-read from the database on a miss, so a restart
 * or an eviction loses nothing. Kept on globalThis so Next.js hot reloads share it.
 */
export interface LiveMeta<S = unknown> {
  /** Sequence number of the last stored batch. */
  lastSeq: number;
  /** Cell time the last stored batch reached. */
  untilMs: number;
  setup: S;
}

/** Entries kept; each is a few kilobytes (a run row, a drill's rules and fault cards). */
export const MAX_LIVE_META = 5000;

const g = globalThis as unknown as { cellwrightLiveMeta?: Map<string, LiveMeta>; cellwrightRunLocks?: Map<string, Promise<unknown>> };

function cache(): Map<string, LiveMeta> {
  g.cellwrightLiveMeta ??= new Map();
  return g.cellwrightLiveMeta;
}

/** The remembered run, marked most recently used; undefined on a miss. */
export function getLiveMeta(runId: string): LiveMeta | undefined {
  const c = cache();
  const hit = c.get(runId);
  if (hit) {
    c.delete(runId);
    c.set(runId, hit);
  }
  return hit;
}

export function putLiveMeta(runId: string, meta: LiveMeta): void {
  const c = cache();
  c.delete(runId);
  c.set(runId, meta);
  while (c.size > MAX_LIVE_META) c.delete(c.keys().next().value as string);
}

export function forgetLiveMeta(runId: string): void {
  cache().delete(runId);
}

/** Forgets everything (with resetEngineHost, what a server restart does). */
export function clearLiveMeta(): void {
  cache().clear();
}

/**
 * Runs `fn` after every earlier call for the same run has finished, so two requests of one
 * run (a retry racing its original, a view during a batch) never drive its cell at once.
 * Across server processes the run row's lock and the unique indexes on run_batches are the guard.
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
