/**
 * The misfit alarm of one fit, as every summary records it beside the model: the best fit's
 * chi-square inside the mask and the spatial-structure test of its normalised residuals.
 */
export interface MisfitRecord {
  /** Used (fitted) pixels inside the mask. */
  readonly pixels: number;
  /** Sum over the used pixels of ((data - model) / noise)^2 at the highest-likelihood sample. */
  readonly chiSquare: number;
  /** Sampled (non-linear) parameters of the model. */
  readonly freeParameters: number;
  /** Linear amplitudes integrated out (light amplitudes, shapelet coefficients, pixelated-source cells). */
  readonly linearAmplitudes: number;
  /** pixels - freeParameters - linearAmplitudes (see degreesOfFreedomCounting). */
  readonly degreesOfFreedom: number;
  /** How degreesOfFreedom was counted, in words. */
  readonly degreesOfFreedomCounting: string;
  /** chiSquare / degreesOfFreedom; null when degreesOfFreedom < 1. */
  readonly chiSquarePerDegreeOfFreedom: number | null;
  /** (chiSquare - dof) / sqrt(2 dof): how far chi^2 lies from its expectation in its standard deviations; null when dof < 1. */
  readonly chiSquareExcessSigma: number | null;
  /** Moran's I of the normalised residuals over neighbouring used pixels, its expectation and z-score under randomisation. */
  readonly moransI: number;
  readonly moransIExpectation: number;
  readonly moransIZScore: number;
  /** One-sided permutation p-value of Moran's I (positive autocorrelation). */
  readonly pValue: number;
  readonly permutations: number;
  readonly neighbours: 'rook' | 'queen';
  /** The alarm sounds at p <= this. */
  readonly falseAlarmRate: number;
  /** True when the residuals hold spatial structure the model missed: the fit is not acceptable. */
  readonly alarm: boolean;
}
