import { describe, expect, it } from 'vitest';
import { edgeTimes, snapToEdge } from './edges';
import { applyTraceChunk, trimHistory, type ScopeData } from './scope-recorder';

// Hand-made histories (this module's definition: a history holds each value until the next change).
const A = [
  { t: 0, v: 0 },
  { t: 20, v: 1 },
  { t: 40, v: 0 },
];
const B = [
  { t: 0, v: 0 },
  { t: 10, v: 1 },
];

describe('scope edges', () => {
  it('finds rising and falling edges at the time of the change', () => {
    expect(edgeTimes(A)).toEqual([20, 40]);
    expect(edgeTimes(B)).toEqual([10]);
  });
  it('snaps a cursor to the nearest edge within the tolerance only', () => {
    expect(snapToEdge([A, B], 14, 5)).toBe(10);
    expect(snapToEdge([A], 14, 5)).toBe(14);
    expect(snapToEdge([A], 37, 5)).toBe(40);
  });
});

describe('scope history from trace chunks', () => {
  const empty: ScopeData = { signals: [], histories: new Map(), endMs: 0 };
  it('builds per-signal histories, appends later chunks and starts over on reset', () => {
    let d = applyTraceChunk(empty, { reset: true, signals: ['%IX0.0', 'DI1'], samples: [[0, 0, 0], [0, 1, 0], [130, 0, 1]] });
    d = applyTraceChunk(d, { reset: false, signals: [], samples: [[630, 0, 0], [650, 1, 1]] });
    expect(d.histories.get('%IX0.0')).toEqual([{ t: 0, v: 0 }, { t: 130, v: 1 }, { t: 630, v: 0 }]);
    expect(d.histories.get('DI1')).toEqual([{ t: 0, v: 0 }, { t: 650, v: 1 }]);
    expect(d.endMs).toBe(650);
    // A pulse from 130 to 630 ms is 500 ms long: the edge-to-edge time the cursors measure.
    const [rise, fall] = edgeTimes(d.histories.get('%IX0.0')!);
    expect(fall - rise).toBe(500);
    d = applyTraceChunk(d, { reset: true, signals: ['%QX0.0'], samples: [[0, 0, 1]] });
    expect([...d.histories.keys()]).toEqual(['%QX0.0']);
    expect(d.endMs).toBe(0);
  });
  it('trims old changes but keeps the value in force at the window start', () => {
    expect(trimHistory(A, 30)).toEqual([{ t: 20, v: 1 }, { t: 40, v: 0 }]);
    expect(trimHistory(A, 5)).toBe(A);
  });
});
