import { describe, expect, it } from 'vitest';
import { labelPlacement } from './arm-geometry';

// Geometry of the placement only: a label of n characters at 11 px is taken as n × 6.6 px wide
// (0.6 em per character, a generous figure for a proportional sans font: from memory).
describe('labelPlacement', () => {
  it('puts a label right of and above a marker with room around it', () => {
    expect(labelPlacement(100, 100, 'Home', 420)).toEqual({ x: 108, y: 94, anchor: 'start' });
  });
  it('moves a label that would run past the right edge to the left of its marker', () => {
    // 'Above pick' is 10 characters, about 66 px: from x 368 it would end at 442 > 418.
    expect(labelPlacement(360, 100, 'Above pick', 420)).toEqual({ x: 352, y: 94, anchor: 'end' });
  });
  it('moves a label that would run past the top edge below its marker', () => {
    expect(labelPlacement(100, 10, 'Pick', 420)).toEqual({ x: 108, y: 27, anchor: 'start' });
  });
});
