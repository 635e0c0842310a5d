import { describe, expect, it } from 'vitest';
import { createEngineHost, type HostClock } from './engine-host';
import type { FromEngine } from './engine-protocol';
import { demoDocument } from './test-helpers';

/** A manual clock: timers fire only when the test advances wall time. */
function fakeClock() {
  let now = 0;
  let timers: { at: number; fn: () => void; id: number }[] = [];
  let nextId = 1;
  const clock: HostClock & { tick(ms: number): void; spin: number } = {
    spin: 0,
    now: () => {
      // At 'max' the host loops until its slice budget is spent: let wall time pass per look.
      now += clock.spin;
      return now;
    },
    setTimeout: (fn, ms) => {
      const id = nextId++;
      timers.push({ at: now + ms, fn, id });
      return id;
    },
    clearTimeout: (id) => {
      timers = timers.filter((t) => t.id !== id);
    },
    tick(ms: number) {
      const end = now + ms;
      for (;;) {
        timers.sort((a, b) => a.at - b.at);
        const t = timers[0];
        if (!t || t.at > end) break;
        timers.shift();
        now = Math.max(now, t.at);
        t.fn();
      }
      now = end;
    },
  };
  return clock;
}

function setup() {
  const clock = fakeClock();
  const out: FromEngine[] = [];
  const host = createEngineHost((m) => out.push(m), clock);
  const snapshots = () => out.filter((m): m is Extract<FromEngine, { type: 'snapshot' }> => m.type === 'snapshot');
  return { clock, out, host, snapshots, lastTime: () => snapshots().at(-1)!.snapshot.timeMs };
}

describe('engine host', () => {
  it('loads the demo cell and posts a first snapshot at time 0', () => {
    const { host, out, snapshots } = setup();
    host.handle({ type: 'load', document: demoDocument() });
    expect(out[0]).toMatchObject({ type: 'loaded', ok: true });
    expect(snapshots()).toHaveLength(1);
    expect(snapshots()[0].snapshot.timeMs).toBe(0);
  });

  it('reports every problem of a document that does not load', () => {
    const { host, out } = setup();
    const doc = demoDocument();
    doc.wiring[0] = { ...doc.wiring[0], from: { device: 'nowhere', terminal: 'contact' } };
    host.handle({ type: 'load', document: doc });
    const loaded = out[0];
    expect(loaded.type === 'loaded' && !loaded.ok && loaded.problems.some((p) => p.path[0] === 'wiring' && p.path[1] === 0)).toBe(true);
  });

  it('runs at ×1 and ×10 against wall time, posting only after each frame is drawn', () => {
    const { host, clock, snapshots, lastTime } = setup();
    host.handle({ type: 'load', document: demoDocument() });
    host.handle({ type: 'frame-done' });
    host.handle({ type: 'run', speed: 1 });
    clock.tick(1000);
    // Without frame-done the worker holds back: only the first post after load went out.
    expect(snapshots()).toHaveLength(2);
    host.handle({ type: 'frame-done' });
    clock.tick(20);
    const t1 = lastTime();
    // ×1: cell time follows wall time: 1 s of wall ≈ 1 s of cell, give or take one frame (16.7 ms)
    // since the last tick may fall just before the 1 s mark.
    expect(t1).toBeGreaterThanOrEqual(1000 - 17);
    expect(t1).toBeLessThanOrEqual(1040);
    host.handle({ type: 'run', speed: 10 });
    host.handle({ type: 'frame-done' });
    clock.tick(100);
    host.handle({ type: 'frame-done' });
    clock.tick(20);
    // ×10: 120 ms of wall ≈ 1200 ms of cell time.
    expect(lastTime() - t1).toBeGreaterThanOrEqual(1000);
    expect(lastTime() - t1).toBeLessThanOrEqual(1400);
  });

  it('pauses, then steps exactly to the end of the next PLC scan', () => {
    const { host, clock, lastTime } = setup();
    host.handle({ type: 'load', document: demoDocument() });
    host.handle({ type: 'frame-done' });
    host.handle({ type: 'run', speed: 1 });
    clock.tick(95);
    host.handle({ type: 'pause' });
    host.handle({ type: 'frame-done' });
    clock.tick(20);
    const paused = lastTime();
    clock.tick(500);
    host.handle({ type: 'frame-done' });
    clock.tick(20);
    expect(lastTime()).toBe(paused);
    host.handle({ type: 'step-scan' });
    host.handle({ type: 'frame-done' });
    clock.tick(20);
    // The demo's scan period is 10 ms (simulator/demo/pick-and-place.ts, sheet.scanPeriodMs).
    expect(lastTime()).toBe((Math.floor(paused / 10) + 1) * 10);
  });

  it('runs as fast as possible at max, in bounded slices', () => {
    const { host, clock, lastTime } = setup();
    clock.spin = 1;
    host.handle({ type: 'load', document: demoDocument() });
    host.handle({ type: 'frame-done' });
    host.handle({ type: 'run', speed: 'max' });
    clock.tick(100);
    host.handle({ type: 'frame-done' });
    clock.tick(20);
    host.handle({ type: 'pause' });
    // Far more cell time than wall time passed.
    expect(lastTime()).toBeGreaterThan(1000);
  });

  it('applies events, reports rejections, and keeps the event log', () => {
    const { host, out } = setup();
    host.handle({ type: 'load', document: demoDocument() });
    host.handle({ type: 'event', event: { type: 'press', device: 'start' } });
    host.handle({ type: 'event', event: { type: 'press', device: 'no-such-device' } });
    host.handle({ type: 'get-log', requestId: 7 });
    expect(out.find((m) => m.type === 'accepted')).toMatchObject({ eventCount: 1 });
    expect(out.find((m) => m.type === 'rejected')).toMatchObject({ event: { device: 'no-such-device' } });
    const log = out.find((m) => m.type === 'log');
    expect(log).toEqual({ type: 'log', requestId: 7, log: [{ t: 0, event: { type: 'press', device: 'start' } }] });
  });

  it('replays deterministically: the same document and events give the same snapshot', () => {
    const run = () => {
      const { host, clock, lastTime, snapshots } = setup();
      host.handle({ type: 'load', document: demoDocument() });
      host.handle({ type: 'event', event: { type: 'set-field', device: 'part', active: true } });
      host.handle({ type: 'step-scan' });
      host.handle({ type: 'frame-done' });
      clock.tick(20);
      void lastTime;
      return snapshots().at(-1)!.snapshot;
    };
    expect(run()).toEqual(run());
  });

  it('sends the scope exact change times from the engine trace, with a reset on each load', () => {
    const { host, clock, snapshots } = setup();
    host.handle({ type: 'load', document: demoDocument() });
    for (let i = 0; i < 5; i++) host.handle({ type: 'step-scan' });
    host.handle({ type: 'event', event: { type: 'press', device: 'start' } });
    host.handle({ type: 'step-scan' });
    host.handle({ type: 'step-scan' });
    host.handle({ type: 'frame-done' });
    clock.tick(20);
    const chunks = snapshots().map((m) => m.trace);
    expect(chunks[0].reset).toBe(true);
    const signals = chunks[0].signals;
    const start = signals.indexOf('%IX0.0');
    expect(start).toBeGreaterThanOrEqual(0);
    expect(signals).toContain('DI1');
    const rises = chunks.flatMap((c) => c.samples).filter(([, i, v]) => i === start && v === 1);
    // Pressed at 50 ms; the PLC reads its inputs at the start of a scan (IEC 61131-3 cyclic
    // execution), so the input image changes at the next scan instant: 50 or 60 ms with a 10 ms period.
    expect(rises).toHaveLength(1);
    expect([50, 60]).toContain(rises[0][0]);
    host.handle({ type: 'load', document: demoDocument() });
    expect(snapshots().at(-1)!.trace.reset).toBe(true);
  });
});
