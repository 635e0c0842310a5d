import { describe, expect, it } from 'vitest';
import { createCell, pickAndPlaceCell, type LoggedEvent } from '@/simulator';
import { createReplay } from './replay-engine';

// A short operator session on the demo cell (invented scenario): start pressed and released,
// a part placed, the stop pressed.
const events: LoggedEvent[] = [
  { t: 100, event: { type: 'press', device: 'start' } },
  { t: 300, event: { type: 'release', device: 'start' } },
  { t: 450, event: { type: 'set-field', device: 'part', active: true } },
  { t: 900, event: { type: 'press', device: 'stop' } },
];

/** The reference: a fresh cell given the same log, straight through (the engine's own replay). */
function straight(t: number) {
  const made = createCell(pickAndPlaceCell);
  if (!made.ok) throw new Error('demo cell does not build');
  const cell = made.value;
  for (const e of events.filter((x) => x.t <= t)) {
    cell.advance(e.t - cell.timeMs);
    cell.apply(e.event);
  }
  cell.advance(t - cell.timeMs);
  const snap = cell.snapshot();
  cell.dispose();
  return snap;
}

describe('replay engine', () => {
  it('shows at any time what a straight run of the log shows, whether it seeks forward or back', () => {
    const r = createReplay({ document: pickAndPlaceCell, events, endMs: 1200 });
    if (!r.ok) throw new Error('replay does not build');
    const replay = r.value;
    // Determinism of the engine (DESIGN.md: same document, log and seed → same trace): seeking must not change it.
    for (const t of [50, 350, 1000, 200, 460, 1200, 0]) {
      const { snapshot } = replay.seek(t);
      expect(snapshot.timeMs).toBe(t);
      expect(snapshot).toEqual(straight(t));
    }
    replay.dispose();
  });

  it('clamps to the run and finds neighbouring events for single-stepping', () => {
    const r = createReplay({ document: pickAndPlaceCell, events, endMs: 1200 });
    if (!r.ok) throw new Error('replay does not build');
    expect(r.value.seek(5000).snapshot.timeMs).toBe(1200);
    expect(r.value.nextEventAfter(100)).toBe(300);
    expect(r.value.nextEventAfter(900)).toBeNull();
    expect(r.value.previousEventBefore(450)).toBe(300);
    expect(r.value.previousEventBefore(100)).toBeNull();
    r.value.dispose();
  });

  it('starts the scope afresh after a seek back and sends only new samples going forward', () => {
    const r = createReplay({ document: pickAndPlaceCell, events, endMs: 1200 });
    if (!r.ok) throw new Error('replay does not build');
    const first = r.value.seek(500).trace;
    expect(first.reset).toBe(true);
    expect(first.signals.length).toBeGreaterThan(0);
    const forward = r.value.seek(600).trace;
    expect(forward.reset).toBe(false);
    expect(forward.samples.every(([t]) => t > 500)).toBe(true);
    expect(r.value.seek(200).trace.reset).toBe(true);
    r.value.dispose();
  });

  it('reports a document that does not build', () => {
    expect(createReplay({ document: { nope: true }, events: [], endMs: 0 }).ok).toBe(false);
  });
});
