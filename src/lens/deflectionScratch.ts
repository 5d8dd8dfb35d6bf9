/**
 * Reused deflection buffers for profiles whose potential follows from their deflection
 * (psi = x . alpha / (2 - t) for a power law of convergence slope t). Grown when a call needs
 * more room, never shrunk, so the potential allocates nothing in the steady state.
 */
const scratch = { alphaX: new Float64Array(0), alphaY: new Float64Array(0) };

/** The shared buffers, at least n long, with their first n entries set to zero. */
export function zeroedDeflectionScratch(n: number): { readonly alphaX: Float64Array; readonly alphaY: Float64Array } {
  if (scratch.alphaX.length < n) {
    scratch.alphaX = new Float64Array(n);
    scratch.alphaY = new Float64Array(n);
  } else {
    scratch.alphaX.fill(0, 0, n);
    scratch.alphaY.fill(0, 0, n);
  }
  return scratch;
}
