const PI_TO_MINUS_QUARTER = Math.pow(Math.PI, -0.25);

// Recurrence coefficients sqrt(2 / (k+1)) and sqrt(k / (k+1)), grown on demand.
let raising = new Float64Array(0);
let lowering = new Float64Array(0);

/** The recurrence coefficients up to maxOrder (shared arrays, grown on demand). */
export function hermiteRecurrence(maxOrder: number): { readonly raising: Float64Array; readonly lowering: Float64Array } {
  ensureCoefficients(maxOrder);
  return { raising, lowering };
}

function ensureCoefficients(maxOrder: number): void {
  if (raising.length >= maxOrder) return;
  const size = Math.max(maxOrder, 2 * raising.length, 32);
  raising = new Float64Array(size);
  lowering = new Float64Array(size);
  for (let k = 0; k < size; k++) {
    raising[k] = Math.sqrt(2 / (k + 1));
    lowering[k] = Math.sqrt(k / (k + 1));
  }
}

/**
 * Hermite functions phi_k(u) = (2^k sqrt(pi) k!)^(-1/2) H_k(u) exp(-u^2 / 2) for k = 0..maxOrder
 * (Refregier 2003, MNRAS 338, 35, eq. 1), by the three-term recurrence
 * phi_(k+1) = sqrt(2 / (k+1)) u phi_k - sqrt(k / (k+1)) phi_(k-1) (from the Hermite polynomial
 * recurrence H_(k+1) = 2u H_k - 2k H_(k-1)), which carries the normalisation along and never
 * forms k! or H_k(u) on its own, so nothing overflows. Writes out[outOffset + k].
 */
export function hermiteFunctions(u: number, maxOrder: number, out: Float64Array, outOffset = 0): void {
  ensureCoefficients(maxOrder);
  let previous = PI_TO_MINUS_QUARTER * Math.exp(-0.5 * u * u);
  out[outOffset] = previous;
  if (maxOrder < 1) return;
  let current = Math.SQRT2 * u * previous;
  out[outOffset + 1] = current;
  for (let k = 1; k < maxOrder; k++) {
    const next = raising[k] * u * current - lowering[k] * previous;
    out[outOffset + k + 1] = next;
    previous = current;
    current = next;
  }
}
