import { describe, expect, it } from 'vitest';
import { createCell, pickAndPlaceDebouncedSheet, type LoggedEvent } from '@/simulator';
import { drillInputSchema } from '@/lib/schemas/drills';
import { gradeRun } from '@/lib/runs/grade';
import { DRILL_LIBRARY, libraryBaseDocument } from './library';
import { drillProblems } from './validate';

const drill = (key: string) => DRILL_LIBRARY.find((d) => d.key === key)!;
const input = (key: string) => drillInputSchema.parse({ ...drill(key).input, cellId: '00000000-0000-4000-8000-000000000000', cellVersion: 1 });

/** Runs a library drill's base with its faults and a log; returns a reader of signals at the end. */
function run(key: string, events: LoggedEvent[], untilMs: number) {
  const d = drill(key);
  const made = createCell(libraryBaseDocument(d.base), { faults: d.input.faults });
  if (!made.ok) throw new Error(JSON.stringify(made.errors));
  const cell = made.value;
  for (const e of events) {
    expect(cell.advance(e.t - cell.timeMs).ok).toBe(true);
    const r = cell.apply(e.event);
    expect(r.ok, JSON.stringify(r)).toBe(true);
  }
  cell.advance(untilMs - cell.timeMs);
  const read = (n: string) => {
    const v = cell.readSignal(n);
    if (!v.ok) throw new Error(n);
    return v.value;
  };
  return { cell, read };
}

describe('built-in drill library', () => {
  it('has the seven required scenarios with distinct keys', () => {
    expect(new Set(DRILL_LIBRARY.map((d) => d.key)).size).toBe(DRILL_LIBRARY.length);
    expect(DRILL_LIBRARY.map((d) => d.input.answer.kind).sort()).toEqual(
      ['analog-loss', 'chatter', 'open-wire', 'sensor-type-mismatch', 'staged-not-applied', 'swapped-wires', 'wrong-word-encoding'].sort(),
    );
  });

  it('the ghost-parts drill says a software workaround goes through the plant\'s change procedure and defers to local codes', () => {
    const brief = drill('chattering-part-sensor').input.brief;
    expect(brief).toContain('management of change');
    expect(brief).toContain('local codes and licensed practice take precedence');
  });

  it('no brief carries a safety caution of its own: the attempt page shows the full one once (a second, shorter box left out the deference to local codes)', () => {
    for (const d of DRILL_LIBRARY) expect(d.input.brief, d.key).not.toMatch(/not safety functions|lockout\/tagout/);
  });

  it.each(DRILL_LIBRARY.map((d) => [d.key]))('%s fits its base cell (faults arm, rule signals exist, answer names a place)', (key) => {
    expect(drillProblems(libraryBaseDocument(drill(key).base), input(key))).toEqual({});
  });

  it('broken NC stop wire: after 15 s the stop input reads off with the button untouched (NC circuit reads as stop, common practice)', () => {
    const { cell, read } = run('nc-stop-broken-wire', [], 16_000);
    expect(read('dev.stop.pressed')).toBe(0);
    expect(read('in.w-stop')).toBe(0);
    cell.dispose();
  });

  it('sensor type mismatch: LED on, sinking input off (a sinking input needs a sourcing sensor, common practice)', () => {
    const { cell, read } = run('part-sensor-type', [{ t: 2000, event: { type: 'set-field', device: 'part', active: true } }], 2500);
    expect(read('dev.part.led')).toBe(1);
    expect(read('in.w-part')).toBe(0);
    cell.dispose();
  });

  it('swapped wires: pressing start turns on the reset input', () => {
    const { cell, read } = run('swapped-start-reset', [{ t: 2000, event: { type: 'press', device: 'start' } }], 2100);
    expect(read('in.w-reset')).toBe(1);
    expect(read('in.w-start')).toBe(0);
    cell.dispose();
  });

  it('analog loss: the 4–20 mA loop reads below 3.6 mA after 20 s (NAMUR NE 43 failure band)', () => {
    const { cell, read } = run('air-pressure-lost', [], 21_000);
    expect(read('wire.w-air')).toBeLessThan(3.6);
    cell.dispose();
    const before = run('air-pressure-lost', [], 19_000);
    // 6 bar on 0–10 bar over 4–20 mA: 4 + 16 × 0.6 = 13.6 mA (linear scaling, common practice).
    expect(before.read('wire.w-air')).toBeCloseTo(13.6, 3);
    before.cell.dispose();
  });

  it('staged restart: a student who restarts the controller and runs a cycle passes every rule and the diagnosis', () => {
    const events: LoggedEvent[] = [
      { t: 2000, event: { type: 'restart-controller' } },
      { t: 6000, event: { type: 'set-field', device: 'part', active: true } },
      { t: 6100, event: { type: 'press', device: 'start' } },
      { t: 6200, event: { type: 'release', device: 'start' } },
    ];
    const d = input('staged-restart-forgotten');
    const r = gradeRun({
      context: { document: libraryBaseDocument('staged-restart'), seed: 7, faults: d.faults },
      events,
      endedMs: 40_000,
      rules: d.rules,
      answer: d.answer,
      diagnosisWeight: d.diagnosisWeight,
      diagnosis: { kind: 'staged-not-applied', location: 'pm-di', note: '' },
    });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.value.breakdown.rules.map((x) => x.status)).toEqual(['pass', 'pass']);
    expect(r.value.grade).toBe(100);
  });

  it('chattering sensor: a downloaded debounce passes every rule; the same run without it fails the steady-signal rule', () => {
    const d = input('chattering-part-sensor');
    const cycle: LoggedEvent[] = [
      { t: 3000, event: { type: 'set-field', device: 'part', active: true } },
      { t: 3500, event: { type: 'press', device: 'start' } },
      { t: 3600, event: { type: 'release', device: 'start' } },
      { t: 20_000, event: { type: 'set-field', device: 'part', active: false } },
    ];
    const grade = (events: LoggedEvent[], seed: number) => {
      const r = gradeRun({
        context: { document: libraryBaseDocument('pick-and-place'), seed, faults: d.faults },
        events,
        endedMs: 25_000,
        rules: d.rules,
        answer: d.answer,
        diagnosisWeight: d.diagnosisWeight,
        diagnosis: { kind: 'chatter', location: 'w-part', note: 'TOF 500 ms then TON 100 ms on the part input' },
      });
      if (!r.ok) throw new Error(JSON.stringify(r.errors));
      return r.value;
    };
    for (const seed of [1, 7, 123456]) {
      const fixed = grade([{ t: 2000, event: { type: 'download', logic: pickAndPlaceDebouncedSheet() } as LoggedEvent['event'] }, ...cycle], seed);
      expect(fixed.breakdown.rules.map((x) => [x.id, x.status])).toEqual([
        ['no-motion-guard-open', 'pass'],
        ['part-signal-steady', 'pass'],
        ['part-signal-on', 'pass'],
        ['part-signal-off', 'pass'],
        ['cycle-with-part', 'pass'],
      ]);
      expect(fixed.grade).toBe(100);
      const unfixed = grade(cycle, seed);
      expect(unfixed.breakdown.rules.find((x) => x.id === 'part-signal-steady')!.status).toBe('fail');
      // Guard 3 + on 2 + off 2 + cycle 3 + diagnosis 10 of 25 points = 80 %.
      expect(unfixed.grade).toBe(80);
    }
  });

  it('staged restart: without the restart no cycle completes, so the cycle rule fails', () => {
    const d = input('staged-restart-forgotten');
    const r = gradeRun({
      context: { document: libraryBaseDocument('staged-restart'), seed: 7, faults: d.faults },
      events: [
        { t: 6000, event: { type: 'set-field', device: 'part', active: true } },
        { t: 6100, event: { type: 'press', device: 'start' } },
        { t: 6200, event: { type: 'release', device: 'start' } },
      ],
      endedMs: d.timeLimitMs,
      rules: d.rules,
      answer: d.answer,
      diagnosisWeight: d.diagnosisWeight,
      diagnosis: null,
    });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.value.breakdown.rules.find((x) => x.id === 'one-cycle')!.status).toBe('fail');
    // Only the guard rule's 3 of 3 + 5 + 10 points: 3 / 18 = 16.7 %.
    expect(r.value.grade).toBe(16.7);
  });
});
