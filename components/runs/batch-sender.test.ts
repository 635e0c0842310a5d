import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { LoggedEvent } from '@/simulator';
import { createBatchSender, rejectedIndexes, type Batch, type SenderClock } from './batch-sender';

/**
 * A fake server for POST /api/runs/[id]/batches that behaves as the route documents: one
 * stored batch per idempotency key (a repeat answers 200 with `duplicate`), seq without gaps
 * (409 otherwise), and scripted failures before or after storing.
 */
function fakeServer() {
  const stored: Batch[] = [];
  const byKey = new Map<string, Batch>();
  const requests: Batch[] = [];
  /** Next answers to force: 'drop-before' (connection lost, nothing stored), 'drop-after' (stored, answer lost), a status, or a full response. */
  const script: ('drop-before' | 'drop-after' | number | { status: number; body: unknown })[] = [];
  const fetch = vi.fn(async (_url: string, init?: RequestInit) => {
    const batch = JSON.parse(String(init?.body)) as Batch;
    requests.push(batch);
    const step = script.shift();
    if (step === 'drop-before') throw new TypeError('Failed to fetch');
    if (typeof step === 'number') return new Response(JSON.stringify({ error: `scripted ${step}` }), { status: step });
    if (step && typeof step === 'object') return new Response(JSON.stringify(step.body), { status: step.status });
    const same = byKey.get(batch.key);
    if (same) return Response.json({ seq: same.seq, duplicate: true }, { status: 200 });
    const expected = (stored.at(-1)?.seq ?? 0) + 1;
    if (batch.seq !== expected) return Response.json({ error: `Expected batch ${expected}.`, fields: { seq: [`expected ${expected}`] } }, { status: 409 });
    stored.push(batch);
    byKey.set(batch.key, batch);
    if (step === 'drop-after') throw new TypeError('network connection was lost');
    return Response.json({ seq: batch.seq, duplicate: false }, { status: 201 });
  });
  return { stored, requests, script, fetch: fetch as unknown as typeof globalThis.fetch, calls: fetch };
}

const clock: SenderClock = {
  now: () => Date.now(),
  setTimeout: (fn, ms) => setTimeout(fn, ms),
  clearTimeout: (h) => clearTimeout(h as ReturnType<typeof setTimeout>),
};

const press = (t: number, device = 'start'): LoggedEvent => ({ t, event: { type: 'press', device } });

let keys = 0;
const makeKey = (seq: number) => `run-1.${seq}.k${++keys}`;

beforeEach(() => {
  vi.useFakeTimers();
  keys = 0;
});
afterEach(() => vi.useRealTimers());

describe('batch sender', () => {
  it('sends queued events as one batch with seq 1, its key and the cell time reached', async () => {
    const server = fakeServer();
    const s = createBatchSender({ runId: 'run-1', fetch: server.fetch, clock, storedSeq: 0, storedUntilMs: 0, makeKey, eventDelayMs: 50 });
    s.push(press(100));
    s.push(press(120, 'stop'));
    s.advanceTo(130);
    await vi.advanceTimersByTimeAsync(60);
    expect(server.stored).toHaveLength(1);
    expect(server.stored[0]).toEqual({ key: 'run-1.1.k1', seq: 1, untilMs: 130, events: [press(100), press(120, 'stop')] });
    expect(s.getState()).toMatchObject({ storedSeq: 1, storedUntilMs: 130, pending: 0, fatal: null });
  });

  it('stores only the cell time while nothing happens, every flush period', async () => {
    const server = fakeServer();
    const s = createBatchSender({ runId: 'run-1', fetch: server.fetch, clock, storedSeq: 0, storedUntilMs: 0, makeKey, flushEveryMs: 1000 });
    s.advanceTo(900);
    await vi.advanceTimersByTimeAsync(1000);
    expect(server.stored.map((b) => [b.seq, b.untilMs, b.events.length])).toEqual([[1, 900, 0]]);
    // Nothing new: no empty batch.
    await vi.advanceTimersByTimeAsync(3000);
    expect(server.stored).toHaveLength(1);
    s.advanceTo(2500);
    await vi.advanceTimersByTimeAsync(1000);
    expect(server.stored.map((b) => [b.seq, b.untilMs])).toEqual([
      [1, 900],
      [2, 2500],
    ]);
  });

  it('retries a dropped connection with the same key and backoff 500, 1000, 2000 ms', async () => {
    const server = fakeServer();
    server.script.push('drop-before', 'drop-before', 503);
    const s = createBatchSender({ runId: 'run-1', fetch: server.fetch, clock, storedSeq: 0, storedUntilMs: 0, makeKey, eventDelayMs: 10, firstBackoffMs: 500, random: () => 0 });
    s.push(press(5));
    await vi.advanceTimersByTimeAsync(10);
    expect(server.requests).toHaveLength(1);
    expect(s.getState().attempt).toBe(1);
    await vi.advanceTimersByTimeAsync(499);
    expect(server.requests).toHaveLength(1);
    await vi.advanceTimersByTimeAsync(1);
    expect(server.requests).toHaveLength(2);
    await vi.advanceTimersByTimeAsync(1000);
    expect(server.requests).toHaveLength(3);
    await vi.advanceTimersByTimeAsync(2000);
    expect(server.requests).toHaveLength(4);
    expect(new Set(server.requests.map((r) => r.key))).toEqual(new Set(['run-1.1.k1']));
    expect(server.stored).toHaveLength(1);
    expect(s.getState()).toMatchObject({ storedSeq: 1, attempt: 0, lastError: null });
  });

  // Exponential backoff with jitter: common practice for clients that may fail together. A
  // fraction f shortens a delay d to d - floor(f × d / 2): never below half of it.
  it.each([
    { fraction: 0.5, delays: [375, 750] },
    { fraction: 0.999999, delays: [251, 501] },
  ])('with a jitter fraction of $fraction the retries wait $delays ms', async ({ fraction, delays }) => {
    const server = fakeServer();
    server.script.push('drop-before', 'drop-before');
    const s = createBatchSender({ runId: 'run-1', fetch: server.fetch, clock, storedSeq: 0, storedUntilMs: 0, makeKey, eventDelayMs: 10, firstBackoffMs: 500, random: () => fraction });
    s.push(press(5));
    await vi.advanceTimersByTimeAsync(10);
    for (const [i, delay] of delays.entries()) {
      await vi.advanceTimersByTimeAsync(delay - 1);
      expect(server.requests).toHaveLength(i + 1);
      await vi.advanceTimersByTimeAsync(1);
      expect(server.requests).toHaveLength(i + 2);
    }
    expect(server.stored).toHaveLength(1);
  });

  it('stores a batch once when the answer is lost after storing, and continues with seq 2', async () => {
    const server = fakeServer();
    server.script.push('drop-after');
    const s = createBatchSender({ runId: 'run-1', fetch: server.fetch, clock, storedSeq: 0, storedUntilMs: 0, makeKey, eventDelayMs: 10, firstBackoffMs: 200, random: () => 0 });
    s.push(press(5));
    await vi.advanceTimersByTimeAsync(10);
    expect(server.stored).toHaveLength(1);
    expect(s.getState().storedSeq).toBe(0);
    await vi.advanceTimersByTimeAsync(200);
    // The retry carried the same key: the server answered "duplicate" and stored nothing new.
    expect(server.requests.map((r) => r.key)).toEqual(['run-1.1.k1', 'run-1.1.k1']);
    expect(server.stored).toHaveLength(1);
    expect(s.getState().storedSeq).toBe(1);
    s.push(press(40, 'stop'));
    await vi.advanceTimersByTimeAsync(10);
    expect(server.stored.map((b) => b.seq)).toEqual([1, 2]);
  });

  it('continues a resumed run after its last stored batch', async () => {
    const server = fakeServer();
    for (let seq = 1; seq <= 4; seq++) server.stored.push({ key: `old-${seq}`, seq, untilMs: seq * 1000, events: [] });
    const s = createBatchSender({ runId: 'run-1', fetch: server.fetch, clock, storedSeq: 4, storedUntilMs: 4000, makeKey, eventDelayMs: 10 });
    s.push(press(4100));
    await vi.advanceTimersByTimeAsync(10);
    expect(server.stored.at(-1)).toMatchObject({ seq: 5, untilMs: 4100 });
  });

  it('drops the events a 422 names, reports them, and sends the rest under a new key', async () => {
    const server = fakeServer();
    server.script.push({ status: 422, body: { error: 'Some events cannot be logged.', fields: { 'events.1.event.type': ['This drill does not allow forcing.'] } } });
    const rejected = vi.fn();
    const stored = vi.fn();
    const s = createBatchSender({ runId: 'run-1', fetch: server.fetch, clock, storedSeq: 0, storedUntilMs: 0, makeKey, eventDelayMs: 10, onRejected: rejected, onStored: stored });
    const force: LoggedEvent = { t: 20, event: { type: 'force', target: '%IX0.0', value: 1 } };
    s.push(press(10));
    s.push(force);
    s.push(press(30, 'stop'));
    const done = s.flush();
    await vi.advanceTimersByTimeAsync(0);
    await done;
    expect(rejected).toHaveBeenCalledWith([force], 'This drill does not allow forcing.');
    expect(server.stored).toHaveLength(1);
    expect(server.stored[0].events).toEqual([press(10), press(30, 'stop')]);
    // Only what the server stored is reported as stored (a remote run settles downloads by it).
    expect(stored).toHaveBeenCalledTimes(1);
    expect(stored).toHaveBeenCalledWith([press(10), press(30, 'stop')]);
    expect(server.stored[0].key).not.toBe(server.requests[0].key);
    expect(server.stored[0].seq).toBe(1);
  });

  it('ends the stream on 403 (drill closed) and rejects flush', async () => {
    const server = fakeServer();
    server.script.push(403);
    const s = createBatchSender({ runId: 'run-1', fetch: server.fetch, clock, storedSeq: 0, storedUntilMs: 0, makeKey, eventDelayMs: 10 });
    s.push(press(10));
    const done = expect(s.flush()).rejects.toThrow('scripted 403');
    await vi.advanceTimersByTimeAsync(0);
    await done;
    expect(s.getState().fatal).toBe('closed');
    s.push(press(20));
    await vi.advanceTimersByTimeAsync(10_000);
    expect(server.requests).toHaveLength(1);
  });

  it('marks a 409 naming a submitted run as submitted', async () => {
    const server = fakeServer();
    server.script.push({ status: 409, body: { error: 'This run has been submitted; it takes no more events.' } });
    const s = createBatchSender({ runId: 'run-1', fetch: server.fetch, clock, storedSeq: 0, storedUntilMs: 0, makeKey, eventDelayMs: 10 });
    s.push(press(10));
    await vi.advanceTimersByTimeAsync(10);
    expect(s.getState().fatal).toBe('submitted');
  });

  it('flush resolves only once queued events and the cell time are stored', async () => {
    const server = fakeServer();
    server.script.push('drop-before');
    const s = createBatchSender({ runId: 'run-1', fetch: server.fetch, clock, storedSeq: 0, storedUntilMs: 0, makeKey, eventDelayMs: 1000, firstBackoffMs: 300, random: () => 0 });
    s.push(press(10));
    s.advanceTo(750);
    let resolved = false;
    void s.flush().then(() => (resolved = true));
    await vi.advanceTimersByTimeAsync(0);
    expect(resolved).toBe(false);
    await vi.advanceTimersByTimeAsync(300);
    expect(resolved).toBe(true);
    expect(server.stored[0]).toMatchObject({ seq: 1, untilMs: 750 });
  });
});

describe('rejectedIndexes', () => {
  it('reads event indexes from field error keys', () => {
    expect(rejectedIndexes({ 'events.3.event.type': ['x'], 'events.0.t': ['y'], untilMs: ['z'], 'events.3.t': ['w'] })).toEqual([0, 3]);
    expect(rejectedIndexes(undefined)).toEqual([]);
  });
});
