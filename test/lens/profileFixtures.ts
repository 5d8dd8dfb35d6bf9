// Test helper: the scipy reference values of fixtures/profiles.json (made by fixtures/make_profiles.py).
import { readFileSync } from 'node:fs';

export interface ProfileFixtures {
  /** [gamma, X, G(X)]: projected generalised NFW in units of kappa_s. */
  gnfwConvergence: Array<[number, number, number]>;
  /** [gamma, x, m by quadrature, m by hypergeometric closed form]: enclosed mass in 4 pi rho_s r_s^3. */
  gnfwEnclosedMass: Array<[number, number, number, number]>;
  /** [n, eta, total of the Sersic mass shape in R_e^2]. */
  sersicTotal: Array<[number, number, number]>;
  /** [n, eta, r / R_e, spherical mass within r in units of the shape's value at R_e times R_e^2]. */
  sersicSphericalMass: Array<[number, number, number, number]>;
  /** [thetaE, core radius, r, spherical mass in Sigma_crit arcsec^2] of the cored isothermal convergence. */
  isothermalSphericalMass: Array<[number, number, number, number]>;
  /** [thetaE, gamma, r, spherical mass in Sigma_crit arcsec^2] of the power-law convergence. */
  powerLawSphericalMass: Array<[number, number, number, number]>;
}

export const profileFixtures = JSON.parse(
  readFileSync(new URL('./fixtures/profiles.json', import.meta.url), 'utf8'),
) as ProfileFixtures;
