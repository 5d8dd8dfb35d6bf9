import FFT from 'fft.js';

/**
 * Reusable FFT plan and buffers for autocovariances of series of one length, so repeated calls
 * (one per walker and parameter) allocate nothing.
 */
export class AutocovariancePlan {
  readonly length: number;
  private readonly fft: FFT;
  private readonly padded: Float64Array;
  private readonly spectrum: Float64Array;
  private readonly power: Float64Array;
  private readonly back: Float64Array;

  constructor(length: number) {
    this.length = length;
    let size = 2;
    while (size < 2 * length) size *= 2;
    this.fft = new FFT(size);
    this.padded = new Float64Array(size);
    this.spectrum = new Float64Array(2 * size);
    this.power = new Float64Array(size);
    this.back = new Float64Array(2 * size);
  }

  // Biased sample autocovariance c(t) = (1/n) sum_{i<n-t} (x_i - mean)(x_{i+t} - mean) through the
  // Wiener-Khinchin theorem: the inverse FFT of |FFT(x - mean)|^2, zero-padded to >= 2n so the
  // circular correlation equals the linear one (Press et al., Numerical Recipes, sec. 13.2). The
  // power spectrum is real and even, so its inverse transform is a forward real transform / size.
  // Reads x[offset + i * stride], i < length; writes c(0..length-1) into out.
  compute(x: ArrayLike<number>, offset: number, stride: number, out: Float64Array): void {
    const n = this.length;
    const padded = this.padded;
    let mean = 0;
    for (let i = 0; i < n; i++) mean += x[offset + i * stride];
    mean /= n;
    for (let i = 0; i < n; i++) padded[i] = x[offset + i * stride] - mean;
    padded.fill(0, n);
    const spectrum = this.spectrum;
    const power = this.power;
    const size = power.length;
    this.fft.realTransform(spectrum, padded);
    for (let k = 0; k <= size / 2; k++) {
      const re = spectrum[2 * k];
      const im = spectrum[2 * k + 1];
      power[k] = re * re + im * im;
      if (k > 0) power[size - k] = power[k];
    }
    this.fft.realTransform(this.back, power);
    const scale = 1 / (size * n);
    for (let t = 0; t < n; t++) out[t] = this.back[2 * t] * scale;
  }
}
