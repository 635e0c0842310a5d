import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { fnv1a64 } from './hash';
import { hashTrace, type Trace } from './trace';
import { checkRules, type Rule } from './rules';
import { replay } from './replay';
import { pickAndPlaceCell } from '@/simulator/demo/pick-and-place';
import { pickAndPlaceDebouncedSheet } from '@/simulator/demo/part-debounce';
import type { LoggedEvent } from '@/simulator/cell/events';
import { createCell } from '@/simulator/cell/cell';

describe('FNV-1a 64', () => {
  it('matches the published test vectors', () => {
    // FNV test vectors (Fowler/Noll/Vo reference code, from memory): "" and "a".
    expect(fnv1a64('')).toBe('cbf29ce484222325');
    expect(fnv1a64('a')).toBe('af63dc4c8601ec8c');
    expect(fnv1a64('foobar')).toBe('85944171f73967e8');
  });
});

const t = (samples: [number, number, number | string][], endMs: number, signals = ['a', 'b']): Trace => ({ signals, samples, endMs });

describe('rules over a trace', () => {
  const trace = t(
    [
      [0, 0, 0],
      [0, 1, 0],
      [100, 0, 1], // a rises at 100
      [150, 1, 1], // b follows 50 ms later
      [400, 0, 0],
      [600, 0, 1], // a rises again at 600
      [900, 1, 0],
    ],
    1000,
  );
  const rules: Rule[] = [
    { id: 'never-both', kind: 'never', p: { all: [{ signal: 'a', op: '==', value: 1 }, { signal: 'b', op: '==', value: 0 }] } },
    { id: 'always-b-or-not-a', kind: 'always', p: { any: [{ signal: 'a', op: '==', value: 0 }, { signal: 'b', op: '==', value: 1 }] } },
    { id: 'after-60', kind: 'after', event: { signal: 'a', op: '==', value: 1 }, withinMs: 60, p: { signal: 'b', op: '==', value: 1 } },
    { id: 'after-40', kind: 'after', event: { signal: 'a', op: '==', value: 1 }, withinMs: 40, p: { signal: 'b', op: '==', value: 1 } },
    { id: 'eventually-b', kind: 'eventually', withinMs: 200, p: { signal: 'b', op: '==', value: 1 } },
    { id: 'eventually-late', kind: 'eventually', withinMs: 5000, p: { signal: 'b', op: '==', value: 2 } },
  ];
  it('reports the first violation with its time and values', () => {
    const r = checkRules(trace, rules);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const by = Object.fromEntries(r.value.map((x) => [x.id, x]));
    expect(by['never-both'].status).toBe('fail');
    expect(by['never-both'].violation).toMatchObject({ timeMs: 100, values: { a: 1, b: 0 } });
    expect(by['always-b-or-not-a'].violation?.timeMs).toBe(100);
    expect(by['after-60'].status).toBe('pass'); // b came 50 ms after the first rise; the second rise finds b already 1
    expect(by['after-40'].status).toBe('fail');
    expect(by['after-40'].violation).toMatchObject({ timeMs: 140, values: { a: 1, b: 0 } });
    expect(by['eventually-b'].status).toBe('pass');
    expect(by['eventually-late'].status).toBe('inconclusive');
  });
  it('a rule over a signal that is not traced is a problem with its path', () => {
    const r = checkRules(trace, [{ id: 'x', kind: 'never', p: { signal: 'c', op: '==', value: 1 } }]);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]).toMatchObject({ code: 'unknown_signal', path: [0, 'p', 'signal'] });
  });
});

const SIGNALS = ['ctl.state', 'arm.0', 'arm.1', 'plc.%QX0.0', 'plc.%IX0.5', 'dev.gripper.closed', 'hs.cycling', 'ctl.alarms'];

describe('replay', () => {
  const log: LoggedEvent[] = [
    { t: 2000, event: { type: 'set-field', device: 'part', active: true } },
    { t: 2100, event: { type: 'press', device: 'start' } },
    { t: 2160, event: { type: 'release', device: 'start' } },
    { t: 4000, event: { type: 'set-field', device: 'guard', active: false } },
    { t: 5000, event: { type: 'set-field', device: 'guard', active: true } },
    { t: 5500, event: { type: 'press', device: 'start' } },
    { t: 5560, event: { type: 'release', device: 'start' } },
  ];
  it('replaying the recorded log of a run gives a hash-identical trace', () => {
    const a = replay(pickAndPlaceCell, log, { trace: SIGNALS, untilMs: 20_000 });
    if (!a.ok) throw new Error(JSON.stringify(a.errors));
    expect(a.value.snapshot.controller.cyclesCompleted).toBe(1);
    const b = replay(pickAndPlaceCell, a.value.log, { trace: SIGNALS, untilMs: 20_000 });
    if (!b.ok) throw new Error(JSON.stringify(b.errors));
    expect(b.value.hash).toBe(a.value.hash);
    expect(b.value.trace).toEqual(a.value.trace);
    expect(hashTrace(a.value.trace)).toBe(a.value.hash);
  });

  it('property: same document + log + seed → same trace hash, however the clock is advanced', () => {
    const event = fc.oneof(
      fc.constant({ type: 'press', device: 'start' }),
      fc.constant({ type: 'release', device: 'start' }),
      fc.constant({ type: 'press', device: 'estop' }),
      fc.constant({ type: 'release', device: 'estop' }),
      fc.constant({ type: 'press', device: 'reset' }),
      fc.constant({ type: 'release', device: 'reset' }),
      fc.boolean().map((active) => ({ type: 'set-field', device: 'guard', active })),
      fc.boolean().map((active) => ({ type: 'set-field', device: 'part', active })),
      fc.constant({ type: 'inject-fault', fault: { id: 'ch', kind: 'chatter', row: 'w-part', periodMs: 15, probability: 0.3 } }),
      // Downloads: the debounced sheet, the original sheet back, wiring without and with the part row, a changed routine.
      fc.constant({ type: 'download', logic: pickAndPlaceDebouncedSheet() }),
      fc.constant({ type: 'download', logic: pickAndPlaceCell.plc.sheet }),
      fc.constant({ type: 'download', wiring: pickAndPlaceCell.wiring.filter((w) => w.id !== 'w-part') }),
      fc.constant({ type: 'download', wiring: pickAndPlaceCell.wiring }),
      fc.constant({ type: 'download', routine: { steps: [...pickAndPlaceCell.controller.routine, { kind: 'pause', ms: 20 }], poses: pickAndPlaceCell.controller.poses } }),
    );
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: 0, max: 400 }), event), { maxLength: 12 }),
        fc.integer({ min: 0, max: 1000 }),
        fc.integer({ min: 1, max: 97 }),
        (steps, seed, chunk) => {
          let time = 1500;
          const events: LoggedEvent[] = steps
            .map(([dt, e]) => ({ t: (time += dt), event: e as LoggedEvent['event'] }))
            // A second card with the same id would be rejected; keep only the first.
            .filter((e, i, all) => e.event.type !== 'inject-fault' || all.findIndex((x) => x.event.type === 'inject-fault') === i)
            // A card needs its row: drop an inject-fault while a download has the part row removed.
            .filter((e, i, all) => {
              if (e.event.type !== 'inject-fault') return true;
              const wiring = all.slice(0, i).filter((x) => x.event.type === 'download' && x.event.wiring);
              const last = wiring[wiring.length - 1]?.event;
              return !last || (last.type === 'download' && (last.wiring ?? []).some((w) => w.id === 'w-part'));
            });
          const until = time + 3000;
          const a = replay(pickAndPlaceCell, events, { trace: SIGNALS, seed, untilMs: until });
          if (!a.ok) throw new Error(JSON.stringify(a.errors));
          // The same run driven in small, odd-sized clock steps.
          const made = createCell(pickAndPlaceCell, { trace: SIGNALS, seed });
          if (!made.ok) throw new Error('cell');
          const cell = made.value;
          for (const e of events) {
            while (cell.timeMs < e.t) expect(cell.advance(Math.min(chunk, e.t - cell.timeMs)).ok).toBe(true);
            expect(cell.apply(e.event).ok).toBe(true);
          }
          while (cell.timeMs < until) cell.advance(Math.min(chunk, until - cell.timeMs));
          expect(hashTrace(cell.trace())).toBe(a.value.hash);
        },
      ),
      { numRuns: 25 },
    );
  });

  it('rejects an out-of-order or malformed log with paths, without running', () => {
    const r = replay(pickAndPlaceCell, [
      { t: 100, event: { type: 'press', device: 'start' } },
      { t: 50, event: { type: 'release', device: 'start' } },
      { t: -1, event: { type: 'explode' } },
    ]);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      const paths = r.errors.map((e) => e.path.join('.'));
      expect(paths).toEqual(expect.arrayContaining(['events.2.t', 'events.2.event.type']));
    }
  });
});
