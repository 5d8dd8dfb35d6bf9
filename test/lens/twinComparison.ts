// Test helper: compare a profile's fast twin with its reference on many points at once.
import type { MassProfile } from '../../src/lens/massProfile.js';

/** A square grid of count x count points over [-half, half]^2 about (cx, cy), plus the centre itself. */
export function gridPoints(count: number, half: number, cx: number, cy: number): { x: Float64Array; y: Float64Array; n: number } {
  const n = count * count + 1, x = new Float64Array(n), y = new Float64Array(n);
  for (let k = 0; k < count * count; k++) {
    x[k] = cx - half + (2 * half * ((k % count) + 0.5)) / count;
    y[k] = cy - half + (2 * half * (Math.floor(k / count) + 0.5)) / count;
  }
  x[n - 1] = cx;
  y[n - 1] = cy;
  return { x, y, n };
}

/** Deflections of a profile at the points (a fresh call, outputs zeroed first). */
export function deflections(profile: MassProfile, p: Float64Array, points: { x: Float64Array; y: Float64Array; n: number }): [Float64Array, Float64Array] {
  const ax = new Float64Array(points.n), ay = new Float64Array(points.n);
  profile.addDeflection(p, 0, points.x, points.y, points.n, ax, ay);
  return [ax, ay];
}

/** Largest |alpha_fast - alpha_reference| / |alpha_reference| over the points (zero deflections compared absolutely). */
export function worstTwinDifference(
  reference: MassProfile, fast: MassProfile, p: Float64Array, points: { x: Float64Array; y: Float64Array; n: number },
): number {
  const [rx, ry] = deflections(reference, p, points);
  const [fx, fy] = deflections(fast, p, points);
  let worst = 0;
  for (let i = 0; i < points.n; i++) {
    const size = Math.hypot(rx[i], ry[i]), difference = Math.hypot(fx[i] - rx[i], fy[i] - ry[i]);
    worst = Math.max(worst, size === 0 ? difference : difference / size);
  }
  return worst;
}
