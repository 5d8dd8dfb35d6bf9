const RADIANS_PER_DEGREE = Math.PI / 180;

/**
 * Coefficients [A, B, C] of the circularised elliptical radius squared in units of `radius`:
 * (R / radius)^2 = A dx^2 + B dx dy + C dy^2 with R^2 = q x'^2 + y'^2 / q, where (x', y') are
 * (dx, dy) rotated so that x' runs along the major axis at `positionAngleDeg` counter-clockwise
 * from +x. An isophote R = const is an ellipse of semi-axes R / sqrt(q) and R sqrt(q), so R is
 * the radius of the circle of equal area (common practice). Writes into `out` (length >= 3).
 */
export function ellipticalQuadraticForm(
  radius: number, axisRatio: number, positionAngleDeg: number, out: Float64Array,
): void {
  const angle = positionAngleDeg * RADIANS_PER_DEGREE;
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  const q = axisRatio;
  const scale = 1 / (radius * radius);
  out[0] = (q * c * c + (s * s) / q) * scale;
  out[1] = 2 * c * s * (q - 1 / q) * scale;
  out[2] = (q * s * s + (c * c) / q) * scale;
}
