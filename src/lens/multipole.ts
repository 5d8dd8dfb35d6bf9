import { InputError, expectedFound } from '../errors.js';
import type { MassProfile } from './massProfile.js';

/** The multipole orders arcsift offers. */
export type MultipoleOrder = 1 | 3 | 4;
export const multipoleOrders: readonly MultipoleOrder[] = [1, 3, 4];

/**
 * Angular multipole of order m added to the main lens (circular in its radial part):
 *   kappa = a ((3 - gamma)/2) (thetaE / r)^(gamma - 1) cos(m (phi - phiM)),
 * r, phi measured from (centerXArcsec, centerYArcsec); a = multipoleStrength, phiM =
 * multipoleAngleDeg (counter-clockwise from +x; phiM and phiM + 360/m deg are the same),
 * thetaE = einsteinRadiusArcsec, gamma = slope (1 < gamma < 3). The centre, Einstein radius
 * and slope are those of the main power law, so a is the fractional amplitude of the m-th
 * Fourier term relative to the circular power law's convergence at the same radius:
 * kappa_m(r, phi) = a kappa_circ(r) cos(m (phi - phiM)); at r = thetaE the m-th Fourier
 * coefficient of kappa is a (3 - gamma)/2 (a/2 when isothermal). Multipoles of this kind are
 * used by Chu et al. 2013 (isothermal) and O'Riordan & Vegetti 2024 (power law; arXiv:2310.10714);
 * their papers were not reachable here, so whether their amplitude is normalised exactly as this
 * a is not checked. The potential below is derived from this kappa and tested through the
 * Poisson equation (test/lens/multipole.test.ts).
 *
 * Potential from the Poisson equation lap psi = 2 kappa with k = 3 - gamma, rho = r / thetaE:
 *   m = 3, 4:  psi = a thetaE^2 k / (k^2 - m^2) rho^k cos(m (phi - phiM))   (never resonant, k < 2);
 *   m = 1:     psi = a thetaE^2 k / (k + 1) rho (rho^(k-1) - 1) / (k - 1) cos(phi - phiM),
 * the m = 1 form being the power solution k/(k^2 - 1) rho^k minus the harmonic term
 * k/(k^2 - 1) rho (zero convergence, a uniform deflection -a thetaE k/(k^2 - 1) (cos phiM, sin phiM)),
 * so that psi stays finite through the resonance k = m = 1 (gamma = 2), where it becomes
 * (a thetaE / 2) r ln(r / thetaE) cos(phi - phiM). (rho^u - 1)/u is evaluated as expm1(u ln rho)/u,
 * accurate to rounding for every u != 0, and is ln rho at u = 0, so slopes near 2 are stable.
 * The deflection is the gradient of psi; at the centre nothing is added (deflection and
 * potential are 0 or divergent there, kappa has no limit).
 */
export function multipole(order: MultipoleOrder): MassProfile {
  const profile = profiles.get(order);
  if (profile === undefined) throw new InputError(`multipole order ${expectedFound('1, 3 or 4', order)}`);
  return profile;
}

// The parameter layout shared by every order.
const parameterNames = [
  'multipoleStrength', 'multipoleAngleDeg', 'centerXArcsec', 'centerYArcsec',
  'einsteinRadiusArcsec', 'slope',
] as const;

const DEG = Math.PI / 180;

/**
 * The radial functions at one point, for psi = a thetaE^2 G(rho) cos(m Phi):
 * gPrime = dG/drho and gOverRho = G/rho (set by radialTerms, no allocation).
 */
const radial = { gPrime: 0, gOverRho: 0 };

// The Poisson-equation solutions described above: G = k/(k^2 - m^2) rho^k for m = 3, 4, and
// G = k/(k + 1) rho E(rho) with E = (rho^(k-1) - 1)/(k - 1) for m = 1.
function radialTerms(m: MultipoleOrder, k: number, rho: number): void {
  if (m === 1) {
    const u = k - 1, logRho = Math.log(rho);
    const e = u === 0 ? logRho : Math.expm1(u * logRho) / u;
    const c = k / (k + 1);
    radial.gOverRho = c * e;
    radial.gPrime = c * (k * e + 1);
  } else {
    // exp(u ln rho) rather than Math.pow: same accuracy, faster in V8 (timings in the commit that made the change).
    const power = Math.exp((k - 1) * Math.log(rho)), c = k / (k * k - m * m);
    radial.gOverRho = c * power;
    radial.gPrime = c * k * power;
  }
}

function makeMultipole(m: MultipoleOrder): MassProfile {
  return {
    kind: `multipole${m}`,
    parameterNames,

    // Gradient of the Poisson-equation potential above (alpha_r = dpsi/dr, alpha_phi = dpsi/(r dphi)).
    addDeflection(p, offset, x, y, n, alphaX, alphaY) {
      const a = p[offset], angle = m * p[offset + 1] * DEG;
      const cx = p[offset + 2], cy = p[offset + 3], thetaE = p[offset + 4], k = 3 - p[offset + 5];
      const cosM = Math.cos(angle), sinM = Math.sin(angle), scale = a * thetaE, inverseThetaE = 1 / thetaE;
      for (let i = 0; i < n; i++) {
        const dx = x[i] - cx, dy = y[i] - cy;
        const r = Math.sqrt(dx * dx + dy * dy);
        if (r === 0) continue;
        const c = dx / r, s = dy / r;
        // cos(m phi), sin(m phi) by repeated complex multiplication, then rotated by phiM.
        let cm = c, sm = s;
        for (let j = 1; j < m; j++) {
          const next = cm * c - sm * s;
          sm = cm * s + sm * c;
          cm = next;
        }
        const cosTerm = cm * cosM + sm * sinM, sinTerm = sm * cosM - cm * sinM;
        radialTerms(m, k, r * inverseThetaE);
        const alphaR = scale * radial.gPrime * cosTerm;
        const alphaPhi = -scale * m * radial.gOverRho * sinTerm;
        alphaX[i] += alphaR * c - alphaPhi * s;
        alphaY[i] += alphaR * s + alphaPhi * c;
      }
    },

    // The convergence above (Chu et al. 2013; O'Riordan & Vegetti 2024).
    addConvergence(p, offset, x, y, n, kappa) {
      const a = p[offset], angle = p[offset + 1] * DEG;
      const cx = p[offset + 2], cy = p[offset + 3], thetaE = p[offset + 4], k = 3 - p[offset + 5];
      const amplitude = 0.5 * a * k, exponent = 0.5 * (k - 2), inverseThetaE2 = 1 / (thetaE * thetaE);
      for (let i = 0; i < n; i++) {
        const dx = x[i] - cx, dy = y[i] - cy;
        const r2 = dx * dx + dy * dy;
        if (r2 === 0) continue;
        kappa[i] += amplitude * Math.exp(exponent * Math.log(r2 * inverseThetaE2)) * Math.cos(m * (Math.atan2(dy, dx) - angle));
      }
    },

    // The Poisson-equation potential above.
    addPotential(p, offset, x, y, n, psi) {
      const a = p[offset], angle = p[offset + 1] * DEG;
      const cx = p[offset + 2], cy = p[offset + 3], thetaE = p[offset + 4], k = 3 - p[offset + 5];
      const scale = a * thetaE * thetaE, inverseThetaE = 1 / thetaE;
      for (let i = 0; i < n; i++) {
        const dx = x[i] - cx, dy = y[i] - cy;
        const r = Math.sqrt(dx * dx + dy * dy);
        if (r === 0) continue;
        const rho = r * inverseThetaE;
        radialTerms(m, k, rho);
        psi[i] += scale * rho * radial.gOverRho * Math.cos(m * (Math.atan2(dy, dx) - angle));
      }
    },
  };
}

const profiles = new Map<number, MassProfile>(multipoleOrders.map((m) => [m, makeMultipole(m)]));
