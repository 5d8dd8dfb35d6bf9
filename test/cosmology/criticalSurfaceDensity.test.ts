import { describe, expect, it } from 'vitest';
import {
  criticalSurfaceDensitySolarPerArcsec2, criticalSurfaceDensitySolarPerMpc2,
} from '../../src/cosmology/criticalSurfaceDensity.js';
import { flatLambdaCdm } from '../../src/cosmology/flatLambdaCdm.js';
import { lensingContext } from '../../src/cosmology/lensingContext.js';
import { InputError } from '../../src/errors.js';
import { distanceCases, relativeDifference } from './distanceFixture.js';

describe('critical surface density against astropy', () => {
  // 1e-6 relative, as for the distances: astropy's G * M_sun equals the nominal GM_sun we use to
  // about 1e-15, so only the distance quadratures (<~1e-8) differ.
  const tolerance = 1e-6;
  for (const entry of distanceCases) {
    it(`H0 = ${entry.hubbleConstantKmPerSecPerMpc}, Om = ${entry.matterDensity}, z = ${entry.lensRedshift} -> ${entry.sourceRedshift}`, () => {
      const cosmology = flatLambdaCdm(entry);
      const zd = entry.lensRedshift;
      const zs = entry.sourceRedshift;
      expect(relativeDifference(criticalSurfaceDensitySolarPerMpc2(cosmology, zd, zs), entry.criticalSurfaceDensitySolarPerMpc2))
        .toBeLessThan(tolerance);
      expect(relativeDifference(criticalSurfaceDensitySolarPerArcsec2(cosmology, zd, zs), entry.criticalSurfaceDensitySolarPerArcsec2))
        .toBeLessThan(tolerance);
      const context = lensingContext(cosmology, zd, zs);
      expect(relativeDifference(context.criticalSurfaceDensitySolarPerArcsec2, entry.criticalSurfaceDensitySolarPerArcsec2))
        .toBeLessThan(tolerance);
      expect(relativeDifference(context.criticalDensitySolarPerMpc3, entry.criticalDensityLensSolarPerMpc3)).toBeLessThan(tolerance);
      expect(relativeDifference(context.kpcPerArcsec, entry.kpcPerArcsecLens)).toBeLessThan(tolerance);
      expect(relativeDifference(context.lensDistanceMpc, entry.angularDiameterDistanceLensMpc)).toBeLessThan(tolerance);
    });
  }
  it('rejects a source in front of the lens', () => {
    const cosmology = flatLambdaCdm({ hubbleConstantKmPerSecPerMpc: 70, matterDensity: 0.3 });
    expect(() => criticalSurfaceDensitySolarPerMpc2(cosmology, 1, 0.5)).toThrow(InputError);
    expect(() => lensingContext(cosmology, 0, 1)).toThrow(/lensRedshift/);
  });
});
