import { describe, expect, it } from 'vitest';
import type { Trace } from '@/simulator';
import { differences, firstDifference, histories, signalsToShow, valueAt } from './compare-traces';

const trace = (signals: string[], samples: [number, number, number | string][], endMs: number): Trace => ({ signals, samples, endMs });

describe('comparing two traces', () => {
  const base = histories(trace(['a', 'b', 's'], [[0, 0, 0], [0, 1, 0], [0, 2, 'ready'], [100, 0, 1], [300, 0, 0], [500, 2, 'cycling']], 1000));
  const proposed = histories(trace(['a', 'b', 's'], [[0, 0, 0], [0, 1, 0], [0, 2, 'ready'], [100, 0, 1], [400, 0, 0], [200, 1, 1], [500, 2, 'cycling']], 1000));

  it('keeps each signal’s changes and reads the value at a time', () => {
    expect(base.get('a')).toEqual([
      { t: 0, v: 0 },
      { t: 100, v: 1 },
      { t: 300, v: 0 },
    ]);
    expect(valueAt(proposed.get('b'), 250)).toBe(1);
    expect(valueAt(proposed.get('b'), -1)).toBeUndefined();
  });

  it('finds the stretches where the two differ', () => {
    expect(differences(base.get('a'), proposed.get('a'), 1000)).toEqual([[300, 400]]);
    expect(differences(base.get('b'), proposed.get('b'), 1000)).toEqual([[200, 1000]]);
    expect(differences(base.get('s'), proposed.get('s'), 1000)).toEqual([]);
    expect(differences(undefined, proposed.get('s'), 1000)).toEqual([[0, 1000]]);
  });

  it('shows differing signals first (earliest first), then the preferred ones', () => {
    expect(signalsToShow(base, proposed, 1000, ['s', 'nope'])).toEqual(['b', 'a', 's']);
    expect(firstDifference(base, proposed, 1000)).toBe(200);
    expect(firstDifference(base, proposed, 1000, ['s'])).toBeNull();
  });
});
