/**
 * Concentration-mass relation of Duffy et al. 2008 (MNRAS 390, L64; arXiv:0804.2486), Table 1,
 * NFW fits with M200 defined at 200 times the critical density, full sample (0 <= z <= 2):
 *   c200 = A (M200 / M_pivot)^B (1 + z)^C,   A = 5.71, B = -0.084, C = -0.47, M_pivot = 2e12 h^-1 M_sun.
 * The four numbers are quoted from memory of Table 1 (not checked against the table itself; they
 * match the values widely used in the subhalo-lensing literature).
 * The fit was made to WMAP5 simulations of field haloes of 1e11 to 1e15 h^-1 M_sun; applying it to
 * subhaloes and to lower masses is an extrapolation (common practice in subhalo-lensing work).
 */
export const duffy2008FullSampleM200 = Object.freeze({
  amplitude: 5.71,
  massSlope: -0.084,
  redshiftSlope: -0.47,
  pivotMassSolarOverH: 2e12,
});

// Duffy et al. 2008, Table 1 (NFW, M200, full sample): c200(M200, z), M200 in M_sun, h = H0/100.
export function duffy2008Concentration(massM200Solar: number, redshift: number, littleH: number): number {
  const { amplitude, massSlope, redshiftSlope, pivotMassSolarOverH } = duffy2008FullSampleM200;
  return amplitude *
    Math.pow((massM200Solar * littleH) / pivotMassSolarOverH, massSlope) *
    Math.pow(1 + redshift, redshiftSlope);
}
