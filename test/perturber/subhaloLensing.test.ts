import { describe, expect, it } from 'vitest';
import { criticalSurfaceDensitySolarPerMpc2 } from '../../src/cosmology/criticalSurfaceDensity.js';
import { flatLambdaCdm } from '../../src/cosmology/flatLambdaCdm.js';
import { lensingContext } from '../../src/cosmology/lensingContext.js';
import { duffy2008Concentration } from '../../src/perturber/concentrationMass.js';
import {
  nfwFromMass, nfwMassFromLensing, pointMassEinsteinRadiusArcsec, pointMassFromEinsteinRadiusSolar,
  subhaloFromMass, truncatedNfwTotalMassSolar, writeNfwLensingParameters,
} from '../../src/perturber/subhaloLensing.js';
import { integrateExpSinh, integrateTanhSinh } from './doubleExponential.js';

// Distances, Sigma_crit and rho_crit are checked against astropy in test/cosmology.
const cosmology = flatLambdaCdm({ hubbleConstantKmPerSecPerMpc: 70, matterDensity: 0.3 });
const lensRedshift = 0.5, sourceRedshift = 2;
const context = lensingContext(cosmology, lensRedshift, sourceRedshift);
const arcsecRad = Math.PI / 648_000;
const relative = (found: number, expected: number): number => Math.abs(found / expected - 1);

describe('M200 to NFW lensing parameters and back', () => {
  for (const [massM200Solar, concentration] of [[1e7, undefined], [1e9, undefined], [1e11, 15], [3e12, 4]] as const) {
    it(`M200 = ${massM200Solar} M_sun, c = ${concentration ?? 'Duffy et al. 2008'}`, () => {
      const halo = nfwFromMass({ massM200Solar, concentration }, context);
      // Undo the lensing units by hand: r_s = theta_s D_d, rho_s = kappa_s Sigma_crit / r_s.
      const scaleRadiusMpc = halo.scaleRadiusArcsec * arcsecRad * cosmology.angularDiameterDistanceMpc(lensRedshift);
      const densityScale = (halo.convergenceScale *
        criticalSurfaceDensitySolarPerMpc2(cosmology, lensRedshift, sourceRedshift)) / scaleRadiusMpc;
      const r200Mpc = halo.r200Kpc / 1000;
      expect(relative(scaleRadiusMpc * halo.concentration, r200Mpc)).toBeLessThan(1e-12);
      // 4 pi int_0^r200 rho r^2 dr of the NFW density (Navarro, Frenk & White 1996) by tanh-sinh
      // (asked 1e-13) gives M200 back: 1e-11 relative.
      const enclosed = 4 * Math.PI * integrateTanhSinh((r) => {
        const u = r / scaleRadiusMpc;
        return (densityScale / (u * (1 + u) * (1 + u))) * r * r;
      }, 0, r200Mpc);
      expect(relative(enclosed, massM200Solar)).toBeLessThan(1e-11);
      // The definition of r200: mean density inside it is 200 rho_crit(z_d); rounding only.
      const meanDensity = massM200Solar / ((4 / 3) * Math.PI * r200Mpc ** 3);
      expect(relative(meanDensity, 200 * cosmology.criticalDensitySolarPerMpc3(lensRedshift))).toBeLessThan(1e-13);
      // The allocation-free writer gives the same two numbers (same arithmetic: rounding only).
      const written = Float64Array.of(-1, -1, -1, -1);
      writeNfwLensingParameters(massM200Solar, halo.concentration, context, written, 1);
      expect([written[0], written[3]]).toEqual([-1, -1]);
      expect(relative(written[1], halo.convergenceScale)).toBeLessThan(1e-15);
      expect(relative(written[2], halo.scaleRadiusArcsec)).toBeLessThan(1e-15);
      // The reporting inverse recovers M200 and c (bisection to 1e-15 in ln c; 1e-12 relative).
      const back = nfwMassFromLensing(halo.convergenceScale, halo.scaleRadiusArcsec, context);
      expect(relative(back.massM200Solar, massM200Solar)).toBeLessThan(1e-12);
      expect(relative(back.concentration, halo.concentration)).toBeLessThan(1e-12);
    });
  }
});

describe('truncated subhalo total mass', () => {
  for (const truncationRatio of [0.7, 5, 30]) {
    it(`tau = ${truncationRatio}`, () => {
      const halo = subhaloFromMass({ massM200Solar: 1e9, truncationRatio }, context);
      const rs = halo.scaleRadiusKpc / 1000;
      // 4 pi rho_s r_s^3 int_0^inf u^2 rho(u)/rho_s du, the BMO09 truncated density integrated by
      // exp-sinh (asked 1e-13): 1e-11 relative.
      const integral = integrateExpSinh((u) =>
        (u * u * truncationRatio * truncationRatio) /
        (u * (1 + u) * (1 + u) * (truncationRatio * truncationRatio + u * u)), 1);
      const numerical = 4 * Math.PI * halo.densityScaleSolarPerMpc3 * rs ** 3 * integral;
      expect(relative(halo.totalMassSolar, numerical)).toBeLessThan(1e-11);
      expect(relative(
        truncatedNfwTotalMassSolar(halo.convergenceScale, halo.scaleRadiusArcsec, truncationRatio, context),
        halo.totalMassSolar,
      )).toBeLessThan(1e-12);
      expect(relative(halo.truncationRadiusArcsec, truncationRatio * halo.scaleRadiusArcsec)).toBeLessThan(1e-15);
    });
  }
});

describe('point-mass Einstein radius', () => {
  it('theta_E^2 = (4 G M / c^2) D_ds / (D_d D_s) (Schneider, Ehlers & Falco 1992)', () => {
    // Written out from GM_sun (IAU 2015 B3), c and the IAU parsec, apart from Sigma_crit.
    const gmSun = 1.3271244e20, c = 299_792_458, mpc = (648_000 / Math.PI) * 149_597_870_700 * 1e6;
    const massSolar = 3e8;
    const dd = cosmology.angularDiameterDistanceMpc(lensRedshift);
    const ds = cosmology.angularDiameterDistanceMpc(sourceRedshift);
    const dds = cosmology.angularDiameterDistanceBetweenMpc(lensRedshift, sourceRedshift);
    const thetaRad = Math.sqrt(((4 * gmSun * massSolar) / (c * c * mpc)) * (dds / (dd * ds)));
    const thetaE = pointMassEinsteinRadiusArcsec(massSolar, context);
    expect(relative(thetaE, thetaRad / arcsecRad)).toBeLessThan(1e-12);
    expect(relative(pointMassFromEinsteinRadiusSolar(thetaE, context), massSolar)).toBeLessThan(1e-14);
  });
});

describe('Duffy et al. 2008 concentration (Table 1, NFW, M200, full sample; see src/perturber/concentrationMass.ts)', () => {
  // c200 = 5.71 (M / 2e12 h^-1 M_sun)^-0.084 (1 + z)^-0.47: the pivot gives A, then each slope.
  it('is 5.71 at the pivot mass at z = 0 and follows both slopes', () => {
    const h = 0.7;
    const pivot = 2e12 / h;
    expect(relative(duffy2008Concentration(pivot, 0, h), 5.71)).toBeLessThan(1e-15);
    expect(relative(duffy2008Concentration(pivot, 1, h), 5.71 * 2 ** -0.47)).toBeLessThan(1e-15);
    expect(relative(duffy2008Concentration(100 * pivot, 0, h), 5.71 * 100 ** -0.084)).toBeLessThan(1e-15);
  });
});
