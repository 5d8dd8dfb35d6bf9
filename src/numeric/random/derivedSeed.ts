/** Seeds derived from a run seed for side streams (error simulation, rank jitter, resampling). */
export function derivedSeed(seed: number, stream: number): number {
  // Knuth's multiplicative hash constant spreads nearby seeds; kept in [1, 2^32 - 1].
  const mixed = (Math.imul(seed >>> 0, 2654435761) + Math.imul(stream + 1, 40503)) >>> 0;
  return mixed === 0 ? 1 : mixed;
}
