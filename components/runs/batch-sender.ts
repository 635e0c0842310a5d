/**
 * Streams a run's event log to POST /api/runs/[id]/batches so no work is lost.
 *
 * - Events are queued with the cell time they happened at; a batch leaves shortly after an
 *   event (so the server's cell hears it at once) and otherwise every `flushEveryMs` carrying
 *   only the cell time reached (`untilMs`), which is the point a reload resumes from.
 * - Each batch gets an idempotency key when it is built; a retry after a dropped connection,
 *   a 5xx or a timeout resends the very same body with the same key, with exponential backoff,
 *   so the server stores it once however many copies arrive.
 * - One batch is in flight at a time, so `seq` never has gaps.
 * - A 422 that names events (the cell or the drill refused them) drops those events, reports
 *   them, and sends the rest under a fresh key (the server stored nothing under the old one).
 * - 401/403/404/409 end the stream: the run is closed, submitted, gone, or someone else wrote it.
 *
 * No DOM, no React: the clock and fetch are passed in, so tests drive it with fakes.
 */
import type { LoggedEvent } from '@/simulator';

/** Timers the sender uses (the browser's, or a test's fake). */
export type SenderClock = {
  now(): number;
  setTimeout(fn: () => void, ms: number): unknown;
  clearTimeout(handle: unknown): void;
};

/** Why the stream stopped for good. */
export type SenderFatal = 'closed' | 'submitted' | 'conflict' | 'signed-out' | 'missing' | 'invalid';

export type SenderState = {
  /** Last batch the server stored. */
  storedSeq: number;
  /** Cell time the server has stored up to. */
  storedUntilMs: number;
  /** Events queued or in flight. */
  pending: number;
  inFlight: boolean;
  /** Failed attempts of the batch in flight (0 when the last attempt worked). */
  attempt: number;
  /** Message of the last failure, for the "saving…" indicator. */
  lastError: string | null;
  fatal: SenderFatal | null;
};

export type Batch = { key: string; seq: number; untilMs: number; events: LoggedEvent[] };

export type BatchSenderOptions = {
  runId: string;
  fetch: typeof fetch;
  clock: SenderClock;
  /** Batches already stored (a resumed run continues after them). */
  storedSeq: number;
  storedUntilMs: number;
  /** Idempotency key of a new batch; tests make it deterministic. */
  makeKey?: (seq: number) => string;
  /** Delay after an event before its batch leaves (collects a burst of clicks into one batch). */
  eventDelayMs?: number;
  /** How often the cell time alone is stored while nothing happens. */
  flushEveryMs?: number;
  /**
   * First retry delay; doubles per failure up to `maxBackoffMs`. Each delay is shortened by a
   * random part of up to half of it (jitter), so the clients of a whole class that lost the
   * server together (a restart) do not all retry in the same millisecond.
   */
  firstBackoffMs?: number;
  maxBackoffMs?: number;
  /** The jitter's source, a fraction in [0, 1): 0 keeps the full delay. Math.random by default; tests fix it. */
  random?: () => number;
  onChange?: (state: SenderState) => void;
  /** Events the server refused, with why (they are not stored). */
  onRejected?: (events: LoggedEvent[], message: string) => void;
  /** Events the server stored (once per batch, in order). */
  onStored?: (events: LoggedEvent[]) => void;
};

export type BatchSender = {
  /** Queues an event at its cell time (never earlier than what was already queued). */
  push(event: LoggedEvent): void;
  /** Records the cell time reached; it is stored with the next batch. */
  advanceTo(untilMs: number): void;
  /** Resolves once everything queued so far, and the cell time reached so far, is stored; rejects when the stream has ended. */
  flush(): Promise<void>;
  getState(): SenderState;
  /** Stops timers; a batch in flight still completes but nothing else is sent. */
  dispose(): void;
};

const TRANSIENT = new Set([408, 425, 429, 500, 502, 503, 504]);

function randomPart(): string {
  const c = (globalThis as { crypto?: Crypto }).crypto;
  if (c?.randomUUID) return c.randomUUID().replace(/-/g, '').slice(0, 12);
  return Math.random().toString(36).slice(2, 14);
}

/** Indexes of events named in a 422's field errors (`events.3.event.type`, `events.0.t`). */
export function rejectedIndexes(fields: Record<string, string[]> | undefined): number[] {
  const out = new Set<number>();
  for (const key of Object.keys(fields ?? {})) {
    const m = /^events\.(\d+)\./.exec(key);
    if (m) out.add(Number(m[1]));
  }
  return [...out].sort((a, b) => a - b);
}

/** Creates a sender for one run. */
export function createBatchSender(opts: BatchSenderOptions): BatchSender {
  const eventDelayMs = opts.eventDelayMs ?? 60;
  const flushEveryMs = opts.flushEveryMs ?? 2000;
  const firstBackoffMs = opts.firstBackoffMs ?? 500;
  const maxBackoffMs = opts.maxBackoffMs ?? 10_000;
  const random = opts.random ?? Math.random;
  const makeKey = opts.makeKey ?? ((seq: number) => `${opts.runId}.${seq}.${randomPart()}`);
  const { clock } = opts;

  let queue: LoggedEvent[] = [];
  let untilMs = opts.storedUntilMs;
  let current: Batch | null = null;
  let disposed = false;
  let timer: unknown = null;
  let timerDue = Infinity;
  let waiters: { until: number; queued: number; resolve: () => void; reject: (e: Error) => void }[] = [];
  let pushedTotal = 0;
  let storedEventsTotal = 0;
  const state: SenderState = {
    storedSeq: opts.storedSeq,
    storedUntilMs: opts.storedUntilMs,
    pending: 0,
    inFlight: false,
    attempt: 0,
    lastError: null,
    fatal: null,
  };

  const changed = () => {
    state.pending = queue.length + (current?.events.length ?? 0);
    opts.onChange?.({ ...state });
  };

  const settleWaiters = () => {
    const done = waiters.filter((w) => storedEventsTotal >= w.queued && state.storedUntilMs >= w.until);
    waiters = waiters.filter((w) => !done.includes(w));
    done.forEach((w) => w.resolve());
  };

  const end = (fatal: SenderFatal, message: string) => {
    state.fatal = fatal;
    state.lastError = message;
    state.inFlight = false;
    if (timer !== null) clock.clearTimeout(timer);
    timer = null;
    const all = waiters;
    waiters = [];
    all.forEach((w) => w.reject(new Error(message)));
    changed();
  };

  /** Runs `pump` after `ms`, unless it is already due sooner. */
  const schedule = (ms: number) => {
    if (disposed || state.fatal) return;
    const due = clock.now() + ms;
    if (timer !== null && timerDue <= due) return;
    if (timer !== null) clock.clearTimeout(timer);
    timerDue = due;
    timer = clock.setTimeout(() => {
      timer = null;
      timerDue = Infinity;
      void pump();
    }, ms);
  };

  const build = (): Batch | null => {
    const lastT = queue.at(-1)?.t ?? 0;
    const until = Math.max(untilMs, lastT, state.storedUntilMs);
    if (queue.length === 0 && until <= state.storedUntilMs) return null;
    const seq = state.storedSeq + 1;
    const batch = { key: makeKey(seq), seq, untilMs: until, events: queue };
    queue = [];
    return batch;
  };

  const pump = async (): Promise<void> => {
    if (state.fatal || state.inFlight) return;
    if (!current) {
      if (disposed) return;
      current = build();
      if (!current) {
        schedule(flushEveryMs);
        return;
      }
    }
    const batch = current;
    state.inFlight = true;
    changed();
    let status = 0;
    let body: { error?: string; fields?: Record<string, string[]> } = {};
    try {
      const res = await opts.fetch(`/api/runs/${opts.runId}/batches`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify(batch),
        credentials: 'same-origin',
      });
      status = res.status;
      const text = await res.text().catch(() => '');
      try {
        body = text ? JSON.parse(text) : {};
      } catch {
        body = {};
      }
    } catch (e) {
      status = 0;
      body = { error: e instanceof Error ? e.message : 'network error' };
    }
    state.inFlight = false;

    if (status >= 200 && status < 300) {
      current = null;
      state.storedSeq = batch.seq;
      state.storedUntilMs = Math.max(state.storedUntilMs, batch.untilMs);
      storedEventsTotal += batch.events.length;
      state.attempt = 0;
      state.lastError = null;
      if (batch.events.length > 0) opts.onStored?.(batch.events);
      changed();
      settleWaiters();
      if (queue.length > 0 || waiters.length > 0) void pump();
      else schedule(flushEveryMs);
      return;
    }
    if (status === 0 || TRANSIENT.has(status)) {
      // Same batch, same key: the server may have stored it already and will say so.
      state.attempt += 1;
      state.lastError = body.error ?? `HTTP ${status}`;
      changed();
      if (!disposed) {
        const full = Math.min(maxBackoffMs, firstBackoffMs * 2 ** (state.attempt - 1));
        schedule(full - Math.floor((random() * full) / 2));
      }
      return;
    }
    if (status === 422) {
      const bad = rejectedIndexes(body.fields);
      if (bad.length === 0) return end('invalid', body.error ?? 'The server refused the batch.');
      const refused = bad.map((i) => batch.events[i]).filter(Boolean);
      const message = bad.flatMap((i) => Object.entries(body.fields ?? {}).filter(([k]) => k.startsWith(`events.${i}.`)).flatMap(([, v]) => v)).join('; ');
      opts.onRejected?.(refused, message || (body.error ?? 'refused'));
      storedEventsTotal += refused.length;
      // Nothing was stored under the old key: rebuild with the remaining events and a new key.
      const rest = batch.events.filter((_, i) => !bad.includes(i));
      current = { ...batch, key: makeKey(batch.seq), events: rest };
      state.attempt = 0;
      changed();
      void pump();
      return;
    }
    if (status === 401) return end('signed-out', 'You are signed out; sign in again to keep saving.');
    if (status === 403) return end('closed', body.error ?? 'This run is closed.');
    if (status === 404) return end('missing', body.error ?? 'The run no longer exists.');
    if (status === 409) return end(/submitted/i.test(body.error ?? '') ? 'submitted' : 'conflict', body.error ?? 'Another window is writing this run.');
    return end('invalid', body.error ?? `HTTP ${status}`);
  };

  schedule(flushEveryMs);

  return {
    push(event) {
      if (disposed || state.fatal) return;
      queue.push(event);
      pushedTotal += 1;
      untilMs = Math.max(untilMs, event.t);
      changed();
      schedule(eventDelayMs);
    },
    advanceTo(t) {
      untilMs = Math.max(untilMs, Math.floor(t));
    },
    flush() {
      if (state.fatal) return Promise.reject(new Error(state.lastError ?? 'the run is no longer saved'));
      const waiter = new Promise<void>((resolve, reject) => waiters.push({ until: Math.max(untilMs, queue.at(-1)?.t ?? 0), queued: pushedTotal, resolve, reject }));
      settleWaiters();
      if (!state.inFlight) {
        if (timer !== null) clock.clearTimeout(timer);
        timer = null;
        timerDue = Infinity;
        void pump();
      }
      return waiter;
    },
    getState: () => ({ ...state, pending: queue.length + (current?.events.length ?? 0) }),
    dispose() {
      disposed = true;
      if (timer !== null) clock.clearTimeout(timer);
      timer = null;
    },
  };
}
