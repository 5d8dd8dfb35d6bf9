/** A reproducible uniform generator (Park & Miller 1988 minimal standard), for sample points. */
export function uniformSequence(seed: number): () => number {
  let state = seed;
  return () => {
    state = (state * 16807) % 2147483647;
    return state / 2147483647;
  };
}
