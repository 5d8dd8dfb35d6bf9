import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { InputError } from '../errors.js';
import { modelParameterSpace } from '../model/modelParameterSpace.js';
import { PixelLikelihood } from '../likelihood/pixelLikelihood.js';
import type { ParameterSpace } from '../priors/parameterSpace.js';
import { makePrior } from '../priors/makePrior.js';
import { firstPerturber } from '../vet/perturberPositionConfig.js';
import { LinearAmplitudeChiSquare } from './linearAmplitudeChiSquare.js';
import { nelderMead } from '../numeric/optimisation/nelderMead.js';
import type { RefitSettings } from '../records/sensitivitySummary.js';
import { runDefaults } from '../settings/runDefaults.js';


/** What a sensitivity computation starts from: the smooth model's best fit. */
export interface SmoothBestFit {
  /** The smooth model's physical parameter vector, in its parameter order. */
  readonly parameters: Float64Array;
  /** Light amplitudes at that fit (source components first, then lens light). */
  readonly amplitudes: Float64Array;
}

/**
 * The expected detection statistic of a perturber planted in the smooth best fit: the
 * "perturbed truth" is the best-fit smooth model plus the config's first perturber (its kind and
 * fixed settings; mass and position as given), imaged at the best-fit amplitudes without noise.
 * The statistic is Delta chi^2 = chi^2 of the best smooth refit of that image - chi^2 of the
 * truth (0, the image being noiseless), with the data's noise map. This is the Asimov-data
 * approximation (Cowan, Cranmer, Gross & Vitells 2011, EPJ C 71, 1554): the noise-free data set
 * stands for the median experiment, so Delta chi^2 is the expected statistic, not one noisy draw.
 * The refit is local (Nelder-Mead from the best fit over the smooth model's free parameters,
 * amplitudes solved linearly each step) and no evidence is computed. One instance per thread.
 */
export class PlantedPerturberStatistic {
  readonly smoothSpace: ParameterSpace;
  readonly massPriorRange: readonly [number, number];
  private readonly smooth: PixelLikelihood;
  private readonly perturbed: PixelLikelihood;
  private readonly chiSquare: LinearAmplitudeChiSquare;
  private readonly start: Float64Array;
  private readonly amplitudes: Float64Array;
  private readonly truth: Float64Array;
  private readonly image: Float64Array;
  private readonly trial: Float64Array;
  private readonly scales: Float64Array;
  private readonly massIndex: number;
  private readonly xIndex: number;
  private readonly yIndex: number;
  private readonly refit: RefitSettings;

  constructor(config: ArcsiftConfig, data: ObservedData, bestFit: SmoothBestFit, refit: RefitSettings = refitDefaults()) {
    const perturber = firstPerturber(config);
    this.smooth = new PixelLikelihood(config, data, 0);
    const single = { ...config, perturbers: [{ ...perturber, positionPrior: undefined }] };
    this.perturbed = new PixelLikelihood(single, data, 1);
    this.smoothSpace = modelParameterSpace(this.smooth.system);
    this.refit = refit;
    const smoothNames = this.smooth.system.parameters.map((p) => p.name);
    if (bestFit.parameters.length !== smoothNames.length) {
      throw new RangeError(`smooth best fit: expected ${smoothNames.length} parameters, found ${bestFit.parameters.length}`);
    }
    this.start = Float64Array.from(bestFit.parameters);
    this.amplitudes = Float64Array.from(bestFit.amplitudes);
    const binding = this.perturbed.system.perturbers[0];
    this.massIndex = binding.massIndex;
    this.xIndex = binding.centerXIndex;
    this.yIndex = binding.centerYIndex;
    // The truth vector: smooth parameters by name, the perturber's other settings at their value (or prior median).
    this.truth = new Float64Array(this.perturbed.system.parameters.length);
    this.perturbed.system.parameters.forEach((p, index) => {
      const smoothIndex = smoothNames.indexOf(p.name);
      if (smoothIndex >= 0) this.truth[index] = this.start[smoothIndex];
      else if (p.value !== undefined) this.truth[index] = p.value;
      else if (p.prior !== undefined) this.truth[index] = makePrior(p.name, p.prior).fromUnit(0.5);
    });
    const massParameter = this.perturbed.system.parameters[this.massIndex];
    if (massParameter.prior === undefined || !(massParameter.prior.kind === 'uniform' || massParameter.prior.kind === 'logUniform' || massParameter.prior.kind === 'truncatedNormal')) {
      throw new InputError(
        'a sensitivity map searches the perturber mass over its prior range: expected a bounded prior (uniform, logUniform or truncatedNormal) on log10MassSolar',
        { file: config.file, key: massParameter.name },
      );
    }
    const massPrior = makePrior(massParameter.name, massParameter.prior);
    this.massPriorRange = [massPrior.lower, massPrior.upper];
    this.image = new Float64Array(data.columns * data.rows);
    this.trial = new Float64Array(smoothNames.length);
    this.chiSquare = new LinearAmplitudeChiSquare(data.usedPixels, data.noise, this.smooth.system.amplitudeCount);
    const priors = this.smoothSpace.priors;
    this.scales = Float64Array.from(this.smoothSpace.freeIndices, (index) => {
      const prior = priors[index];
      const width = prior.upper - prior.lower;
      if (Number.isFinite(width)) return width;
      const spec = prior.spec;
      return spec.kind === 'normal' || spec.kind === 'truncatedNormal' ? spec.sigma : 1;
    });
  }

  /** The noiseless planted image (whole grid; filled at the used pixels) for a perturber of log10 mass at (x, y) arcsec. */
  plantedImage(xArcsec: number, yArcsec: number, log10Mass: number): Float64Array {
    this.truth[this.massIndex] = log10Mass;
    this.truth[this.xIndex] = xArcsec;
    this.truth[this.yIndex] = yArcsec;
    const basis = this.perturbed.forward.computeBasis(this.truth);
    const count = this.image.length;
    this.image.fill(0);
    for (let k = 0; k < this.amplitudes.length; k++) {
      const a = this.amplitudes[k];
      for (let p = 0; p < count; p++) this.image[p] += a * basis[k * count + p];
    }
    return this.image;
  }

  /** chi^2 of the smooth model with parameters `vector` against the current target, amplitudes fitted. */
  private smoothChiSquare(vector: Float64Array): number {
    if (!Number.isFinite(this.smoothSpace.logPrior(vector))) return Number.POSITIVE_INFINITY;
    return this.chiSquare.chiSquare(this.smooth.forward.computeBasis(vector), this.image.length);
  }

  /**
   * Delta chi^2 of a perturber of log10 mass at (x, y): the least chi^2 of the smooth model
   * refitted to the planted image (two Nelder-Mead starts: from the best fit, then from the
   * first one's end with a fresh simplex, a common safeguard against a collapsed simplex).
   */
  deltaChiSquare(xArcsec: number, yArcsec: number, log10Mass: number): { deltaChiSquare: number; evaluations: number } {
    this.chiSquare.setTarget(this.plantedImage(xArcsec, yArcsec, log10Mass));
    const space = this.smoothSpace;
    const free = space.freeIndices;
    const trial = this.trial;
    const scales = this.scales;
    let origin = new Float64Array(free.length);
    for (let k = 0; k < free.length; k++) origin[k] = this.start[free[k]];
    let evaluations = 0;
    let best = Number.POSITIVE_INFINITY;
    for (let attempt = 0; attempt < 2; attempt++) {
      const base = origin;
      const objective = (z: Float64Array): number => {
        trial.set(this.start);
        for (let k = 0; k < free.length; k++) trial[free[k]] = base[k] + z[k] * scales[k];
        return this.smoothChiSquare(trial);
      };
      const result = nelderMead(objective, new Float64Array(free.length), {
        step: new Float64Array(free.length).fill(this.refit.stepFraction),
        valueTolerance: this.refit.chiSquareTolerance,
        pointTolerance: 1e-6,
        maxEvaluations: this.refit.maxEvaluations,
      });
      evaluations += result.evaluations;
      if (result.value < best) {
        best = result.value;
        origin = Float64Array.from(base, (v, k) => v + result.point[k] * scales[k]);
      }
    }
    return { deltaChiSquare: best, evaluations };
  }
}

/** The refit settings of runDefaults.sensitivity. */
export function refitDefaults(): RefitSettings {
  const d = runDefaults.sensitivity;
  return { stepFraction: d.refitStepFraction, maxEvaluations: d.refitMaxEvaluations, chiSquareTolerance: d.refitChiSquareTolerance };
}
