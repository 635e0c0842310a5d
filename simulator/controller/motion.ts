/**
 * Point-to-point motion with a trapezoidal velocity profile, triangular when the move is
 * too short to reach the speed limit (Lynch & Park, Modern Robotics, ch. 9.2, "trapezoidal
 * motion profiles"). All functions are pure; units are whatever the pose coordinates use
 * (metres or radians) per second and per second squared.
 */

/** A coordinate vector: 2D Cartesian (x, y) or joint values, one entry per axis. */
export type Coordinates = readonly number[];

/** Euclidean length of the straight path between two coordinate vectors of equal length. */
export function pathLength(from: Coordinates, to: Coordinates): number {
  let sum = 0;
  const n = Math.max(from.length, to.length);
  for (let i = 0; i < n; i++) {
    const d = (to[i] ?? 0) - (from[i] ?? 0);
    sum += d * d;
  }
  return Math.sqrt(sum);
}

/**
 * True when a move of `distance` never reaches `vmax` (accelerate then decelerate at once).
 * The switch-over is where the acceleration distance v²/a equals the path length.
 */
export function isTriangular(distance: number, vmax: number, amax: number): boolean {
  return distance < (vmax * vmax) / amax;
}

/**
 * Time of a rest-to-rest move in seconds.
 * Trapezoidal: t = d/v + v/a. Triangular (d < v²/a): t = 2·√(d/a).
 * Returns 0 for a zero-length move and Infinity for non-positive speed or acceleration.
 */
export function moveTime(distance: number, vmax: number, amax: number): number {
  if (!(distance > 0)) return 0;
  if (!(vmax > 0) || !(amax > 0)) return Infinity;
  if (isTriangular(distance, vmax, amax)) return 2 * Math.sqrt(distance / amax);
  return distance / vmax + vmax / amax;
}

/** Peak speed reached during a rest-to-rest move (below vmax on a triangular move). */
export function peakSpeed(distance: number, vmax: number, amax: number): number {
  if (!(distance > 0)) return 0;
  return isTriangular(distance, vmax, amax) ? Math.sqrt(distance * amax) : vmax;
}

/**
 * Distance travelled along the path `t` seconds into a rest-to-rest move, clamped to [0, d].
 */
export function positionAtTime(distance: number, vmax: number, amax: number, t: number): number {
  if (!(distance > 0) || t <= 0) return 0;
  const total = moveTime(distance, vmax, amax);
  if (t >= total) return distance;
  const vp = peakSpeed(distance, vmax, amax);
  const ta = vp / amax;
  if (t <= ta) return 0.5 * amax * t * t;
  const cruiseEnd = total - ta;
  if (t <= cruiseEnd) return 0.5 * amax * ta * ta + vp * (t - ta);
  const rem = total - t;
  return distance - 0.5 * amax * rem * rem;
}

/** Speed along the path `t` seconds into a rest-to-rest move. */
export function speedAtTime(distance: number, vmax: number, amax: number, t: number): number {
  if (!(distance > 0) || t <= 0) return 0;
  const total = moveTime(distance, vmax, amax);
  if (t >= total) return 0;
  const vp = peakSpeed(distance, vmax, amax);
  const ta = vp / amax;
  if (t <= ta) return amax * t;
  if (t <= total - ta) return vp;
  return amax * (total - t);
}

/** Distance needed to brake from speed `v` to rest at deceleration `a`: v²/(2a). */
export function brakingDistance(v: number, a: number): number {
  if (!(v > 0) || !(a > 0)) return 0;
  return (v * v) / (2 * a);
}

/** Linear interpolation between two coordinate vectors at path fraction `s / length`. */
export function along(from: Coordinates, to: Coordinates, s: number, length: number): number[] {
  if (!(length > 0)) return [...to];
  const f = Math.min(1, Math.max(0, s / length));
  const n = Math.max(from.length, to.length);
  const out: number[] = new Array(n);
  for (let i = 0; i < n; i++) {
    const a = from[i] ?? 0;
    out[i] = a + ((to[i] ?? 0) - a) * f;
  }
  return out;
}
