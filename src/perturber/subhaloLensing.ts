import type { LensingContext } from '../cosmology/lensingContext.js';
import { generalisedNfwEnclosedMassFactor } from '../lens/darkHalo/generalisedNfwEnclosedMass.js';
import { duffy2008Concentration } from './concentrationMass.js';

/**
 * Conversions between physical subhalo masses (solar masses) and the lensing-unit parameters of
 * the profiles in this folder. All take a LensingContext (cosmology/lensingContext.ts) built once
 * per lens system and do a handful of arithmetic operations: no integration, cheap enough to run
 * once per likelihood call. M200 is the mass inside r200, the radius within which the mean density
 * is 200 times the critical density of the universe at the lens redshift.
 * Inputs are trusted (validated where configs are read): a non-positive mass gives NaN.
 */

/** NFW lensing parameters of a halo of given M200. */
export interface NfwFromMass {
  readonly concentration: number;
  readonly r200Kpc: number;
  readonly scaleRadiusKpc: number;
  readonly scaleRadiusArcsec: number;
  /** rho_s of the NFW density rho_s / ((r/r_s)(1 + r/r_s)^2). */
  readonly densityScaleSolarPerMpc3: number;
  /** kappa_s = rho_s r_s / Sigma_crit. */
  readonly convergenceScale: number;
}

/** Truncated-NFW lensing parameters of a subhalo of given M200 and truncation ratio. */
export interface SubhaloFromMass extends NfwFromMass {
  readonly truncationRatio: number;
  readonly truncationRadiusKpc: number;
  readonly truncationRadiusArcsec: number;
  /** Total mass of the truncated profile, integrated to infinity. */
  readonly totalMassSolar: number;
}

export interface NfwMassInput {
  readonly massM200Solar: number;
  /** When absent, the Duffy et al. 2008 relation at the lens redshift (concentrationMass.ts). */
  readonly concentration?: number;
}

export interface SubhaloMassInput extends NfwMassInput {
  /** tau = r_t / r_s. */
  readonly truncationRatio: number;
}

// NFW mass inside r = c r_s in units of 4 pi rho_s r_s^3: m(c) = ln(1 + c) - c/(1 + c)
// (Navarro, Frenk & White 1996, ApJ 462, 563).
export function nfwEnclosedMassFactor(concentration: number): number {
  return Math.log1p(concentration) - concentration / (1 + concentration);
}

// Total mass of the n = 1 truncated NFW in units of 4 pi rho_s r_s^3 (Baltz, Marshall & Oguri 2009,
// JCAP 01, 015, appendix): tau^2/(tau^2 + 1)^2 [(tau^2 - 1) ln tau + pi tau - (tau^2 + 1)].
export function truncatedNfwTotalMassFactor(truncationRatio: number): number {
  const tau = truncationRatio, tau2 = tau * tau;
  return (tau2 / ((tau2 + 1) * (tau2 + 1))) *
    ((tau - 1) * (tau + 1) * Math.log(tau) + Math.PI * tau - (tau2 + 1));
}

// r200 from M200 = (4/3) pi r200^3 200 rho_crit(z_d) (Navarro, Frenk & White 1996 with Delta = 200).
function r200MpcOf(massM200Solar: number, context: LensingContext): number {
  return Math.cbrt((3 * massM200Solar) / (800 * Math.PI * context.criticalDensitySolarPerMpc3));
}

// rho_s = M200 / (4 pi r_s^3 m(c)) (Navarro, Frenk & White 1996), m(c) the enclosed-mass factor.
function densityScaleOf(massM200Solar: number, enclosedMassFactor: number, scaleRadiusMpc: number): number {
  return massM200Solar / (4 * Math.PI * scaleRadiusMpc * scaleRadiusMpc * scaleRadiusMpc * enclosedMassFactor);
}

// r_s = r200/c, rho_s = M200 / (4 pi r_s^3 m(c)) (Navarro, Frenk & White 1996),
// kappa_s = rho_s r_s / Sigma_crit, theta_s = r_s / D_d.
export function nfwFromMass(input: NfwMassInput, context: LensingContext): NfwFromMass {
  const mass = input.massM200Solar;
  const concentration = input.concentration ??
    duffy2008Concentration(mass, context.lensRedshift, context.littleH);
  const r200Mpc = r200MpcOf(mass, context);
  const scaleRadiusMpc = r200Mpc / concentration;
  const densityScale = densityScaleOf(mass, nfwEnclosedMassFactor(concentration), scaleRadiusMpc);
  return {
    concentration,
    r200Kpc: 1000 * r200Mpc,
    scaleRadiusKpc: 1000 * scaleRadiusMpc,
    scaleRadiusArcsec: scaleRadiusMpc / context.mpcPerArcsec,
    densityScaleSolarPerMpc3: densityScale,
    convergenceScale: (densityScale * scaleRadiusMpc) / context.criticalSurfaceDensitySolarPerMpc2,
  };
}

// The same conversion as nfwFromMass without allocating, for the likelihood loop: writes
// kappa_s to p[offset] and theta_s to p[offset + 1], the first two parameters of nfw and truncatedNfw.
export function writeNfwLensingParameters(
  massM200Solar: number, concentration: number, context: LensingContext, p: Float64Array, offset: number,
): void {
  writeHaloLensingParameters(massM200Solar, concentration, nfwEnclosedMassFactor(concentration), context, p, offset);
}

// The same for the generalised NFW rho_s / ((r/r_s)^gamma (1 + r/r_s)^(3 - gamma)) (Zhao 1996): with
// c = r200 / r_s, rho_s = M200 / (4 pi r_s^3 m_gamma(c)), m_gamma of lens/darkHalo/generalisedNfwEnclosedMass.ts.
export function writeGeneralisedNfwLensingParameters(
  massM200Solar: number, concentration: number, innerSlope: number, context: LensingContext, p: Float64Array, offset: number,
): void {
  const factor = generalisedNfwEnclosedMassFactor(concentration, innerSlope);
  writeHaloLensingParameters(massM200Solar, concentration, factor, context, p, offset);
}

// kappa_s = rho_s r_s / Sigma_crit into p[offset], theta_s = r_s / D_d into p[offset + 1].
function writeHaloLensingParameters(
  massM200Solar: number, concentration: number, enclosedMassFactor: number, context: LensingContext, p: Float64Array, offset: number,
): void {
  const scaleRadiusMpc = r200MpcOf(massM200Solar, context) / concentration;
  p[offset] = (densityScaleOf(massM200Solar, enclosedMassFactor, scaleRadiusMpc) * scaleRadiusMpc) /
    context.criticalSurfaceDensitySolarPerMpc2;
  p[offset + 1] = scaleRadiusMpc / context.mpcPerArcsec;
}

// nfwFromMass followed by the Baltz, Marshall & Oguri 2009 truncation r_t = tau r_s and total mass
// M_tot = 4 pi rho_s r_s^3 truncatedNfwTotalMassFactor(tau).
export function subhaloFromMass(input: SubhaloMassInput, context: LensingContext): SubhaloFromMass {
  const halo = nfwFromMass(input, context);
  const tau = input.truncationRatio;
  const rs = halo.scaleRadiusKpc / 1000;
  return {
    ...halo,
    truncationRatio: tau,
    truncationRadiusKpc: tau * halo.scaleRadiusKpc,
    truncationRadiusArcsec: tau * halo.scaleRadiusArcsec,
    totalMassSolar:
      4 * Math.PI * halo.densityScaleSolarPerMpc3 * rs * rs * rs * truncatedNfwTotalMassFactor(tau),
  };
}

// Total mass of a truncated NFW from its lensing parameters: 4 pi rho_s r_s^3 T(tau) with
// rho_s r_s = kappa_s Sigma_crit, i.e. 4 pi kappa_s Sigma_crit[per arcsec^2] theta_s^2 T(tau) (BMO09).
export function truncatedNfwTotalMassSolar(
  convergenceScale: number, scaleRadiusArcsec: number, truncationRatio: number, context: LensingContext,
): number {
  return 4 * Math.PI * convergenceScale * context.criticalSurfaceDensitySolarPerArcsec2 *
    scaleRadiusArcsec * scaleRadiusArcsec * truncatedNfwTotalMassFactor(truncationRatio);
}

/** M200 and concentration of the NFW halo with given lensing parameters. */
export interface NfwMassFromLensing {
  readonly massM200Solar: number;
  readonly concentration: number;
  readonly r200Kpc: number;
}

// Inverts nfwFromMass for reporting: rho_s / rho_crit = (200/3) c^3 / m(c) (Navarro, Frenk & White
// 1996) is solved for c by bisection in ln c on [1e-3, 1e4] (the left side increases with c),
// then M200 = 4 pi rho_s r_s^3 m(c). Returns NaN fields when no c in that range fits.
export function nfwMassFromLensing(
  convergenceScale: number, scaleRadiusArcsec: number, context: LensingContext,
): NfwMassFromLensing {
  const scaleRadiusMpc = scaleRadiusArcsec * context.mpcPerArcsec;
  const densityScale = (convergenceScale * context.criticalSurfaceDensitySolarPerMpc2) / scaleRadiusMpc;
  const target = (3 * densityScale) / (200 * context.criticalDensitySolarPerMpc3);
  const overdensity = (c: number): number => (c * c * c) / nfwEnclosedMassFactor(c);
  let low = Math.log(1e-3), high = Math.log(1e4);
  if (!(overdensity(Math.exp(low)) <= target && target <= overdensity(Math.exp(high)))) {
    return { massM200Solar: NaN, concentration: NaN, r200Kpc: NaN };
  }
  for (let iteration = 0; iteration < 200 && high - low > 1e-15; iteration++) {
    const middle = 0.5 * (low + high);
    if (overdensity(Math.exp(middle)) < target) low = middle;
    else high = middle;
  }
  const concentration = Math.exp(0.5 * (low + high));
  return {
    massM200Solar: 4 * Math.PI * densityScale * scaleRadiusMpc ** 3 * nfwEnclosedMassFactor(concentration),
    concentration,
    r200Kpc: 1000 * concentration * scaleRadiusMpc,
  };
}

// Point-mass Einstein radius theta_E^2 = (4 G M / c^2) D_ds / (D_d D_s) = M / (pi Sigma_crit D_d^2)
// (Schneider, Ehlers & Falco 1992, point-mass lens).
export function pointMassEinsteinRadiusArcsec(massSolar: number, context: LensingContext): number {
  return Math.sqrt(massSolar / (Math.PI * context.criticalSurfaceDensitySolarPerArcsec2));
}

// Inverse of pointMassEinsteinRadiusArcsec: M = pi Sigma_crit D_d^2 theta_E^2.
export function pointMassFromEinsteinRadiusSolar(einsteinRadiusArcsec: number, context: LensingContext): number {
  return Math.PI * context.criticalSurfaceDensitySolarPerArcsec2 * einsteinRadiusArcsec * einsteinRadiusArcsec;
}

// Pseudo-Jaffe total mass: Sigma_crit 2 pi int_0^inf kappa r dr = pi Sigma_crit b (a - s), positive for
// a > s (Keeton 2001; Elíasdóttir et al. 2007), Sigma_crit per arcsec^2, b, s, a in arcsec.
export function pseudoJaffeTotalMassSolar(
  strengthArcsec: number, coreRadiusArcsec: number, truncationRadiusArcsec: number, context: LensingContext,
): number {
  return Math.PI * context.criticalSurfaceDensitySolarPerArcsec2 * strengthArcsec *
    (truncationRadiusArcsec - coreRadiusArcsec);
}

// Inverse of pseudoJaffeTotalMassSolar for the strength b = M / (pi Sigma_crit (a - s)).
export function pseudoJaffeStrengthArcsec(
  totalMassSolar: number, coreRadiusArcsec: number, truncationRadiusArcsec: number, context: LensingContext,
): number {
  return totalMassSolar /
    (Math.PI * context.criticalSurfaceDensitySolarPerArcsec2 * (truncationRadiusArcsec - coreRadiusArcsec));
}
