import normal from '@stdlib/random/base/normal';
import { createHash } from 'node:crypto';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { writeFits } from '../../src/fits/index.js';
import type { HeaderCard } from '../../src/fits/index.js';
import { cornerData } from '../../src/results/index.js';

/** Hand-made numbers of the synthetic summary, distinct enough to be found in the page. */
export const SYNTHETIC = {
  smoothLnZ: -1234.5678,
  smoothLnZError: 0.4321,
  perturbedLnZ: -1229.1234,
  perturbedLnZError: 0.5432,
  lnB: 5.4444,
  lnBError: 0.6912,
  caution: 'Synthetic caution: these numbers were typed by hand for a test.',
  smoothMoransI: 0.1234,
  smoothPValue: 0.004,
  perturbedMoransI: -0.0111,
  perturbedPValue: 0.567,
  claimSentence: 'synthetic claim: not evidence of a subhalo, typed by hand',
} as const;

/** A hand-made misfit record: alarm at p <= 0.01. */
function misfitRecord(moransI: number, pValue: number) {
  return {
    pixels: 80, chiSquare: 81.5, freeParameters: 4, linearAmplitudes: 1, degreesOfFreedom: 75, degreesOfFreedomCounting: 'nominal (synthetic)',
    chiSquarePerDegreeOfFreedom: 81.5 / 75, chiSquareExcessSigma: (81.5 - 75) / Math.sqrt(150), moransI, moransIExpectation: -1 / 79,
    moransIZScore: 2.9, pValue, permutations: 999, neighbours: 'rook', falseAlarmRate: 0.01, alarm: pValue <= 0.01,
  };
}

const SIDE = 12;
const SCALE_ARCSEC = 0.1;

function cards(unit: string): HeaderCard[] {
  return [
    { keyword: 'BUNIT', kind: 'string', value: unit },
    { keyword: 'CDELT1', kind: 'float', value: SCALE_ARCSEC / 3600 },
    { keyword: 'CDELT2', kind: 'float', value: SCALE_ARCSEC / 3600 },
  ];
}

function image(f: (i: number, j: number) => number): Float64Array {
  const out = new Float64Array(SIDE * SIDE);
  for (let j = 0; j < SIDE; j++) for (let i = 0; i < SIDE; i++) out[i + SIDE * j] = f(i, j);
  return out;
}

const fits = (file: string, data: Float64Array, unit: string): void =>
  writeFits(file, { primary: { data, nx: SIDE, ny: SIDE, cards: cards(unit) } });

const prior = (name: string, lower: number, upper: number) => ({ name, kind: 'uniform', fixed: false, periodic: false, lower, upper });
const summaryOf = (median: number, half: number) => ({
  median,
  interval68: { lower: median - half, upper: median + half },
  interval95: { lower: median - 2 * half, upper: median + 2 * half },
});

/** Invented lens of the synthetic run: an SIE in shear, a Sersic source, one truncated-NFW perturber. */
const SYNTHETIC_CONFIG = `title: synthetic lens
observation:
  columns: ${SIDE}
  rows: ${SIDE}
  pixelScaleArcsec: ${SCALE_ARCSEC}
  supersampling: 2
  psf: { shape: gaussian, fwhmArcsec: 0.1, sizePixels: 5 }
  noise: { skySigma: 0.05, integrationSeconds: 1000 }
  mask: { shape: disc, outerRadiusArcsec: 0.5 }
redshifts: { lens: 0.5, source: 2.0 }
lens:
  mass:
    - kind: isothermalEllipsoid
      einsteinRadiusArcsec: { value: 0.35, prior: { uniform: [0.2, 0.5] } }
      axisRatio: 0.8
      positionAngleDeg: 20
      centerXArcsec: 0
      centerYArcsec: 0
  shear:
    shearStrength: 0.04
    shearAngleDeg: 70
source:
  light:
    - kind: sersic
      effectiveRadiusArcsec: 0.05
      sersicIndex: 1
      axisRatio: 0.7
      positionAngleDeg: 100
      centerXArcsec: 0.03
      centerYArcsec: 0.02
perturbers:
  - kind: truncatedNfw
    log10MassSolar: { value: 9.5, prior: { uniform: [8, 12] } }
    centerXArcsec: { value: 0.2, prior: { uniform: [-0.6, 0.6] } }
    centerYArcsec: { value: -0.1, prior: { uniform: [-0.6, 0.6] } }
    truncationRatio: 3
`;

/** Best-fit values of the synthetic config's fixed parameters, as a run records them beside the free ones. */
const FIXED_BEST_FIT = {
  'lens.mass[0].axisRatio': 0.8, 'lens.mass[0].positionAngleDeg': 20, 'lens.mass[0].centerXArcsec': 0, 'lens.mass[0].centerYArcsec': 0,
  'lens.mass[0].coreRadiusArcsec': 0, 'lens.shear.shearStrength': 0.04, 'lens.shear.shearAngleDeg': 70,
  'source.light[0].effectiveRadiusArcsec': 0.05, 'source.light[0].sersicIndex': 1, 'source.light[0].axisRatio': 0.7,
  'source.light[0].positionAngleDeg': 100, 'source.light[0].centerXArcsec': 0.03, 'source.light[0].centerYArcsec': 0.02,
};

function modelRecord(label: string, lnZ: number, lnZError: number, names: string[], units: string[], folder: string) {
  return {
    label, lnEvidence: lnZ, lnEvidenceError: lnZError, lnEvidenceErrorSimulated: lnZError * 1.1, informationNats: 12.5,
    livePoints: 50, method: 'slice', iterations: 700, evaluations: 43210, efficiency: 0.0123, nonFiniteLikelihoods: 0,
    insertionRankPValue: 0.42, insertionRankWarning: false, stopReason: 'converged', bestLnLikelihood: lnZ + 20,
    // The perturbed run's ln Z came from the importance stage; the smooth one's record predates it.
    ...(label === 'perturbed' ? {
      evidence: {
        method: 'importance', nestedLnEvidence: lnZ + 0.8, nestedLnEvidenceError: 0.9,
        importance: {
          evaluations: 9000, finalDraws: 4000, effectiveSampleSize: 1234.4, largestWeightShare: 0.004, paretoShape: 0.31,
          paretoShapeLimit: 0.7, proposalComponents: 4, stages: 4, repeatZ: 0.5, nestedZ: -0.9, suspect: false, nestedDisagrees: false,
        },
      },
    } : {}),
    bestFit: { ...FIXED_BEST_FIT, ...Object.fromEntries(names.map((name, k) => [name, [0.35, 9.5, 0.2, -0.1][k]])), ...(label === 'perturbed' ? { 'perturbers[0].truncationRatio': 3 } : {}) },
    bestFitAmplitudes: { 'source.light[0].amplitude': 40 }, seconds: 12.3, threads: 1,
    misfit: label === 'smooth' ? misfitRecord(SYNTHETIC.smoothMoransI, SYNTHETIC.smoothPValue) : misfitRecord(SYNTHETIC.perturbedMoransI, SYNTHETIC.perturbedPValue),
    parameters: names.map((name, k) => ({ name, unit: units[k], median: k, interval68: [k - 0.1, k + 0.1], interval95: [k - 0.2, k + 0.2] })),
    files: { cornerData: join(folder, 'corner.json') },
  };
}

/**
 * Writes a small comparison run as `arcsift compare` would, by hand: a data folder (12 x 12 FITS
 * images, truth.json) and a run folder with summary.json, both corner.json files (cornerData of
 * Gaussian samples) and the best-fit, residual and normalised-residual FITS of each model.
 * Returns the run folder.
 */
/**
 * A hand-made pixelated source for source.json: a 6 x 6 regular grid over +-0.25" holding a
 * Gaussian blob, each cell's standard deviation a tenth of the peak.
 */
function syntheticSource() {
  const side = 6;
  const cellXArcsec: number[] = [], cellYArcsec: number[] = [], values: number[] = [], standardDeviations: number[] = [];
  for (let b = 0; b < side; b++) {
    for (let a = 0; a < side; a++) {
      const x = -0.25 + (0.5 * a) / (side - 1), y = -0.25 + (0.5 * b) / (side - 1);
      cellXArcsec.push(x);
      cellYArcsec.push(y);
      values.push(10 * Math.exp(-(x * x + y * y) / (2 * 0.1 * 0.1)));
      standardDeviations.push(1);
    }
  }
  return { mesh: 'regular', regularisation: 'gradient', cellXArcsec, cellYArcsec, values, standardDeviations, triangles: null, side, raysOutside: 0 };
}

export function writeSyntheticRun(root: string): string {
  const dataFolder = join(root, 'data');
  const runFolder = join(root, 'chains', 'synthetic-run');
  mkdirSync(dataFolder, { recursive: true });
  const ring = (i: number, j: number): number => Math.exp(-((Math.hypot(i - 5.5, j - 5.5) - 3.5) ** 2));
  fits(join(dataFolder, 'image.fits'), image((i, j) => ring(i, j) + (i === 0 && j === 0 ? 0.5 : 0)), 'counts/s');
  fits(join(dataFolder, 'noise.fits'), image(() => 0.05), 'counts/s');
  fits(join(dataFolder, 'psf.fits'), image((i, j) => (i === 5 && j === 5 ? 1 : 0)), '');
  fits(join(dataFolder, 'mask.fits'), image((i, j) => (Math.hypot(i - 5.5, j - 5.5) < 5 ? 1 : 0)), '');
  writeFileSync(join(dataFolder, 'truth.json'), JSON.stringify({
    title: 'synthetic lens',
    parameters: [
      { name: 'lens.mass[0].einsteinRadiusArcsec', value: 0.35, unit: 'arcsec' },
      { name: 'perturbers[0].log10MassSolar', value: 9.5, unit: 'log10(M/Msun)' },
      { name: 'perturbers[0].centerXArcsec', value: 0.2, unit: 'arcsec' },
      { name: 'perturbers[0].centerYArcsec', value: -0.1, unit: 'arcsec' },
    ],
    perturbers: [{ key: 'perturbers[0]', kind: 'truncatedNfw', massM200Solar: 10 ** 9.5, totalMassSolar: 10 ** 9.6 }],
  }));

  // The config the run names (summary.config, found from the run folder's grandparent) and the best
  // fits of both models, so that the lens and source planes can be drawn.
  mkdirSync(join(root, 'configs'), { recursive: true });
  writeFileSync(join(root, 'configs', 'synthetic.yaml'), SYNTHETIC_CONFIG);
  const smoothNames = ['lens.mass[0].einsteinRadiusArcsec'];
  const perturbedNames = [...smoothNames, 'perturbers[0].log10MassSolar', 'perturbers[0].centerXArcsec', 'perturbers[0].centerYArcsec'];
  const units = ['arcsec', 'log10(M/Msun)', 'arcsec', 'arcsec'];
  const centres = [0.35, 9.5, 0.2, -0.1];
  const widths = [0.01, 0.3, 0.05, 0.05];
  const draw = normal.factory(0, 1, { seed: 3 });
  for (const [model, names] of [['smooth', smoothNames], ['perturbed', perturbedNames]] as const) {
    const folder = join(runFolder, model);
    mkdirSync(folder, { recursive: true });
    const count = 3000;
    const points = new Float64Array(count * names.length);
    for (let r = 0; r < count; r++) for (let c = 0; c < names.length; c++) points[r * names.length + c] = centres[c] + widths[c] * draw();
    writeFileSync(join(folder, 'corner.json'), JSON.stringify(cornerData(names, units.slice(0, names.length), points, new Float64Array(count).fill(1))));
    fits(join(folder, 'best-fit-model.fits'), image(ring), 'counts/s');
    fits(join(folder, 'residual.fits'), image((i, j) => (i - j) * 0.01), 'counts/s');
    fits(join(folder, 'normalised-residual.fits'), image((i, j) => (i - j) * 0.2), '');
    writeFileSync(join(folder, 'source.json'), JSON.stringify(syntheticSource()));
  }
  const summary = {
    arcsiftVersion: '0.0.0-test', kind: 'comparison', config: 'configs/synthetic.yaml', configSha256: createHash('sha256').update(SYNTHETIC_CONFIG).digest('hex'),
    data: { image: join(dataFolder, 'image.fits'), noise: join(dataFolder, 'noise.fits'), psf: join(dataFolder, 'psf.fits'), mask: join(dataFolder, 'mask.fits') },
    dataNotices: [], seed: 7, settings: { smooth: { lnZTolerance: 0.1 }, perturbed: { lnZTolerance: 0.1 } }, runSeconds: 99,
    models: {
      smooth: modelRecord('smooth', SYNTHETIC.smoothLnZ, SYNTHETIC.smoothLnZError, smoothNames, units, join(runFolder, 'smooth')),
      perturbed: modelRecord('perturbed', SYNTHETIC.perturbedLnZ, SYNTHETIC.perturbedLnZError, perturbedNames, units, join(runFolder, 'perturbed')),
    },
    bayesFactor: {
      lnBayesFactor: SYNTHETIC.lnB, lnBayesFactorError: SYNTHETIC.lnBError,
      reading: 'strong evidence for the perturbed model over the smooth model', kassRafteryGrade: 'strong',
      significance: 'at most as significant as a p-value of 0.00123 (3.2 sigma, two-sided)',
      pValueBound: 0.00123, sigmaBound: 3.23, perturberFavoured: true, favouredAbove: 1,
    },
    detection: {
      claim: 'not-evidence', thresholdLnB: 50, thresholdSource: 'synthetic threshold source', sentence: SYNTHETIC.claimSentence,
      smoothMisfit: true, perturbedMisfit: false,
    },
    perturbers: [{
      key: 'perturbers[0]', kind: 'truncatedNfw', log10Mass: summaryOf(9.52, 0.3), log10MassUpperLimit95: 10.1,
      centerXArcsec: summaryOf(0.21, 0.05), centerYArcsec: summaryOf(-0.09, 0.05),
      log10M200: summaryOf(9.52, 0.3), log10TotalMass: summaryOf(9.61, 0.3), massPriorRange: [8, 12],
    }],
    priors: {
      smooth: [prior(smoothNames[0], 0.2, 0.5)],
      perturbed: [prior(smoothNames[0], 0.2, 0.5), prior(perturbedNames[1], 8, 12), prior(perturbedNames[2], -0.6, 0.6), prior(perturbedNames[3], -0.6, 0.6)],
    },
    positionPriors: [{ key: 'perturbers[0]', region: 'uniform over the used pixels of the mask' }],
    amplitudePrior: 'every linear light amplitude ~ Normal(0, 100^2), counts/s/arcsec^2 (marginalised analytically)',
    caution: SYNTHETIC.caution,
  };
  writeFileSync(join(runFolder, 'summary.json'), JSON.stringify(summary, null, 2));
  return runFolder;
}
