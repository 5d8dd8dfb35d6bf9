import { ensureFloat64Capacity } from '../numeric/sparse/ensureCapacity.js';
import type { DifferenceRows } from './sourceMesh.js';
import type { SparseRows } from './sparseRows.js';

/**
 * Row weights of the brightness-following regularisation, a form whose strength follows the
 * source's brightness (after the adaptive regularisation of Nightingale, Dye & Massey 2018; the
 * weighting here is arcsift's own). Each cell's brightness is estimated from the data it maps to,
 * b_c = sum_e M_ec d_e / sum_e M_ec over the used pixels e, scaled to s_c = b_c / max b in [0, 1]
 * (0 where b_c <= 0 or no pixel sees the cell); its strength interpolates in log between the
 * faint-region and bright-region strengths, ln lambda_c = ln 10 ((1 - s_c) f + s_c g) with
 * f, g the two sampled log10 strengths; a difference row weighs by the geometric mean of its
 * cells' strengths. The prior then depends on the data through s (an empirical-Bayes choice, as
 * for any brightness-adapted prior).
 */
export class CellBrightness {
  private numerator = new Float64Array(0);
  private denominator = new Float64Array(0);
  private lnStrength = new Float64Array(0);

  rowWeights(
    mapping: SparseRows, usedRows: Int32Array, data: Float64Array, cellCount: number,
    log10Faint: number, log10Bright: number, rows: DifferenceRows, out: Float64Array,
  ): void {
    this.numerator = ensureFloat64Capacity(this.numerator, cellCount);
    this.denominator = ensureFloat64Capacity(this.denominator, cellCount);
    this.lnStrength = ensureFloat64Capacity(this.lnStrength, cellCount);
    this.gather(mapping, usedRows, data, cellCount);
    this.strengths(cellCount, log10Faint * Math.LN10, log10Bright * Math.LN10);
    this.weighRows(rows, out);
  }

  private gather(mapping: SparseRows, usedRows: Int32Array, data: Float64Array, cellCount: number): void {
    const { numerator, denominator } = this;
    numerator.fill(0, 0, cellCount);
    denominator.fill(0, 0, cellCount);
    for (let e = 0; e < usedRows.length; e++) {
      const q = usedRows[e];
      for (let k = mapping.rowStart[q]; k < mapping.rowStart[q + 1]; k++) {
        numerator[mapping.column[k]] += mapping.value[k] * data[e];
        denominator[mapping.column[k]] += mapping.value[k];
      }
    }
  }

  private strengths(cellCount: number, lnFaint: number, lnBright: number): void {
    const { numerator, denominator, lnStrength } = this;
    let brightest = 0;
    for (let c = 0; c < cellCount; c++) {
      const b = denominator[c] > 0 ? numerator[c] / denominator[c] : 0;
      lnStrength[c] = b;
      if (b > brightest) brightest = b;
    }
    const scale = brightest > 0 ? 1 / brightest : 0;
    for (let c = 0; c < cellCount; c++) {
      const s = Math.min(1, Math.max(0, lnStrength[c] * scale));
      lnStrength[c] = (1 - s) * lnFaint + s * lnBright;
    }
  }

  private weighRows(rows: DifferenceRows, out: Float64Array): void {
    const lnStrength = this.lnStrength;
    for (let r = 0; r < rows.rowCount; r++) {
      let sum = 0;
      const from = rows.rowStart[r], to = rows.rowStart[r + 1];
      for (let k = from; k < to; k++) sum += lnStrength[rows.cell[k]];
      out[r] = Math.exp(sum / (to - from));
    }
  }
}
