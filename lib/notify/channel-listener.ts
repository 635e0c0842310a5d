import 'server-only';
import pg, { type Client } from 'pg';

/**
 * One shared `LISTEN <channel>` connection per process and channel, fanned out to every
 * subscriber in the process (open SSE streams, the job worker's wake-ups). Every app process
 * has its own, so behind a load balancer each process hears every NOTIFY, whichever process or
 * worker sent it. Used by the job queue (lib/jobs/listener.ts) and the live board
 * (lib/live/listener.ts).
 *
 * The connection is a dedicated `pg` client (a pooled one could be handed to someone else
 * mid-LISTEN). When it fails it is replaced, with a growing pause (0.5 s up to 15 s); once the
 * new one listens, subscribers are told to resynchronise (`onResync`), since notifications sent
 * in between were not heard. A silent network drop is caught by TCP keepalive and a ping every
 * 30 s.
 */
export interface ChannelSubscriber<T> {
  onMessage(message: T): void;
  /** The connection was replaced: messages may have been missed; read the current state again. */
  onResync?(): void;
}

export interface ChannelListener<T> {
  /** Subscribes; resolves once this process listens (or, if it cannot yet, has tried), with the unsubscribe. */
  subscribe(databaseUrl: string, subscriber: ChannelSubscriber<T>): Promise<() => void>;
  /** True while the connection is listening. */
  listening(): boolean;
  /** Closes the connection and forgets every subscriber (tests, shutdown). */
  close(): Promise<void>;
  /** Test hook: breaks the connection as a network failure would, to exercise the reconnect. */
  breakConnection(): void;
}

interface State<T> {
  url: string;
  client: Client | null;
  connecting: Promise<void> | null;
  subscribers: Set<ChannelSubscriber<T>>;
  retryMs: number;
  retryTimer: NodeJS.Timeout | null;
  pingTimer: NodeJS.Timeout | null;
  /** Set once a connection has listened: the next one must resynchronise subscribers. */
  listenedBefore: boolean;
  closed: boolean;
}

const g = globalThis as unknown as { cellwrightChannelListeners?: Map<string, State<unknown>> };

/**
 * The listener of `channel` (a fixed identifier of ours, never user input), turning each
 * payload into a message with `parse` (null drops it). `name` labels the connection and logs.
 */
export function channelListener<T>(channel: string, name: string, parse: (payload: string | undefined) => T | null): ChannelListener<T> {
  if (!/^[a-z_]+$/.test(channel)) throw new Error(`not a channel name: ${channel}`);
  const states = (g.cellwrightChannelListeners ??= new Map());
  const current = () => states.get(channel) as State<T> | undefined;

  const fanOut = (s: State<T>, call: (sub: ChannelSubscriber<T>) => void) => {
    for (const sub of [...s.subscribers]) {
      try {
        call(sub);
      } catch (err) {
        console.error(`[${name}] a subscriber failed`, err);
      }
    }
  };

  const scheduleReconnect = (s: State<T>) => {
    if (s.closed || s.retryTimer || s.subscribers.size === 0) return;
    const wait = s.retryMs;
    s.retryMs = Math.min(15_000, s.retryMs * 2);
    s.retryTimer = setTimeout(() => {
      s.retryTimer = null;
      void connect(s);
    }, wait);
    s.retryTimer.unref();
  };

  const dropClient = (s: State<T>, client: Client) => {
    if (s.client !== client) return;
    s.client = null;
    if (s.pingTimer) clearInterval(s.pingTimer);
    s.pingTimer = null;
    client.removeAllListeners('notification');
    client.on('error', () => undefined);
    void client.end().catch(() => undefined);
    scheduleReconnect(s);
  };

  const connect = (s: State<T>): Promise<void> => {
    if (s.client || s.closed) return Promise.resolve();
    s.connecting ??= (async () => {
      const client = new pg.Client({ connectionString: s.url, keepAlive: true, application_name: `cellwright-${name}` });
      client.on('error', (err) => {
        console.error(`[${name}] event connection failed:`, err.message);
        dropClient(s, client);
      });
      client.on('end', () => dropClient(s, client));
      client.on('notification', (msg) => {
        if (msg.channel !== channel) return;
        const m = parse(msg.payload);
        if (m !== null) fanOut(s, (sub) => sub.onMessage(m));
      });
      try {
        await client.connect();
        await client.query(`LISTEN ${channel}`);
      } catch (err) {
        console.error(`[${name}] could not listen:`, err instanceof Error ? err.message : err);
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
  };

  return {
    async subscribe(databaseUrl, subscriber) {
      let s = current();
      if (!s || s.closed || s.url !== databaseUrl) {
        s = { url: databaseUrl, client: null, connecting: null, subscribers: new Set(), retryMs: 500, retryTimer: null, pingTimer: null, listenedBefore: false, closed: false };
        states.set(channel, s as State<unknown>);
      }
      const st = s;
      st.subscribers.add(subscriber);
      await connect(st);
      return () => {
        st.subscribers.delete(subscriber);
      };
    },
    listening() {
      return Boolean(current()?.client);
    },
    async close() {
      const s = current();
      states.delete(channel);
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
    },
    breakConnection() {
      const s = current();
      const c = s?.client;
      if (!s || !c) return;
      const stream = (c as unknown as { connection?: { stream?: { destroy(err?: Error): void } } }).connection?.stream;
      if (stream) stream.destroy(new Error('connection broken on purpose (test)'));
      else dropClient(s, c);
    },
  };
}
