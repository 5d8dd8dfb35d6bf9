import { describe, expect, it } from 'vitest';
import { selectByKey } from '../../../src/numeric/sparse/selectByKey.js';
import { uniformStream } from './sparseTestMatrices.js';

// Reference: Array.prototype.sort of the keys (the k-th smallest is the k-th of the sorted keys).
describe('selectByKey', () => {
  it('puts the item with the k-th smallest key at k, none larger before it and none smaller after it', () => {
    const u = uniformStream(62);
    for (const [n, distinct] of [[1, 1], [2, 2], [7, 3], [50, 50], [64, 5], [301, 1000], [500, 2]]) {
      const key = Float64Array.from({ length: n }, () => Math.floor(u() * distinct));
      for (const k of new Set([0, n >> 1, n - 1, Math.floor(u() * n)])) {
        const from = n > 4 ? 2 : 0;
        const to = n > 4 ? n - 1 : n;
        if (k < from || k >= to) continue;
        const items = Int32Array.from({ length: n }, (_, i) => i);
        selectByKey(items, from, to, k, key);
        const range = Array.from(items.subarray(from, to)).sort((a, b) => a - b);
        expect(range, `${n}: the range keeps its items`).toEqual(Array.from({ length: to - from }, (_, i) => from + i));
        const rangeSorted = Array.from(key.subarray(from, to)).sort((a, b) => a - b);
        expect(key[items[k]], `${n}, k ${k}`).toBe(rangeSorted[k - from]);
        for (let t = from; t < k; t++) expect(key[items[t]]).toBeLessThanOrEqual(key[items[k]]);
        for (let t = k + 1; t < to; t++) expect(key[items[t]]).toBeGreaterThanOrEqual(key[items[k]]);
      }
    }
  });
});
