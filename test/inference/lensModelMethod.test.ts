import { describe, expect, it } from 'vitest';
import { ELLIPSOID_LIVE_POINTS_PER_PARAMETER, lensModelMethod } from '../../src/inference/runModelEvidence.js';

// The rule behind 'auto' is a measured choice of this project (DEVELOPERS.md, measured choices),
// not an outside fact: these checks pin what it decides so that a change is deliberate.
describe("'auto' constrained draws for a lens model", () => {
  it('take ellipsoids only for a small smooth model with enough live points per parameter', () => {
    expect(ELLIPSOID_LIVE_POINTS_PER_PARAMETER).toBe(10);
    expect(lensModelMethod('auto', 5, 0, 50)).toBe('ellipsoids');
    expect(lensModelMethod('auto', 5, 0, 49)).toBe('slice');
    expect(lensModelMethod('auto', 6, 0, 50)).toBe('slice');
    expect(lensModelMethod('auto', 8, 0, 200)).toBe('ellipsoids');
    expect(lensModelMethod('auto', 9, 0, 1000)).toBe('slice');
    expect(lensModelMethod('auto', 5, 1, 1000)).toBe('slice');
  });

  it('leave an explicit choice alone', () => {
    expect(lensModelMethod('ellipsoids', 9, 1, 20)).toBe('ellipsoids');
    expect(lensModelMethod('slice', 3, 0, 500)).toBe('slice');
  });
});
