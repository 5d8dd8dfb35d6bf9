import type { LightProfile } from '../lightProfile.js';
import { sersic } from './sersic.js';
import { ellipticalQuadraticForm } from '../ellipticalQuadraticForm.js';
import { sersicCoefficient } from './sersicCoefficient.js';
import { fastExp } from '../../numeric/elementary/fastExp.js';
import { fastLog } from '../../numeric/elementary/fastLog.js';
import { PowerTable } from '../../numeric/elementary/powerTable.js';

const form = new Float64Array(3);
const powers = new PowerTable();
/** Effective radius, index, axis ratio and angle last seen, then A, B, C, b_n, power table usable (1/0). */
const lastShape = new Float64Array(9).fill(Number.NaN);

/**
 * The elliptical Sersic profile of src/light/sersic.ts (Sersic 1968; Graham & Driver 2005,
 * eq. 1), I = exp(b_n - b_n (R^2 / R_e^2)^(1/(2n))), same parameters and quadratic form, with
 * the power s = (R^2/R_e^2)^(1/(2n)) = (R/R_e)^(1/n) from PowerTable (relative error below
 * T(1/(2n)) + (1.5 |ln s| + 8) 2.2e-16) and the outer exponential by fastExp (relative error
 * < 3.7e-11 + 2.3e-16 |b_n - b_n s|). An error e of s changes I by the relative b_n s e, and
 * where I is above 1e-12 of its peak exp(b_n), b_n s < 27.7. So the relative error of I there is
 * below 27.7 T + 4e-11: under 3.3e-10 for 1/2 <= n <= 8 (T <= 1.0e-11) and 2.4e-7 for
 * 1/14 <= n < 1/2 (T <= 8.3e-9), against a forward-model tolerance of about 1e-5 of the peak
 * (checked against sersic.ts in test/light/sersic/fastSersic.test.ts). For n < 1/14, outside the
 * power table's range, s is exp(ln(R^2/R_e^2)/(2n)) with fastLog and fastExp (relative error of
 * I below 27.7 x 3.9e-11 + 3.9e-11 < 1.2e-9).
 */
export const fastSersic: LightProfile = {
  kind: sersic.kind,
  parameterNames: sersic.parameterNames,
  basisCount: 1,
  writeBasis(p, offset, x, y, n, out, outOffset) {
    // The quadratic form, b_n and the power table depend on the shape parameters only; a forward
    // model calls this many times per evaluation with the same ones.
    const shape = lastShape;
    if (p[offset] !== shape[0] || p[offset + 1] !== shape[1] || p[offset + 2] !== shape[2] || p[offset + 3] !== shape[3]) {
      ellipticalQuadraticForm(p[offset], p[offset + 2], p[offset + 3], form);
      for (let k = 0; k < 4; k++) shape[k] = p[offset + k];
      shape[4] = form[0];
      shape[5] = form[1];
      shape[6] = form[2];
      shape[7] = sersicCoefficient(p[offset + 1]);
      shape[8] = powers.setExponent(0.5 / p[offset + 1]) ? 1 : 0;
    }
    const a = shape[4];
    const b = shape[5];
    const c = shape[6];
    const bn = shape[7];
    // Passes over the points, each a short chain of dependent operations, so that successive
    // points overlap in the processor (faster than one nested expression on Node 20; DEVELOPERS.md),
    // each a function of its own (see latticeLevel in adaptivePixelMeans.ts):
    // R^2/R_e^2, its power 1/(2n) by the power table, then the exponential of b_n - b_n s.
    quadraticForm(a, b, c, p[offset + 4], p[offset + 5], x, y, n, out, outOffset);
    if (shape[8] === 1) powers.powerInPlace(out, outOffset, outOffset + n);
    else powerByLogExp(0.5 / shape[1], out, outOffset, outOffset + n);
    sersicOfPower(bn, out, outOffset, outOffset + n);
  },
};

/** out[outOffset + i] = A dx^2 + B dx dy + C dy^2 with (dx, dy) = (x_i, y_i) - centre, i < n. */
function quadraticForm(
  a: number, b: number, c: number, centerX: number, centerY: number, x: Float64Array, y: Float64Array, n: number,
  out: Float64Array, outOffset: number,
): void {
  for (let i = 0; i < n; i++) {
    const dx = x[i] - centerX;
    const dy = y[i] - centerY;
    out[outOffset + i] = (a * dx + b * dy) * dx + c * dy * dy;
  }
}

/** values[i] = exp(h ln values[i]) for i in [from, to), with fastLog and fastExp. */
function powerByLogExp(h: number, values: Float64Array, from: number, to: number): void {
  for (let i = from; i < to; i++) values[i] = fastExp(h * fastLog(values[i]));
}

/** values[i] = exp(b_n - b_n values[i]) for i in [from, to): the Sersic profile of the power s. */
function sersicOfPower(bn: number, values: Float64Array, from: number, to: number): void {
  for (let i = from; i < to; i++) values[i] = fastExp(bn - bn * values[i]);
}
