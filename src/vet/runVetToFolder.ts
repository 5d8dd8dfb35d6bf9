import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { writeFileAtomic, writeJsonAtomic } from '../io/writeFileAtomic.js';
import type { ParameterSummary } from '../results/index.js';
import { bayesFactorReading } from '../results/index.js';
import { amplitudePriorText } from '../inference/amplitudePriorText.js';
import { writeModelOutputs } from '../inference/writeModelOutputs.js';
import type { PriorDescription } from '../priors/parameterSpace.js';
import type { FlagSet } from './readFlags.js';
import { vetFlags, type PerturbedVetting, type VetResult, type VetSettings } from './vetFlags.js';
import { formatVetCsv } from './formatVetCsv.js';
import { mapPriorNote, priorCaution } from '../records/cautions.js';
import type { ModelRecord } from '../records/modelRecord.js';
import type { VetRunRecord, VetSummary, VetThresholds, VetVerdict } from '../records/vetSummary.js';
import { runProvenance } from '../records/provenance.js';

function runRecord(
  run: PerturbedVetting, model: ModelRecord, id: string, origin: string, positionPrior: string,
  flag: { xArcsec: number; yArcsec: number } | null, score: number | undefined, offsetArcsec: number | null,
): VetRunRecord {
  const p = run.perturber;
  return {
    id, origin, flag, score: score ?? null, positionPrior,
    lnBayesFactor: run.lnBayesFactor,
    lnBayesFactorError: run.lnBayesFactorError,
    verdict: run.verdict,
    reading: bayesFactorReading(run.lnBayesFactor).sentence,
    log10Mass: p.log10Mass,
    log10MassUpperLimit95: p.log10MassUpperLimit95,
    massPriorRange: p.massPriorRange,
    position: { xArcsec: p.centerXArcsec, yArcsec: p.centerYArcsec },
    offsetArcsec,
    model,
  };
}

const range = ([a, b]: readonly [number, number]): string => `[${+a.toFixed(4)}, ${+b.toFixed(4)}]`;

/**
 * Runs `vetFlags` and writes everything into `folder`: smooth/, candidate-1/, candidate-2/, ...
 * and map-prior/ (samples, corner data, best-fit images, checkpoints, as `compare` writes per
 * model), vet.csv (one row per run), and vet.json last, so it exists only for a finished run.
 */
export async function runVetToFolder(
  config: ArcsiftConfig, data: ObservedData, flags: FlagSet, folder: string, settings: VetSettings,
): Promise<{ result: VetResult; summary: VetSummary }> {
  const started = performance.now();
  const withCheckpoints: VetSettings = {
    ...settings,
    evidence: (label, folderName) => ({ ...settings.evidence(label, folderName), checkpointPath: join(folder, folderName, 'checkpoint.json') }),
  };
  const result = await vetFlags(config, data, flags.candidates, withCheckpoints);
  const { onProgress: _a, signal: _b, checkpointPath: _c, ...smoothSettings } = result.smoothSettings;
  const seed = smoothSettings.seed;
  const smooth = writeModelOutputs(result.smooth, config, data, join(folder, 'smooth'), seed);
  const candidates = result.candidates.map((c) => {
    const model = writeModelOutputs(c.evidence, c.config, data, join(folder, c.folderName), seed);
    return runRecord(
      c, model, c.candidate.id, c.candidate.origin,
      `x uniform on ${range(c.window.xArcsec)}, y uniform on ${range(c.window.yArcsec)} arcsec (a ${result.windowArcsec}" square around the flag)`,
      { xArcsec: c.candidate.xArcsec, yArcsec: c.candidate.yArcsec }, c.candidate.score, c.offsetArcsec,
    );
  });
  let mapPrior: VetRunRecord | null = null;
  if (result.mapPrior !== undefined) {
    const m = result.mapPrior;
    const model = writeModelOutputs(m.evidence, m.config, data, join(folder, m.folderName), seed);
    mapPrior = runRecord(m, model, 'map-prior', m.mapFile, `the probability map ${m.mapFile}, normalised over the mask`, null, undefined, null);
  }
  const perturbedRun = result.candidates[0]?.evidence ?? result.mapPrior?.evidence;
  const binding = perturbedRun?.system.perturbers[0];
  const centreNames = binding === undefined ? [] : [perturbedRun!.space.names[binding.centerXIndex], perturbedRun!.space.names[binding.centerYIndex]];
  const positionPrior = [
    result.candidates.length > 0 ? `uniform on a ${result.windowArcsec}" x ${result.windowArcsec}" square centred on each flag` : undefined,
    result.mapPrior !== undefined ? `the probability map ${result.mapPrior.mapFile} (map-prior run)` : undefined,
  ].filter((s) => s !== undefined).join('; ');
  const summary: VetSummary = {
    kind: 'vet',
    ...runProvenance(config, data, seed, started),
    flags: {
      file: flags.file, kind: flags.kind,
      mapThreshold: flags.mapSettings?.threshold ?? null,
      mergeRadiusArcsec: flags.mapSettings?.mergeRadiusArcsec ?? null,
      notices: flags.notices,
    },
    settings: smoothSettings,
    thresholds: result.thresholds,
    windowArcsec: result.windowArcsec,
    perturberKind: binding?.kind ?? config.perturbers[0].kind,
    smooth,
    candidates,
    mapPrior,
    priors: {
      smooth: result.smooth.space.describe(),
      perturbed: perturbedRun === undefined ? [] : perturbedRun.space.describe().filter((p) => !centreNames.includes(p.name)),
      positionPrior: `${centreNames.join(', ')}: ${positionPrior}`,
    },
    amplitudePrior: amplitudePriorText(config),
    caution: priorCaution,
    mapPriorNote: result.mapPrior === undefined ? null : mapPriorNote,
  };
  writeFileAtomic(join(folder, 'vet.csv'), formatVetCsv(summary));
  writeJsonAtomic(join(folder, 'vet.json'), summary);
  return { result, summary };
}
