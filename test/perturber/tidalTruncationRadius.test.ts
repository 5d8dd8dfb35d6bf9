import { describe, expect, it } from 'vitest';
import { tidalTruncationRadius } from '../../src/perturber/tidalTruncationRadius.js';

describe('tidalTruncationRadius', () => {
  it('is r (m / (2 M))^(1/3), by hand', () => {
    // r = 0.8", m = 1e9, M(<r) = 2.5e11: m / 2M = 0.002, whose cube root is 2^(1/3) / 10 =
    // 0.12599210498948732 (2^(1/3) = 1.2599210498948732, common knowledge), so r_t = 0.10079368399158985".
    expect(tidalTruncationRadius(0.8, 1e9, 2.5e11)).toBeCloseTo(0.10079368399158985, 15);
    // Scaling: eight times the subhalo mass doubles r_t; eight times the host mass halves it.
    expect(tidalTruncationRadius(0.8, 8e9, 2.5e11) / tidalTruncationRadius(0.8, 1e9, 2.5e11)).toBeCloseTo(2, 14);
    expect(tidalTruncationRadius(0.8, 1e9, 2e12) / tidalTruncationRadius(0.8, 1e9, 2.5e11)).toBeCloseTo(0.5, 14);
  });
  it('is zero where the host holds no mass', () => {
    expect(tidalTruncationRadius(0, 1e9, 0)).toBe(0);
  });
});
