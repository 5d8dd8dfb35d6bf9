import { describe, expect, it } from 'vitest';
import { BatchOccupancy } from '../../src/parallel/batchOccupancy.js';

// Worked example (common practice: a call of b equal-cost points on T threads takes ceil(b / T)
// point-times): calls of 2, 2, 1 and 3 points are 8 points in 1 + 1 + 1 + 2 = 5 point-times on 2
// threads (speed-up 1.6) and 2 + 2 + 1 + 3 = 8 on one (speed-up 1).
describe('batch occupancy', () => {
  it('gives mean points per call and the equal-cost speed-up of a worked example', () => {
    const occupancy = new BatchOccupancy();
    for (const size of [2, 2, 1, 3]) occupancy.record(size);
    expect(occupancy.calls).toBe(4);
    expect(occupancy.meanPoints()).toBe(2);
    expect(occupancy.idealSpeedUp(2)).toBeCloseTo(1.6, 12);
    expect(occupancy.idealSpeedUp(1)).toBe(1);
    expect(occupancy.idealSpeedUp(8)).toBeCloseTo(8 / 4, 12);
  });
});
