/**
 * The public entry's own promises (simulator/index.ts): incremental trace and log reads,
 * signal names without a cell, one replay loop with a stop check, the next-scan arithmetic.
 */
import { describe, expect, it } from 'vitest';
import { applyLog, createCell, nextScanMs, pickAndPlaceCell, signalNamesOf, starterCell, type LoggedEvent } from '@/simulator';

const made = (trace: string[] = []) => {
  const r = createCell(pickAndPlaceCell, { trace });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
};

const CYCLE: LoggedEvent[] = [
  { t: 1800, event: { type: 'set-field', device: 'part', active: true } },
  { t: 2000, event: { type: 'press', device: 'start' } },
  { t: 2100, event: { type: 'release', device: 'start' } },
  { t: 6000, event: { type: 'set-field', device: 'guard', active: false } },
  { t: 6500, event: { type: 'set-field', device: 'guard', active: true } },
];

describe('the engine entry', () => {
  it('signalNamesOf gives exactly the names a fresh cell lists, for every demo cell', () => {
    for (const doc of [pickAndPlaceCell, starterCell]) {
      const names = signalNamesOf(doc);
      const cell = createCell(doc);
      if (!names.ok || !cell.ok) throw new Error('demo cell invalid');
      expect(names.value).toEqual(cell.value.signalNames());
      cell.value.dispose();
    }
    const bad = signalNamesOf({ ...pickAndPlaceCell, wiring: 'x' });
    expect(bad.ok).toBe(false);
  });

  it('traceSince reads only what is new, and the pieces add up to the whole trace', () => {
    const cell = made(['ctl.state', 'hs.cycling', 'arm.0']);
    const pieces: unknown[] = [];
    let next = 0;
    for (const e of CYCLE) {
      expect(applyLog(cell, [e], e.t).ok).toBe(true);
      const part = cell.traceSince(next);
      pieces.push(...part.samples);
      next = part.next;
    }
    cell.advance(3000);
    const last = cell.traceSince(next);
    pieces.push(...last.samples);
    expect(cell.traceSince(last.next).samples).toEqual([]);
    expect(pieces).toEqual(cell.trace().samples);
    cell.dispose();
  });

  it('eventCount and eventLog(from) read the log without copying all of it', () => {
    const cell = made();
    expect(applyLog(cell, CYCLE, 7000).ok).toBe(true);
    expect(cell.eventCount).toBe(CYCLE.length);
    expect(cell.eventLog(3)).toEqual(CYCLE.slice(3));
    expect(cell.eventLog()).toEqual(CYCLE);
    expect(cell.eventLog(99)).toEqual([]);
    cell.dispose();
  });

  it('applyLog with a stop check ends early, and going on from there gives the same run', () => {
    const whole = made(['ctl.state', 'arm.0', 'arm.1']);
    expect(applyLog(whole, CYCLE, 20_000)).toEqual({ ok: true, value: { applied: CYCLE.length, stopped: false } });
    const sliced = made(['ctl.state', 'arm.0', 'arm.1']);
    let asked = 0;
    // Stops at every third check: the work comes back in pieces of at most a few simulated seconds.
    const stop = () => ++asked % 3 === 0;
    let rest = CYCLE;
    for (let guard = 0; guard < 100; guard++) {
      const r = applyLog(sliced, rest, 20_000, stop);
      if (!r.ok) throw new Error(JSON.stringify(r.errors));
      rest = rest.slice(r.value.applied);
      if (!r.value.stopped) break;
    }
    expect(sliced.timeMs).toBe(20_000);
    expect(sliced.trace()).toEqual(whole.trace());
    expect(sliced.eventLog()).toEqual(whole.eventLog());
  });

  it('applyLog reports an event out of order, or a refused one, with its path', () => {
    const cell = made();
    cell.advance(500);
    const early = applyLog(cell, [{ t: 100, event: { type: 'press', device: 'start' } }], 1000);
    expect(early.ok ? null : early.errors[0]).toMatchObject({ path: ['events', 0, 't'], code: 'out_of_order' });
    const refused = applyLog(cell, [CYCLE[0], { t: 1900, event: { type: 'press', device: 'ghost' } } as LoggedEvent], 1000);
    expect(refused.ok ? null : refused.errors[0]).toMatchObject({ path: ['events', 1, 'event', 'device'], code: 'unknown_device' });
  });

  it('nextScanMs is the first multiple of the period strictly after the time', () => {
    expect(nextScanMs(0, 10)).toBe(10);
    expect(nextScanMs(9, 10)).toBe(10);
    expect(nextScanMs(10, 10)).toBe(20);
    expect(nextScanMs(1234, 7)).toBe(1239);
  });
});
