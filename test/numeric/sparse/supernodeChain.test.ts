import { describe, expect, it } from 'vitest';
import { SupernodeChain } from '../../../src/numeric/sparse/supernodeChain.js';

describe('SupernodeChain', () => {
  it('cuts the columns into blocks, each the child of the next, the last one shorter', () => {
    const chain = new SupernodeChain();
    const tree = chain.build(10, 4);
    expect(tree.count).toBe(3);
    expect(Array.from(tree.start.subarray(0, 4))).toEqual([0, 4, 8, 10]);
    expect(Array.from(tree.parent.subarray(0, 3))).toEqual([1, 2, -1]);
    const exact = chain.build(8, 4);
    expect(Array.from(exact.start.subarray(0, 3))).toEqual([0, 4, 8]);
    expect(Array.from(exact.parent.subarray(0, 2))).toEqual([1, -1]);
    expect(chain.build(0, 4).count).toBe(0);
    expect(() => chain.build(5, 0)).toThrow(RangeError);
  });
});
