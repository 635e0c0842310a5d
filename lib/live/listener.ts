import 'server-only';
import pg, { type Client } from 'pg';
import { LIVE_CHANNEL, type LiveNotice } from './types';

/**
 * One shared `LISTEN cellwright_live` connection per process, fanned out to every open live
 * board and student message stream. The same pattern as the job queue's listener
 * (lib/jobs/listener.ts): a dedicated `pg` client, replaced with a growing pause when it
 * fails, subscribers told to resynchronise once the new one listens, a ping every 30 s. A
 * sibling rather than a second channel on that one, so the job queue's module stays as its
 * engineer wrote and tested it.
 */

export interface LiveSubscriber {
  onNotice(n: LiveNotice): void;
  onResync?(): void;
}

interface State {
  url: string;
  client: Client | null;
  connecting: Promise<void> | null;
  subscribers: Set<LiveSubscriber>;
  retryMs: number;
  retryTimer: NodeJS.Timeout | null;
  pingTimer: NodeJS.Timeout | null;
  listenedBefore: boolean;
  closed: boolean;
}

const g = globalThis as unknown as { cellwrightLiveListener?: State };

/** A NOTIFY payload as a LiveNotice, or null when it is not one. */
export function parseLiveNotice(payload: string | undefined): LiveNotice | null {
  if (!payload) return null;
  try {
    const n = JSON.parse(payload) as Record<string, unknown>;
    if (typeof n.assignmentId !== 'string') return null;
    if (n.kind === 'batch' && typeof n.runId === 'string' && typeof n.userId === 'string')
      return { kind: 'batch', assignmentId: n.assignmentId, runId: n.runId, userId: n.userId, seq: Number(n.seq) || 0, untilMs: Number(n.untilMs) || 0 };
    if (n.kind === 'run' && typeof n.runId === 'string' && typeof n.userId === 'string')
      return { kind: 'run', assignmentId: n.assignmentId, runId: n.runId, userId: n.userId, status: String(n.status) };
    if (n.kind === 'message' && typeof n.messageId === 'string')
      return { kind: 'message', assignmentId: n.assignmentId, messageId: n.messageId, userId: typeof n.userId === 'string' ? n.userId : null };
    return null;
  } catch {
    return null;
  }
}

function fanOut(s: State, call: (sub: LiveSubscriber) => void): void {
  for (const sub of [...s.subscribers]) {
    try {
      call(sub);
    } catch (err) {
      console.error('[live] a subscriber failed', err);
    }
  }
}

function scheduleReconnect(s: State): void {
  if (s.closed || s.retryTimer || s.subscribers.size === 0) return;
  const wait = s.retryMs;
  s.retryMs = Math.min(15_000, s.retryMs * 2);
  s.retryTimer = setTimeout(() => {
    s.retryTimer = null;
    void connect(s);
  }, wait);
  s.retryTimer.unref();
}

function dropClient(s: State, client: Client): void {
  if (s.client !== client) return;
  s.client = null;
  if (s.pingTimer) clearInterval(s.pingTimer);
  s.pingTimer = null;
  client.removeAllListeners('notification');
  client.on('error', () => undefined);
  void client.end().catch(() => undefined);
  scheduleReconnect(s);
}

function connect(s: State): Promise<void> {
  if (s.client || s.closed) return Promise.resolve();
  s.connecting ??= (async () => {
    const client = new pg.Client({ connectionString: s.url, keepAlive: true, application_name: 'cellwright-live-events' });
    client.on('error', (err) => {
      console.error('[live] live event connection failed:', err.message);
      dropClient(s, client);
    });
    client.on('end', () => dropClient(s, client));
    client.on('notification', (msg) => {
      if (msg.channel !== LIVE_CHANNEL) return;
      const n = parseLiveNotice(msg.payload);
      if (n) fanOut(s, (sub) => sub.onNotice(n));
    });
    try {
      await client.connect();
      await client.query(`LISTEN ${LIVE_CHANNEL}`);
    } catch (err) {
      console.error('[live] could not listen for live events:', err instanceof Error ? err.message : err);
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

/** Subscribes to every live notice; resolves once this process listens (or has tried), with the unsubscribe. */
export async function subscribeLive(databaseUrl: string, subscriber: LiveSubscriber): Promise<() => void> {
  if (!g.cellwrightLiveListener || g.cellwrightLiveListener.closed || g.cellwrightLiveListener.url !== databaseUrl) {
    g.cellwrightLiveListener = { url: databaseUrl, client: null, connecting: null, subscribers: new Set(), retryMs: 500, retryTimer: null, pingTimer: null, listenedBefore: false, closed: false };
  }
  const s = g.cellwrightLiveListener;
  s.subscribers.add(subscriber);
  await connect(s);
  return () => {
    s.subscribers.delete(subscriber);
  };
}

/** Closes the connection and forgets every subscriber (tests). */
export async function closeLiveEvents(): Promise<void> {
  const s = g.cellwrightLiveListener;
  g.cellwrightLiveListener = undefined;
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
