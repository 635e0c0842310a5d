import 'server-only';
import { randomUUID } from 'node:crypto';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import { ApiError, busy } from '@/lib/api/errors';
import type { User } from '@/db/users';
import { findSessionUser } from '@/db/users';
import { getVersion } from '@/db/cells';
import { createRun, insertBatch } from '@/db/runs';
import { cellForReader } from '@/lib/cells/access';
import type { CellSnapshot, LoggedEvent } from '@/simulator';
import { registerMap, type RegisterMapRow } from './register-map';
import { plcLinkSettings } from './settings';
import { ensureBundle, PLC_LINK_WORKER } from '@/lib/workers/bundle';
import type { LinkHealth, LinkWorkerData, WorkerMessage } from './protocol';
import type { StartPlcLinkInput } from './schemas';

/**
 * PLC-link sessions of this server process. Each session is one worker thread (the cell in
 * real time and its Modbus TCP server, lib/plc-link/link-worker.ts); the app's event loop only
 * passes messages, stores the PLC's writes as a run (mode 'plc-link', one batch about every
 * two seconds) and keeps the last reported state for the session page.
 *
 * A session is bound to the process that owns its TCP port, so its live state lives here and
 * not in PostgreSQL; the stored run is what outlives it. Workers are unref'd and die with the
 * process, so a session never outlives the server. A session stops when its owner asks, signs
 * out (their session generation moves on) or is disabled, or when nobody has viewed it for
 * PLC_LINK_IDLE_MINUTES.
 */

export type SessionStatus = 'starting' | 'running' | 'stopped' | 'failed';

interface Session {
  id: string;
  runId: string | null;
  ownerId: string;
  ownerGeneration: number;
  cellId: string;
  cellName: string;
  cellVersion: number;
  host: string;
  port: number;
  linkTimeoutMs: number;
  startedAt: string;
  status: SessionStatus;
  stopReason: string | null;
  /** When it stopped or failed (Date.now()), for how long it stays listed. */
  endedAt: number | null;
  worker: Worker | null;
  map: RegisterMapRow[];
  snapshot: CellSnapshot | null;
  health: LinkHealth | null;
  timeMs: number;
  pending: LoggedEvent[];
  seq: number;
  lastFlushAt: number;
  flushing: Promise<void>;
  lastViewedAt: number;
  stopped: Promise<void> | null;
}

/** What the session page and the API show. */
export interface PlcLinkView {
  id: string;
  runId: string | null;
  cellId: string;
  cellName: string;
  cellVersion: number;
  host: string;
  port: number;
  linkTimeoutMs: number;
  startedAt: string;
  status: SessionStatus;
  stopReason: string | null;
  timeMs: number;
  health: LinkHealth | null;
  snapshot: CellSnapshot | null;
}

interface HostState {
  sessions: Map<string, Session>;
  watch: NodeJS.Timeout | null;
  workerBuilt: boolean;
}

const g = globalThis as unknown as { cellwrightPlcLinks?: HostState };
function state(): HostState {
  g.cellwrightPlcLinks ??= { sessions: new Map(), watch: null, workerBuilt: false };
  return g.cellwrightPlcLinks;
}

const FLUSH_EVERY_MS = 2000;
const START_TIMEOUT_MS = 5000;
const STOP_TIMEOUT_MS = 3000;
/** Finished sessions stay visible (status and reason) for this long, then only their run remains. */
const KEEP_FINISHED_MS = 30 * 60_000;

const live = (s: Session) => s.status === 'starting' || s.status === 'running';

export function viewOf(s: Session): PlcLinkView {
  return {
    id: s.id,
    runId: s.runId,
    cellId: s.cellId,
    cellName: s.cellName,
    cellVersion: s.cellVersion,
    host: s.host,
    port: s.port,
    linkTimeoutMs: s.linkTimeoutMs,
    startedAt: s.startedAt,
    status: s.status,
    stopReason: s.stopReason,
    timeMs: s.timeMs,
    health: s.health,
    snapshot: s.snapshot,
  };
}

function flush(s: Session, untilMs: number, force = false): Promise<void> {
  const runId = s.runId;
  if (!runId) return s.flushing;
  if (!force && (s.pending.length === 0 || Date.now() - s.lastFlushAt < FLUSH_EVERY_MS)) return s.flushing;
  const events = s.pending.splice(0);
  s.lastFlushAt = Date.now();
  const seq = ++s.seq;
  s.flushing = s.flushing
    .then(async () => {
      const r = await insertBatch(runId, { seq, key: `plc-link:${s.id}:${seq}`, untilMs, events });
      if (!r.ok) console.error(`plc-link ${s.id}: batch ${seq} not stored (${r.reason})`);
    })
    .catch((err) => console.error(`plc-link ${s.id}: storing batch ${seq} failed`, err));
  return s.flushing;
}

function onMessage(s: Session, m: WorkerMessage): void {
  if (m.type === 'state') {
    s.snapshot = m.snapshot;
    s.health = m.health;
    s.timeMs = m.timeMs;
    s.pending.push(...m.events);
    void flush(s, m.timeMs);
  } else if (m.type === 'stopped') {
    s.timeMs = m.timeMs;
    s.pending.push(...m.events);
    void flush(s, m.timeMs, true);
  }
}

function finish(s: Session, status: 'stopped' | 'failed', reason: string): void {
  if (!live(s)) return;
  s.status = status;
  s.stopReason = reason;
  s.endedAt = Date.now();
  if (s.health) s.health = { ...s.health, linked: false };
}

/** The sessions this process runs now (starting or running). */
function activeSessions(): Session[] {
  return [...state().sessions.values()].filter(live);
}

function ensureWatch(): void {
  const st = state();
  if (st.watch) return;
  st.watch = setInterval(() => void watch(), 5000);
  st.watch.unref();
}

async function watch(): Promise<void> {
  const { PLC_LINK_IDLE_MINUTES } = plcLinkSettings();
  const now = Date.now();
  for (const [id, s] of state().sessions) {
    if (!live(s)) {
      if (s.endedAt !== null && now - s.endedAt > KEEP_FINISHED_MS && !s.worker) state().sessions.delete(id);
      continue;
    }
    if (now - s.lastViewedAt > PLC_LINK_IDLE_MINUTES * 60_000) {
      await stopSession(s, 'stopped: nobody viewed the session for the idle timeout').catch(() => {});
      continue;
    }
    const owner = await findSessionUser(s.ownerId).catch(() => undefined);
    if (owner === undefined) continue; // database unreachable: check again next round
    if (!owner || owner.user.disabled || owner.sessionGeneration !== s.ownerGeneration) {
      await stopSession(s, 'stopped: its owner signed out').catch(() => {});
    }
  }
}

function stopSession(s: Session, reason: string): Promise<void> {
  if (s.stopped) return s.stopped;
  const worker = s.worker;
  s.stopped = (async () => {
    if (worker) {
      const exited = new Promise<void>((resolve) => worker.once('exit', () => resolve()));
      worker.postMessage({ type: 'stop' });
      const timer = setTimeout(() => void worker.terminate(), STOP_TIMEOUT_MS);
      await exited;
      clearTimeout(timer);
    }
    finish(s, 'stopped', reason);
    s.worker = null;
    await flush(s, s.timeMs, true);
  })();
  return s.stopped;
}

function workerFile(): string {
  const st = state();
  const rebuild = process.env.NODE_ENV !== 'production' && !st.workerBuilt;
  st.workerBuilt = true;
  return pathToFileURL(ensureBundle(PLC_LINK_WORKER, rebuild)).href;
}

function conflictOnPort(port: number, host: string): ApiError | null {
  const holder = activeSessions().find((s) => s.port === port);
  if (!holder) return null;
  return new ApiError(409, `Port ${port} is held by PLC-link session ${holder.id} (cell "${holder.cellName}"). Stop that session or pick another port.`, { port: [`Port ${port} is in use on ${host}.`] }, { body: { sessionId: holder.id } });
}

/** Starts a PLC-link session on a cell the user may read. */
export async function startSession(user: User, input: StartPlcLinkInput): Promise<PlcLinkView> {
  const settings = plcLinkSettings();
  const { cell } = await cellForReader(user, input.cellId);
  const version = await getVersion(cell.id);
  if (!version) throw new ApiError(404, 'No such cell.');
  const owner = await findSessionUser(user.id);
  if (!owner) throw new ApiError(401, 'Sign in first.');
  const map = registerMap(version.document);
  if (map.length === 0) throw new ApiError(422, 'This cell has no PLC addresses to link.', { cellId: ['The cell has no PLC modules or PLC wiring.'] });

  // Checks and the reservation run with no await between them, so two starts cannot both pass.
  const mine = activeSessions().filter((s) => s.ownerId === user.id);
  if (mine.length >= settings.PLC_LINK_MAX_PER_USER) {
    throw new ApiError(409, `You already run ${mine.length} PLC-link session${mine.length === 1 ? '' : 's'} (the limit is ${settings.PLC_LINK_MAX_PER_USER}); stop one first.`, undefined, { body: { sessionId: mine[0].id } });
  }
  const conflict = conflictOnPort(input.port, settings.PLC_LINK_INTERFACE);
  if (conflict) throw conflict;
  if (activeSessions().length >= settings.PLC_LINK_MAX_SESSIONS) throw busy('This server runs as many PLC-link sessions as it allows; try again later.', 30);

  const s: Session = {
    id: randomUUID(),
    runId: null,
    ownerId: user.id,
    ownerGeneration: owner.sessionGeneration,
    cellId: cell.id,
    cellName: cell.name,
    cellVersion: version.version,
    host: settings.PLC_LINK_INTERFACE,
    port: input.port,
    linkTimeoutMs: input.linkTimeoutMs,
    startedAt: new Date().toISOString(),
    status: 'starting',
    stopReason: null,
    endedAt: null,
    worker: null,
    map,
    snapshot: null,
    health: null,
    timeMs: 0,
    pending: [],
    seq: 0,
    lastFlushAt: 0,
    flushing: Promise.resolve(),
    lastViewedAt: Date.now(),
    stopped: null,
  };
  state().sessions.set(s.id, s);
  ensureWatch();

  const data: LinkWorkerData = { sessionId: s.id, document: version.document, host: s.host, port: s.port, linkTimeoutMs: s.linkTimeoutMs };
  let worker: Worker;
  try {
    worker = new Worker(new URL(workerFile()), { workerData: data });
  } catch (err) {
    finish(s, 'failed', 'the link could not start');
    throw err;
  }
  worker.unref();
  s.worker = worker;
  const started = await new Promise<WorkerMessage | { type: 'timeout' } | { type: 'exit' }>((resolve) => {
    const timer = setTimeout(() => resolve({ type: 'timeout' }), START_TIMEOUT_MS);
    const first = (m: WorkerMessage) => {
      if (m.type === 'listening' || m.type === 'failed') {
        clearTimeout(timer);
        worker.off('message', first);
        resolve(m);
      }
    };
    worker.on('message', first);
    worker.once('error', (err) => {
      console.error(`plc-link ${s.id}: worker error`, err);
      clearTimeout(timer);
      resolve({ type: 'exit' });
    });
  });
  if (started.type !== 'listening') {
    finish(s, 'failed', started.type === 'failed' ? started.message : 'the link could not start');
    s.worker = null;
    await worker.terminate();
    if (started.type === 'failed' && started.code === 'EADDRINUSE') {
      throw new ApiError(409, `Port ${s.port} on ${s.host} is in use by another program.`, { port: [`Port ${s.port} is in use.`] });
    }
    if (started.type === 'failed' && started.code === 'EACCES') {
      throw new ApiError(422, `This server may not listen on port ${s.port}.`, { port: ['Pick a port from 1024 up.'] });
    }
    throw new Error(`plc-link ${s.id} did not start: ${started.type === 'failed' ? started.message : started.type}`);
  }

  try {
    const run = await createRun({ userId: user.id, mode: 'practice', cellId: cell.id, cellVersion: version.version, seed: version.document.seed });
    s.runId = run.id;
  } catch (err) {
    await stopSession(s, 'failed: the run could not be stored');
    s.status = 'failed';
    throw err;
  }
  s.status = 'running';
  worker.on('message', (m: WorkerMessage) => onMessage(s, m));
  worker.on('error', (err) => console.error(`plc-link ${s.id}: worker error`, err));
  worker.on('exit', () => {
    if (live(s) && !s.stopped) {
      finish(s, 'failed', 'the link stopped unexpectedly');
      s.worker = null;
      void flush(s, s.timeMs, true);
    }
  });
  return viewOf(s);
}

/** A session of this user's (404 for anybody else's or an unknown id); marks it viewed. */
export function sessionForOwner(user: User, id: string): Session {
  const s = state().sessions.get(id);
  if (!s || s.ownerId !== user.id) throw new ApiError(404, 'No such PLC-link session on this server.');
  if (live(s)) s.lastViewedAt = Date.now();
  return s;
}

/** Stops a session (idempotent) and returns its final view. */
export async function stopOwnSession(user: User, id: string): Promise<PlcLinkView> {
  const s = sessionForOwner(user, id);
  if (live(s)) await stopSession(s, 'stopped by its owner');
  else await s.flushing;
  return viewOf(s);
}

/** The user's sessions known to this process, newest first. */
export function sessionsOf(user: User): PlcLinkView[] {
  return [...state().sessions.values()].filter((s) => s.ownerId === user.id).sort((a, b) => b.startedAt.localeCompare(a.startedAt)).map(viewOf);
}

export function sessionMap(s: Session): RegisterMapRow[] {
  return s.map;
}

/** Stops every session of this process (tests, shutdown). */
export async function stopAllSessions(reason = 'stopped: the server is shutting down'): Promise<void> {
  await Promise.all(activeSessions().map((s) => stopSession(s, reason)));
}

/** Runs one watch round now (tests: sign-out and idle without waiting for the timer). */
export function watchNow(): Promise<void> {
  return watch();
}
