import { describe, expect, it } from 'vitest';
import { brakingDistance, isTriangular, moveTime, pathLength, positionAtTime, speedAtTime } from './motion';

// Move times from the trapezoidal velocity profile (Lynch & Park, Modern Robotics, ch. 9.2.2):
// trapezoidal when d ≥ v²/a: T = d/v + v/a; triangular otherwise: T = 2·√(d/a).
describe('moveTime', () => {
  it('trapezoidal case: d = 1 m, v = 0.5 m/s, a = 1 m/s² → 2.5 s', () => {
    // T = 1/0.5 + 0.5/1 = 2.5 s (Modern Robotics ch. 9.2.2, worked from the formula)
    expect(isTriangular(1, 0.5, 1)).toBe(false);
    expect(moveTime(1, 0.5, 1)).toBeCloseTo(2.5, 12);
  });

  it('triangular case: d = 0.1 m, v = 1 m/s, a = 1 m/s² → 2·√0.1 ≈ 0.632 s', () => {
    // v²/a = 1 m > d, so the speed limit is never reached; T = 2·√(0.1/1) = 0.63246 s
    expect(isTriangular(0.1, 1, 1)).toBe(true);
    expect(moveTime(0.1, 1, 1)).toBeCloseTo(0.6324555, 6);
  });

  it('at the switch-over d = v²/a both formulas agree', () => {
    // d = 0.25, v = 0.5, a = 1: d/v + v/a = 0.5 + 0.5 = 1.0 and 2·√(0.25) = 1.0 (worked from the formula)
    expect(moveTime(0.25, 0.5, 1)).toBeCloseTo(1.0, 12);
    expect(2 * Math.sqrt(0.25 / 1)).toBeCloseTo(1.0, 12);
  });

  it('zero distance takes no time; non-positive limits never arrive', () => {
    expect(moveTime(0, 1, 1)).toBe(0);
    expect(moveTime(1, 0, 1)).toBe(Infinity);
    expect(moveTime(1, 1, -1)).toBe(Infinity);
  });
});

describe('position and speed along a trapezoidal move', () => {
  // d = 1, v = 0.5, a = 1: accelerate 0.5 s over 0.125 m, cruise 1.5 s over 0.75 m, decelerate 0.5 s.
  it('ends of the phases', () => {
    expect(positionAtTime(1, 0.5, 1, 0.5)).toBeCloseTo(0.125, 12); // ½·a·t² = ½·1·0.25
    expect(speedAtTime(1, 0.5, 1, 0.5)).toBeCloseTo(0.5, 12);
    expect(positionAtTime(1, 0.5, 1, 2.0)).toBeCloseTo(0.875, 12); // 0.125 + 0.5·1.5
    expect(positionAtTime(1, 0.5, 1, 2.5)).toBe(1);
    expect(speedAtTime(1, 0.5, 1, 2.5)).toBe(0);
    expect(positionAtTime(1, 0.5, 1, 1.25)).toBeCloseTo(0.5, 12); // symmetric profile: half way at half time
  });

  it('triangular move peaks at √(d·a) half way', () => {
    // d = 0.1, a = 1: peak speed √0.1 ≈ 0.316 m/s at T/2 (worked from the formula)
    const T = moveTime(0.1, 1, 1);
    expect(speedAtTime(0.1, 1, 1, T / 2)).toBeCloseTo(Math.sqrt(0.1), 9);
    expect(positionAtTime(0.1, 1, 1, T / 2)).toBeCloseTo(0.05, 9);
  });

  it('braking distance v²/(2a) and path length', () => {
    expect(brakingDistance(0.5, 1)).toBeCloseTo(0.125, 12); // 0.25/2 (kinematics, common practice)
    expect(pathLength([0, 0], [3, 4])).toBe(5); // 3-4-5 triangle
  });
});
