import { describe, expect, it } from 'vitest';
import {
  ellipsoidFromShape,
  enclosingEllipsoid,
  lnUnitBallVolume,
  mahalanobisSquared,
  sampleInEllipsoid,
} from '../../../src/sampling/nested/ellipsoid.js';
import { buildEllipsoidUnion, sampleFromUnion, unionOfEllipsoids } from '../../../src/sampling/nested/multiEllipsoid.js';
import { SeededStream } from '../../../src/numeric/random/seededStream.js';

describe('ellipsoids', () => {
  it('unit-ball volumes: pi in 2-D, 4 pi / 3 in 3-D, pi^5 / 120 in 10-D (closed forms)', () => {
    expect(Math.exp(lnUnitBallVolume(2))).toBeCloseTo(Math.PI, 13);
    expect(Math.exp(lnUnitBallVolume(3))).toBeCloseTo((4 * Math.PI) / 3, 13);
    expect(Math.exp(lnUnitBallVolume(10))).toBeCloseTo(Math.PI ** 5 / 120, 13);
  });

  it('volume of a shape matrix is V_ball sqrt(det A)', () => {
    const ellipsoid = ellipsoidFromShape([0, 0, 0], [4, 1, 0, 1, 2, 0, 0, 0, 9], 3);
    // det = 9 * (4 * 2 - 1) = 63.
    expect(ellipsoid.lnVolume).toBeCloseTo(lnUnitBallVolume(3) + 0.5 * Math.log(63), 13);
  });

  it('draws uniformly: the fraction inside the half-scaled ellipsoid is 2^-d', () => {
    const dim = 3;
    const ellipsoid = ellipsoidFromShape([0.5, 0.5, 0.5], [0.04, 0.01, 0, 0.01, 0.02, 0.005, 0, 0.005, 0.03], dim);
    const stream = SeededStream.fromSeed(4);
    const point = new Float64Array(dim);
    const scratch = new Float64Array(dim);
    const draws = 40000;
    let inner = 0;
    let outside = 0;
    for (let n = 0; n < draws; n++) {
      sampleInEllipsoid(ellipsoid, stream, point, scratch);
      const distance = mahalanobisSquared(ellipsoid, point, 0, scratch);
      if (distance <= 0.25) inner++;
      if (distance > 1 + 1e-12) outside++;
    }
    expect(outside).toBe(0);
    // Binomial standard error sqrt(p (1 - p) / draws) = 0.0017; 4 of them.
    expect(Math.abs(inner / draws - 0.125)).toBeLessThan(4 * Math.sqrt((0.125 * 0.875) / draws));
  });

  it('the enclosing ellipsoid contains every point it was built from', () => {
    const stream = SeededStream.fromSeed(8);
    const points = new Float64Array(50 * 4);
    for (let i = 0; i < points.length; i++) points[i] = stream.uniform() * (1 + (i % 4));
    const indices = Int32Array.from({ length: 50 }, (_, i) => i);
    const ellipsoid = enclosingEllipsoid(points, 4, indices, 50);
    const scratch = new Float64Array(4);
    let largest = 0;
    for (let n = 0; n < 50; n++) largest = Math.max(largest, mahalanobisSquared(ellipsoid, points, 4 * n, scratch));
    expect(largest).toBeCloseTo(1, 10);
  });
});

describe('union of ellipsoids', () => {
  it('samples the union uniformly: overlap of two unit discs holds its area fraction', () => {
    // Discs of radius 1 centred 1 apart: lens area 2 pi / 3 - sqrt(3) / 2 (circle-circle overlap),
    // union 2 pi minus that. Without the 1/q overlap correction the lens would hold 0.391.
    const union = unionOfEllipsoids(2, [ellipsoidFromShape([0, 0], [1, 0, 0, 1], 2), ellipsoidFromShape([1, 0], [1, 0, 0, 1], 2)]);
    const lens = (2 * Math.PI) / 3 - Math.sqrt(3) / 2;
    const expected = lens / (2 * Math.PI - lens);
    const stream = SeededStream.fromSeed(6);
    const point = new Float64Array(2);
    const scratch = new Float64Array(2);
    const draws = 40000;
    let inLens = 0;
    for (let n = 0; n < draws; n++) {
      sampleFromUnion(union, stream, point, scratch);
      if (point[0] ** 2 + point[1] ** 2 <= 1 && (point[0] - 1) ** 2 + point[1] ** 2 <= 1) inLens++;
    }
    expect(Math.abs(inLens / draws - expected)).toBeLessThan(4 * Math.sqrt((expected * (1 - expected)) / draws));
  });

  it('splits two separated clusters and keeps one compact cluster whole', () => {
    const stream = SeededStream.fromSeed(10);
    const count = 200;
    const two = new Float64Array(count * 2);
    const one = new Float64Array(count * 2);
    for (let n = 0; n < count; n++) {
      const offset = n % 2 === 0 ? 0.2 : 0.8;
      const angle = 2 * Math.PI * stream.uniform();
      const radius = 0.05 * Math.sqrt(stream.uniform());
      two[2 * n] = offset + radius * Math.cos(angle);
      two[2 * n + 1] = 0.5 + radius * Math.sin(angle);
      one[2 * n] = 0.5 + 2 * radius * Math.cos(angle);
      one[2 * n + 1] = 0.5 + 2 * radius * Math.sin(angle);
    }
    // Prior volume of the two discs: 2 pi 0.05^2; of the one: pi 0.1^2.
    const settings = { enlargement: 1, minimumClusterSize: 3, bootstraps: 5 };
    const split = buildEllipsoidUnion(two, 2, count, Math.log(2 * Math.PI * 0.05 ** 2), settings, stream);
    const whole = buildEllipsoidUnion(one, 2, count, Math.log(Math.PI * 0.1 ** 2), settings, stream);
    expect(split.ellipsoids.length).toBe(2);
    expect(whole.ellipsoids.length).toBe(1);
  });
});
