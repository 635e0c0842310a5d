import 'server-only';
import { availableParallelism } from 'node:os';
import { pathToFileURL } from 'node:url';
import Piscina from 'piscina';
import { busy } from '@/lib/api/errors';
import { env } from '@/lib/env';
import type { CellSnapshot } from '@/simulator';
import type { LiveOutcome, LiveReply, LiveTask, LoadPayload } from './engine-worker';
import { ENGINE_WORKER, buildBundle, ensureBundle } from '@/lib/workers/bundle';

/**
 * Runs the engine off the request's event loop, on a budget (docs/api.md, "Budgets").
 *
 * - Live runs: one single-thread Piscina pool per *shard*; a run always goes to the shard its
 *   id hashes to, so its cell stays cached in one thread (a pool of several threads would
 *   send each task to whichever is free, and every miss would replay the whole log).
 * - Whole-log replays (grade, trace, snapshot): one more pool, any free thread.
 * - Budgets: a live task stops itself between simulated seconds when its wall-clock budget
 *   is spent and keeps its progress; a stuck task is stopped by Piscina's abort (which ends
 *   that thread; its runs are rebuilt from their logs). Each user's engine time is metered
 *   (a token bucket), and each user keeps at most LIVE_RUNS_PER_USER cells in memory.
 * Past any budget the caller gets a 503 with Retry-After; the app's own event loop never
 * waits on the engine, so every other request keeps answering.
 */

type LiveCommand = Exclude<LiveTask, { op: 'evict' } | { op: 'peek' }>;
type LiveRequest = DistributiveOmit<LiveCommand, 'budgetMs' | 'cacheBytes' | 'load'>;
type DistributiveOmit<T, K extends PropertyKey> = T extends unknown ? Omit<T, K> : never;

interface HostState {
  shards: Piscina[];
  heavy: Piscina;
  /** Per user: their runs cached in a thread, least recently used first. */
  liveByUser: Map<string, string[]>;
  /** Per user: engine time left to spend (ms) and when it was last topped up. */
  buckets: Map<string, { tokens: number; at: number }>;
}

const g = globalThis as unknown as { cellwrightEngineHost?: HostState; cellwrightWorkerBuilt?: boolean };

/** Threads for live runs: ENGINE_THREADS, else one per core (at most 4). */
export function shardCount(): number {
  const set = env().ENGINE_THREADS;
  return set > 0 ? set : Math.max(1, Math.min(4, availableParallelism()));
}

function workerUrl(): string {
  // Development and tests rebuild once per process so the worker never runs stale engine code;
  // production uses the bundle the start command built next to `next build`.
  if (env().NODE_ENV !== 'production' && !g.cellwrightWorkerBuilt) {
    g.cellwrightWorkerBuilt = true;
    return pathToFileURL(buildBundle(ENGINE_WORKER)).href;
  }
  return pathToFileURL(ensureBundle(ENGINE_WORKER)).href;
}

function host(): HostState {
  if (g.cellwrightEngineHost) return g.cellwrightEngineHost;
  const filename = workerUrl();
  const n = shardCount();
  const shards = Array.from({ length: n }, () => new Piscina({ filename, minThreads: 1, maxThreads: 1, idleTimeout: 2 ** 31 - 1, maxQueue: 256 }));
  const heavy = new Piscina({ filename, minThreads: 0, maxThreads: Math.max(1, Math.floor(n / 2)), idleTimeout: 60_000, maxQueue: 64 });
  g.cellwrightEngineHost = { shards, heavy, liveByUser: new Map(), buckets: new Map() };
  return g.cellwrightEngineHost;
}

/** FNV-1a of the run id: which shard owns the run. */
export function shardOf(runId: string, n = shardCount()): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < runId.length; i++) {
    h ^= runId.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return (h >>> 0) % n;
}

function isAbort(err: unknown): boolean {
  return err instanceof Error && (err.name === 'AbortError' || err.name === 'TimeoutError' || /aborted/i.test(err.message));
}

function isQueueFull(err: unknown): boolean {
  return err instanceof Error && /queue is at limit|task queue/i.test(err.message);
}

async function runOn<T>(pool: Piscina, name: string, arg: unknown, hardMs: number): Promise<T> {
  try {
    return (await pool.run(arg, { name, signal: AbortSignal.timeout(hardMs) })) as T;
  } catch (err) {
    if (isAbort(err)) throw busy('The simulation took longer than its budget; try again shortly.', 5);
    if (isQueueFull(err)) throw busy('The simulation engine is busy; try again shortly.', 2);
    throw err;
  }
}

// ---- per-user engine time (token bucket)

function bucket(userId: string): { tokens: number; at: number } {
  const h = host();
  const now = Date.now();
  const { ENGINE_USER_BURST_MS: burst, ENGINE_USER_SHARE: share } = env();
  const b = h.buckets.get(userId) ?? { tokens: burst, at: now };
  b.tokens = Math.min(burst, b.tokens + (now - b.at) * share);
  b.at = now;
  h.buckets.set(userId, b);
  return b;
}

/** 503 with Retry-After while the user has spent their engine time. */
export function checkEngineTime(userId: string): void {
  const b = bucket(userId);
  if (b.tokens <= 0) throw busy('You have used the simulation engine heavily in the last moments; try again shortly.', -b.tokens / env().ENGINE_USER_SHARE / 1000);
}

function charge(userId: string, ms: number): void {
  bucket(userId).tokens -= ms;
}

// ---- live runs

function forget(runId: string): void {
  for (const [user, runs] of host().liveByUser) {
    const i = runs.indexOf(runId);
    if (i >= 0) {
      runs.splice(i, 1);
      if (runs.length === 0) host().liveByUser.delete(user);
    }
  }
}

/** Notes that a user's run is cached, dropping their least recently used runs beyond the cap. */
function noteLive(userId: string, runId: string): void {
  const h = host();
  const runs = (h.liveByUser.get(userId) ?? []).filter((r) => r !== runId);
  runs.push(runId);
  while (runs.length > env().LIVE_RUNS_PER_USER) void evictLive(runs.shift()!);
  h.liveByUser.set(userId, runs);
}

async function sendLive(runId: string, task: LiveTask): Promise<LiveReply> {
  const h = host();
  const reply = await runOn<LiveReply>(h.shards[shardOf(runId, h.shards.length)], 'live', task, env().ENGINE_BUDGET_MS + 10_000);
  for (const id of reply.evicted) forget(id);
  return reply;
}

/**
 * One operation on a run's live cell, in the thread that owns the run. When that thread has
 * no current cell, `load` reads the stored log and the operation is sent again with it.
 * Returns the outcome (never `miss`); a spent budget is the caller's to report.
 */
export async function liveTask(userId: string, req: LiveRequest, load: () => Promise<LoadPayload>): Promise<Exclude<LiveOutcome, { kind: 'miss' }>> {
  checkEngineTime(userId);
  const { ENGINE_BUDGET_MS: budgetMs, ENGINE_CACHE_MB: mb } = env();
  const cacheBytes = Math.floor((mb * 1024 * 1024) / host().shards.length);
  const base = { ...req, budgetMs, cacheBytes } as LiveCommand;
  let reply = await sendLive(req.runId, base);
  charge(userId, reply.busyMs);
  if (reply.kind === 'miss') {
    const payload = await load();
    reply = await sendLive(req.runId, { ...base, load: payload } as LiveCommand);
    charge(userId, reply.busyMs);
    if (reply.kind === 'miss') throw new Error(`run ${req.runId}: the engine thread refused the stored log it was sent`);
  }
  noteLive(userId, req.runId);
  const { busyMs: _b, evicted: _e, ...outcome } = reply;
  return outcome as Exclude<LiveOutcome, { kind: 'miss' }>;
}

/** Drops a run's live cell (a rejected batch, a submit); the next use rebuilds it from the log. */
export async function evictLive(runId: string): Promise<void> {
  forget(runId);
  const h = g.cellwrightEngineHost;
  if (!h) return;
  await sendLive(runId, { op: 'evict', runIds: [runId] }).catch(() => undefined);
}

/** The run's cached cell as it stands, or null when no thread holds it (tests and diagnostics). */
export async function peekLive(runId: string): Promise<{ lastSeq: number; snapshot: CellSnapshot } | null> {
  if (!g.cellwrightEngineHost) return null;
  const r = await sendLive(runId, { op: 'peek', runId });
  return r.kind === 'ok' && r.snapshot ? { lastSeq: r.lastSeq ?? 0, snapshot: r.snapshot } : null;
}

/** A whole-log replay on the heavy pool (grade, trace, snapshot), metered to `userId` when given. */
export async function heavyTask<T>(name: 'grade' | 'displayTrace' | 'snapshotAt', arg: unknown, userId?: string): Promise<T> {
  if (userId) checkEngineTime(userId);
  const started = Date.now();
  try {
    return await runOn<T>(host().heavy, name, arg, env().ENGINE_HEAVY_BUDGET_MS);
  } finally {
    if (userId) charge(userId, Date.now() - started);
  }
}

/**
 * Stops every engine thread and forgets every cached cell: what a server restart does
 * (tests use it to prove a run loses nothing, and to start from a clean host).
 */
export async function resetEngineHost(): Promise<void> {
  const h = g.cellwrightEngineHost;
  g.cellwrightEngineHost = undefined;
  if (!h) return;
  await Promise.all([...h.shards, h.heavy].map((p) => p.destroy()));
}

/** Runs cached per user (tests and diagnostics). */
export function liveRunsOf(userId: string): string[] {
  return [...(g.cellwrightEngineHost?.liveByUser.get(userId) ?? [])];
}
