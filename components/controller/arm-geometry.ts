/**
 * Drawing geometry of the arm view: a world-to-screen fit and a two-link arm reaching a tool
 * point. Only for drawing — the engine owns motion; the link lengths are chosen so every taught
 * pose is reachable, and an unreachable point is drawn with the arm stretched towards it.
 */

/** Fits the taught points and the base (0, 0) into a `w`×`h` picture with a margin; y points up. */
export function fitView(points: readonly (readonly number[])[], w: number, h: number, margin = 60) {
  const xs = [0, ...points.map((p) => p[0] ?? 0)];
  const ys = [0, ...points.map((p) => p[1] ?? 0)];
  let minX = Math.min(...xs);
  let maxX = Math.max(...xs);
  let minY = Math.min(...ys);
  let maxY = Math.max(...ys);
  if (maxX - minX < 1e-6) {
    minX -= 0.5;
    maxX += 0.5;
  }
  if (maxY - minY < 1e-6) {
    minY -= 0.5;
    maxY += 0.5;
  }
  const scale = Math.min((w - 2 * margin) / (maxX - minX), (h - 2 * margin) / (maxY - minY));
  const ox = (w - (maxX - minX) * scale) / 2 - minX * scale;
  const oy = (h + (maxY - minY) * scale) / 2 + minY * scale;
  return { scale, toScreen: (x: number, y: number): [number, number] => [ox + x * scale, oy - y * scale] };
}

/**
 * A two-link arm with equal links long enough to reach the farthest taught point (plus 5 %),
 * solved elbow-up by the law of cosines (common practice, planar two-link inverse kinematics).
 */
export function armGeometry(points: readonly (readonly number[])[]) {
  const reach = Math.max(0.1, ...points.map((p) => Math.hypot(p[0] ?? 0, p[1] ?? 0)));
  const link = (reach * 1.05) / 2;
  return {
    link,
    solve(x: number, y: number): { elbow: [number, number]; tool: [number, number] } {
      let d = Math.hypot(x, y);
      let tx = x;
      let ty = y;
      if (d > 2 * link) {
        // Out of reach: stretch the arm towards the point.
        tx = (x / d) * 2 * link;
        ty = (y / d) * 2 * link;
        d = 2 * link;
      }
      if (d < 1e-9) return { elbow: [0, link], tool: [tx, ty] };
      const base = Math.atan2(ty, tx);
      const cosA = Math.min(1, Math.max(-1, d / (2 * link)));
      const a = Math.acos(cosA);
      // Elbow up: rotate towards +y side when reaching forward (x ≥ 0), mirrored when reaching back.
      const angle = tx >= 0 ? base + a : base - a;
      return { elbow: [link * Math.cos(angle), link * Math.sin(angle)], tool: [tx, ty] };
    },
  };
}

/** Rough advance width of one character at `fontSize` in the UI's sans font (wide glyphs included). */
const CHAR_WIDTH_EM = 0.6;

/**
 * Where a pose's label goes: to the right of its marker and above it, unless that would run
 * past the view's right or top edge; then to the left (anchored at its end) or below.
 */
export function labelPlacement(px: number, py: number, text: string, w: number, fontSize = 11, gap = 8): { x: number; y: number; anchor: 'start' | 'end' } {
  const width = text.length * fontSize * CHAR_WIDTH_EM;
  const right = px + gap + width <= w - 2;
  const above = py - 6 - fontSize >= 0;
  return { x: right ? px + gap : px - gap, y: above ? py - 6 : py + 6 + fontSize, anchor: right ? 'start' : 'end' };
}
