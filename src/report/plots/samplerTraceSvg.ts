import { readPosteriorTable } from '../../records/readPosteriorTable.js';
import { evidenceTrace } from '../../results/evidenceTrace.js';
import { linePlotSvg, type LinePanel, type LineSeries } from './linePlotSvg.js';
import { parameterLabel } from '../text/parameterLabel.js';
import { reportPalette } from '../colour/reportPalette.js';
import type { WeightedPosteriorColumns } from '../../records/readWeightedPosterior.js';

/** ln Z shown below the final value in the accumulation panel, nats. */
const LN_Z_WINDOW = 25;

/**
 * Two panels of a nested-sampling run's history, one line per run (model): ln Z accumulated
 * point by point (dead points, then the final live points), with the final ln Z dashed; and
 * ln L against the ln of the enclosed prior volume X (Skilling 2006), where the posterior mass
 * sits at the bend.
 */
export function nestedTraceSvg(runs: readonly { readonly label: string; readonly colour: string; readonly samples: WeightedPosteriorColumns }[]): string {
  const accumulation: LineSeries[] = [];
  const likelihood: LineSeries[] = [];
  let zHigh = -Infinity;
  let zLow = Infinity;
  let lHigh = -Infinity;
  let lLow = Infinity;
  for (const run of runs) {
    const { lnWeight, lnLikelihood, lnEvidence } = run.samples;
    const trace = evidenceTrace(lnWeight, lnLikelihood, lnEvidence);
    const index = Float64Array.from(trace.accumulatedLnZ, (_, i) => i + 1);
    accumulation.push({ x: index, y: trace.accumulatedLnZ, colour: run.colour });
    const count = lnLikelihood.length;
    likelihood.push({ x: trace.lnX.subarray(0, count - 1), y: lnLikelihood.subarray(0, count - 1), colour: run.colour });
    zHigh = Math.max(zHigh, lnEvidence);
    zLow = Math.min(zLow, lnEvidence);
    // The likelihood axis starts where this run's accumulated evidence was LN_Z_WINDOW below its final value.
    let first = trace.accumulatedLnZ.findIndex((v) => v > lnEvidence - LN_Z_WINDOW);
    if (first < 0) first = 0;
    lLow = Math.min(lLow, lnLikelihood[first]);
    for (let i = 0; i < count; i++) if (lnLikelihood[i] > lHigh) lHigh = lnLikelihood[i];
  }
  const panels: LinePanel[] = [
    {
      title: 'Evidence accumulated over the run',
      xLabel: 'point (dead points, then final live points)',
      yLabel: 'ln Z so far',
      series: accumulation,
      references: runs.map((r) => ({ y: r.samples.lnEvidence, colour: r.colour })),
      yRange: [zLow - LN_Z_WINDOW, zHigh + 0.1 * LN_Z_WINDOW],
    },
    {
      title: 'Likelihood against enclosed prior volume',
      xLabel: 'ln X (prior volume still enclosed)',
      yLabel: 'ln L',
      series: likelihood,
      yRange: Number.isFinite(lLow) && lHigh > lLow ? [lLow, lHigh + 0.05 * (lHigh - lLow)] : undefined,
    },
  ];
  return linePlotSvg(panels, { columns: 2, legend: runs.length > 1 ? runs.map((r) => ({ colour: r.colour, label: r.label })) : undefined });
}

/** Walkers drawn one by one in each trace panel, besides the median and 68% band of all. */
const SINGLE_WALKERS = 3;

/**
 * Trace plots of an ensemble chain (walker-paths.csv: each walker's retained sweeps in turn):
 * per free parameter, the median across walkers at each sweep with the band holding the
 * central 68% of walkers, and a few single walkers. Flat, overlapping traces are what a mixed
 * chain looks like (common practice).
 */
export function ensembleTraceSvg(pathsFile: string, walkers: number, freeNames: readonly string[], units: readonly string[]): string {
  const table = readPosteriorTable(pathsFile);
  const steps = Math.floor(table.count / walkers);
  const width = table.names.length;
  const sweep = table.samplerColumns.get('sweep');
  const x = Float64Array.from({ length: steps }, (_, s) => sweep?.[s] ?? s);
  const column = new Float64Array(walkers);
  const panels: LinePanel[] = freeNames.map((name, k) => {
    const c = table.names.indexOf(name);
    const median = new Float64Array(steps);
    const lower = new Float64Array(steps);
    const upper = new Float64Array(steps);
    const single = Array.from({ length: Math.min(SINGLE_WALKERS, walkers) }, () => new Float64Array(steps));
    for (let s = 0; s < steps; s++) {
      for (let w = 0; w < walkers; w++) column[w] = table.points[(w * steps + s) * width + c];
      single.forEach((line, w) => { line[s] = column[w]; });
      column.sort();
      median[s] = quantileOfSorted(column, 0.5);
      lower[s] = quantileOfSorted(column, 0.16);
      upper[s] = quantileOfSorted(column, 0.84);
    }
    const label = parameterLabel(name, units[k]);
    return {
      title: `${label.component === '' ? '' : `${label.component}: `}${label.quantity}`,
      xLabel: 'sweep',
      yLabel: label.unit === '' ? 'value' : label.unit,
      series: [
        ...single.map((y) => ({ x, y, colour: reportPalette.muted, widthPx: 0.6, opacity: 0.7 })),
        { x, y: median, colour: reportPalette.smooth, widthPx: 1.4, band: { lower, upper } },
      ],
    };
  });
  return linePlotSvg(panels, {
    columns: 3,
    panelWidthPx: 260,
    panelHeightPx: 140,
    legend: [{ colour: reportPalette.smooth, label: 'median of walkers (band: 68%)' }, { colour: reportPalette.muted, label: `${Math.min(SINGLE_WALKERS, walkers)} single walkers` }],
  });
}

/** Linear interpolation between order statistics (Hyndman & Fan 1996, type 7). */
function quantileOfSorted(sorted: Float64Array, p: number): number {
  const h = (sorted.length - 1) * p;
  const low = Math.floor(h);
  const high = Math.min(sorted.length - 1, low + 1);
  return sorted[low] + (h - low) * (sorted[high] - sorted[low]);
}
