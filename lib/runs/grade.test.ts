import { describe, expect, it } from 'vitest';
import { pickAndPlaceCell, type LoggedEvent } from '@/simulator';
import type { WeightedRule } from '@/lib/schemas/drills';
import { gradeRun, locationKey, scoreDiagnosis } from './grade';

const events: LoggedEvent[] = [
  { t: 2000, event: { type: 'set-field', device: 'part', active: true } },
  { t: 2100, event: { type: 'press', device: 'start' } },
  { t: 2160, event: { type: 'release', device: 'start' } },
];
const rules: WeightedRule[] = [
  { weight: 4, rule: { id: 'cycle', kind: 'eventually', withinMs: 30_000, p: { signal: 'ctl.cycles', op: '>=', value: 1 } } },
  { weight: 6, rule: { id: 'never-ready', kind: 'never', p: { signal: 'ctl.state', op: '==', value: 'ready' } } },
];
const answer = { kind: 'open-wire', location: 'w-stop' };

describe('scoreDiagnosis', () => {
  it('gives the weight for kind and place, half for the kind alone, nothing for the place alone', () => {
    expect(scoreDiagnosis(answer, { kind: 'open-wire', location: ' W-STOP ', note: '' }, 10).earned).toBe(10);
    expect(scoreDiagnosis(answer, { kind: 'open-wire', location: 'w-start', note: '' }, 10).earned).toBe(5);
    expect(scoreDiagnosis(answer, { kind: 'short-0v', location: 'w-stop', note: '' }, 10).earned).toBe(0);
    expect(scoreDiagnosis(answer, null, 10).earned).toBe(0);
  });
  it('compares places as sets and accepts alternatives', () => {
    expect(locationKey('w-reset, w-start')).toBe(locationKey('W-START+w-reset'));
    expect(scoreDiagnosis({ kind: 'chatter', location: 'w-part|part' }, { kind: 'chatter', location: 'part', note: '' }, 8).earned).toBe(8);
  });
});

describe('gradeRun', () => {
  const input = { context: { document: pickAndPlaceCell, seed: 42, faults: [] }, events, endedMs: 30_000, rules, answer, diagnosisWeight: 10 };

  it('weights rules and the diagnosis into a percentage', () => {
    const r = gradeRun({ ...input, diagnosis: { kind: 'open-wire', location: 'w-stop', note: '' } });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    // The demo cell completes a cycle within 30 s (engine demo test) and is ready before the start: cycle passes (4), never-ready fails (0), diagnosis 10 → 14 / 20 = 70 %.
    expect(r.value.breakdown.rules.map((x) => [x.id, x.status, x.earned])).toEqual([
      ['cycle', 'pass', 4],
      ['never-ready', 'fail', 0],
    ]);
    expect(r.value.breakdown.possible).toBe(20);
    expect(r.value.grade).toBe(70);
    expect(r.value.breakdown.rules[1].violation?.timeMs).toBeGreaterThan(0);
  });

  it('is deterministic: the same inputs give the same grade and trace hash', () => {
    const a = gradeRun({ ...input, diagnosis: null });
    const b = gradeRun({ ...input, diagnosis: null });
    if (!a.ok || !b.ok) throw new Error('grade');
    expect(a.value).toEqual(b.value);
    expect(a.value.traceHash).toMatch(/^[0-9a-f]{16}$/);
  });

  it('a different log gives a different trace hash', () => {
    const a = gradeRun({ ...input, diagnosis: null });
    const b = gradeRun({ ...input, events: events.slice(0, 1), diagnosis: null });
    if (!a.ok || !b.ok) throw new Error('grade');
    expect(a.value.traceHash).not.toBe(b.value.traceHash);
  });

  it('reports an event the cell rejects instead of grading', () => {
    const r = gradeRun({ ...input, events: [{ t: 5, event: { type: 'press', device: 'nope' } }], diagnosis: null });
    expect(r.ok).toBe(false);
  });
});
