import 'server-only';
import pg, { type Client } from 'pg';
import { JOB_EVENTS_CHANNEL, JOB_STATES, type JobEvent } from './types';

/**
 * One shared `LISTEN cellwright_jobs` connection per process, fanned out to every subscriber
 * (each open progress stream, the worker's wake-ups). Every app process has its own, so behind
 * a load balancer each process hears every job change, whichever process or worker made it.
 *
 * The connection is a dedicated `pg` client (a pooled one could be handed to someone else
 * mid-LISTEN). When it fails it is replaced, with a growing pause (0.5 s up to 15 s); once the
 * new one listens, subscribers are told to resynchronise (`onResync`), since changes made in
 * between were not heard. A silent network drop is caught by TCP keepalive and a ping every
 * 30 s.
 */

export interface JobEventSubscriber {
  onEvent(event: JobEvent): void;
  /** The connection was replaced: events may have been missed; read the current state again. */
  onResync?(): void;
}

interface ListenerState {
  url: string;
  client: Client | null;
  connecting: Promise<void> | null;
  subscribers: Set<JobEventSubscriber>;
  retryMs: number;
  retryTimer: NodeJS.Timeout | null;
  pingTimer: NodeJS.Timeout | null;
  /** Set once a connection has listened: the next one must resynchronise subscribers. */
  listenedBefore: boolean;
  closed: boolean;
}

const g = globalThis as unknown as { cellwrightJobListener?: ListenerState };

const STATE_SET = new Set<string>(JOB_STATES);

/** A NOTIFY payload as a JobEvent, or null when it is not one. */
export function parseJobEvent(payload: string | undefined): JobEvent | null {
  if (!payload) return null;
  try {
    const e = JSON.parse(payload) as Partial<JobEvent>;
    if (typeof e.id !== 'string' || typeof e.subject !== 'string' || typeof e.kind !== 'string' || !STATE_SET.has(e.state as string)) return null;
    const p = e.progress ?? { done: 0, total: 0, note: '' };
    return {
      id: e.id,
      kind: e.kind,
      subject: e.subject,
      state: e.state!,
      progress: { done: Number(p.done) || 0, total: Number(p.total) || 0, note: String(p.note ?? '') },
      attempts: Number(e.attempts) || 0,
      version: Number(e.version) || 0,
    };
  } catch {
    return null;
  }
}

function fanOut(s: ListenerState, call: (sub: JobEventSubscriber) => void): void {
  for (const sub of [...s.subscribers]) {
    try {
      call(sub);
    } catch (err) {
      console.error('[jobs] a job event subscriber failed', err);
    }
  }
}

function scheduleReconnect(s: ListenerState): void {
  if (s.closed || s.retryTimer || s.subscribers.size === 0) return;
  const wait = s.retryMs;
  s.retryMs = Math.min(15_000, s.retryMs * 2);
  s.retryTimer = setTimeout(() => {
    s.retryTimer = null;
    void connect(s);
  }, wait);
  s.retryTimer.unref();
}

function dropClient(s: ListenerState, client: Client): void {
  if (s.client !== client) return;
  s.client = null;
  if (s.pingTimer) clearInterval(s.pingTimer);
  s.pingTimer = null;
  client.removeAllListeners('notification');
  client.on('error', () => undefined);
  void client.end().catch(() => undefined);
  scheduleReconnect(s);
}

function connect(s: ListenerState): Promise<void> {
  if (s.client || s.closed) return Promise.resolve();
  s.connecting ??= (async () => {
    const client = new pg.Client({ connectionString: s.url, keepAlive: true, application_name: 'cellwright-job-events' });
    client.on('error', (err) => {
      console.error('[jobs] job event connection failed:', err.message);
      dropClient(s, client);
    });
    client.on('end', () => dropClient(s, client));
    client.on('notification', (msg) => {
      if (msg.channel !== JOB_EVENTS_CHANNEL) return;
      const event = parseJobEvent(msg.payload);
      if (event) fanOut(s, (sub) => sub.onEvent(event));
    });
    try {
      await client.connect();
      await client.query(`LISTEN ${JOB_EVENTS_CHANNEL}`);
    } catch (err) {
      console.error('[jobs] could not listen for job events:', err instanceof Error ? err.message : err);
      client.removeAllListeners('end');
      client.on('error', () => undefined);
      void client.end().catch(() => undefined);
      scheduleReconnect(s);
      return;
    }
    if (s.closed) {
      void client.end().catch(() => undefined);
      return;
    }
    s.client = client;
    s.retryMs = 500;
    s.pingTimer = setInterval(() => {
      client.query('select 1').catch(() => dropClient(s, client));
    }, 30_000);
    s.pingTimer.unref();
    if (s.listenedBefore) fanOut(s, (sub) => sub.onResync?.());
    s.listenedBefore = true;
  })().finally(() => {
    s.connecting = null;
  });
  return s.connecting;
}

function state(url: string): ListenerState {
  if (g.cellwrightJobListener && !g.cellwrightJobListener.closed && g.cellwrightJobListener.url === url) return g.cellwrightJobListener;
  g.cellwrightJobListener = {
    url,
    client: null,
    connecting: null,
    subscribers: new Set(),
    retryMs: 500,
    retryTimer: null,
    pingTimer: null,
    listenedBefore: false,
    closed: false,
  };
  return g.cellwrightJobListener;
}

/**
 * Subscribes to every job change in the database at `databaseUrl`. Resolves once this
 * process's connection listens (or, if it cannot yet, once it has tried; it keeps retrying
 * and calls `onResync` when it is back), with the function that unsubscribes.
 */
export async function subscribeJobEvents(databaseUrl: string, subscriber: JobEventSubscriber): Promise<() => void> {
  const s = state(databaseUrl);
  s.subscribers.add(subscriber);
  await connect(s);
  return () => {
    s.subscribers.delete(subscriber);
  };
}

/** True while this process's job event connection is listening (tests and diagnostics). */
export function jobEventsListening(): boolean {
  return Boolean(g.cellwrightJobListener?.client);
}

/** Closes the connection and forgets every subscriber (tests, the worker's shutdown). */
export async function closeJobEvents(): Promise<void> {
  const s = g.cellwrightJobListener;
  g.cellwrightJobListener = undefined;
  if (!s) return;
  s.closed = true;
  s.subscribers.clear();
  if (s.retryTimer) clearTimeout(s.retryTimer);
  if (s.pingTimer) clearInterval(s.pingTimer);
  await s.connecting?.catch(() => undefined);
  const c = s.client;
  s.client = null;
  if (c) {
    c.removeAllListeners('end');
    c.on('error', () => undefined);
    await c.end().catch(() => undefined);
  }
}

/** Test hook: breaks the current connection as a network failure would, to exercise the reconnect. */
export function breakJobEventsConnection(): void {
  const s = g.cellwrightJobListener;
  const c = s?.client;
  if (!s || !c) return;
  const stream = (c as unknown as { connection?: { stream?: { destroy(err?: Error): void } } }).connection?.stream;
  if (stream) stream.destroy(new Error('connection broken on purpose (test)'));
  else dropClient(s, c);
}
