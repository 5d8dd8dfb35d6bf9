// Test helper: evaluate a MassProfile at single points, and its numerical derivatives by
// central differences (common practice), for the lens tests.
import type { MassProfile } from '../../src/lens/massProfile.js';

const one = (v: number) => Float64Array.of(v);

export function deflectionAt(profile: MassProfile, p: Float64Array, x: number, y: number): [number, number] {
  const ax = new Float64Array(1), ay = new Float64Array(1);
  profile.addDeflection(p, 0, one(x), one(y), 1, ax, ay);
  return [ax[0], ay[0]];
}

export function convergenceAt(profile: MassProfile, p: Float64Array, x: number, y: number): number {
  const kappa = new Float64Array(1);
  profile.addConvergence(p, 0, one(x), one(y), 1, kappa);
  return kappa[0];
}

export function potentialAt(profile: MassProfile, p: Float64Array, x: number, y: number): number {
  const psi = new Float64Array(1);
  if (profile.addPotential === undefined) throw new Error(`${profile.kind} has no potential`);
  profile.addPotential(p, 0, one(x), one(y), 1, psi);
  return psi[0];
}

/** Half the divergence of alpha by second-order central differences with step h (arcsec). */
export function halfDivergence(profile: MassProfile, p: Float64Array, x: number, y: number, h: number): number {
  const [xp] = deflectionAt(profile, p, x + h, y), [xm] = deflectionAt(profile, p, x - h, y);
  const [, yp] = deflectionAt(profile, p, x, y + h), [, ym] = deflectionAt(profile, p, x, y - h);
  return 0.5 * ((xp - xm) + (yp - ym)) / (2 * h);
}

/** Gradient of the potential by second-order central differences with step h (arcsec). */
export function potentialGradient(profile: MassProfile, p: Float64Array, x: number, y: number, h: number): [number, number] {
  return [
    (potentialAt(profile, p, x + h, y) - potentialAt(profile, p, x - h, y)) / (2 * h),
    (potentialAt(profile, p, x, y + h) - potentialAt(profile, p, x, y - h)) / (2 * h),
  ];
}

/** Jacobian d(beta)/d(theta) of the lens equation beta = theta - alpha, central differences. */
export function lensJacobian(profile: MassProfile, p: Float64Array, x: number, y: number, h: number): [number, number, number, number] {
  const [axp, ayp] = deflectionAt(profile, p, x + h, y), [axm, aym] = deflectionAt(profile, p, x - h, y);
  const [bxp, byp] = deflectionAt(profile, p, x, y + h), [bxm, bym] = deflectionAt(profile, p, x, y - h);
  return [
    1 - (axp - axm) / (2 * h), -(bxp - bxm) / (2 * h),
    -(ayp - aym) / (2 * h), 1 - (byp - bym) / (2 * h),
  ];
}

/** Deterministic scatter of points in the annulus rMin <= r <= rMax about (cx, cy). */
export function annulusPoints(count: number, rMin: number, rMax: number, cx = 0, cy = 0): Array<[number, number]> {
  const points: Array<[number, number]> = [];
  for (let i = 0; i < count; i++) {
    // Golden-angle spiral in area: even coverage with no random generator.
    const fraction = (i + 0.5) / count;
    const r = Math.sqrt(rMin * rMin + fraction * (rMax * rMax - rMin * rMin));
    const phi = i * Math.PI * (3 - Math.sqrt(5));
    points.push([cx + r * Math.cos(phi), cy + r * Math.sin(phi)]);
  }
  return points;
}

/** |a - b| / |b| for 2-vectors. */
export function relativeVectorError(a: readonly number[], b: readonly number[]): number {
  return Math.hypot(a[0] - b[0], a[1] - b[1]) / Math.hypot(b[0], b[1]);
}

/**
 * Largest relative errors over the points of kappa against half the numerical divergence of
 * alpha, and of alpha against the numerical gradient of psi (Poisson equation of lensing,
 * div alpha = 2 kappa, alpha = grad psi), central differences with step h.
 */
export function poissonErrors(
  profile: MassProfile, p: Float64Array, points: ReadonlyArray<readonly [number, number]>, h: number,
): { kappa: number; gradient: number } {
  let kappaError = 0, gradientError = 0;
  for (const [x, y] of points) {
    const kappa = convergenceAt(profile, p, x, y);
    kappaError = Math.max(kappaError, Math.abs(halfDivergence(profile, p, x, y, h) - kappa) / Math.abs(kappa));
    gradientError = Math.max(gradientError, relativeVectorError(potentialGradient(profile, p, x, y, h), deflectionAt(profile, p, x, y)));
  }
  return { kappa: kappaError, gradient: gradientError };
}
