import type { ComparisonSummary } from '../records/comparisonSummary.js';
import type { FitSummary } from '../records/fitSummary.js';
import type { SensitivitySummary } from '../records/sensitivitySummary.js';
import type { VerdictSummary } from '../records/verdictSummary.js';
import type { VetSummary } from '../records/vetSummary.js';
import type { BatchJob, BatchJobResult } from './batchJob.js';

const noFlags = (): string[] => [];

function fitResult(summary: unknown): BatchJobResult {
  const s = summary as FitSummary;
  if (s.sampler === 'ensemble') {
    return { lnEvidence: null, lnBayesFactor: null, lnBayesFactorError: null, verdict: s.model.converged ? 'converged' : 'not converged', details: { sampler: 'ensemble', perturberCount: s.perturberCount } };
  }
  return {
    lnEvidence: s.evidence.lnEvidence,
    lnBayesFactor: null,
    lnBayesFactorError: null,
    verdict: s.model.stopReason === 'converged' ? 'fitted' : `stopped (${s.model.stopReason})`,
    details: { sampler: 'nested', perturberCount: s.perturberCount, lnEvidenceError: s.evidence.lnEvidenceError, parameters: s.model.parameters },
  };
}

function compareResult(summary: unknown): BatchJobResult {
  const s = summary as ComparisonSummary;
  const b = s.bayesFactor;
  const favoured = b.lnBayesFactor >= 0 ? 'perturbed' : 'smooth';
  return {
    lnEvidence: s.models.smooth.lnEvidence,
    lnBayesFactor: b.lnBayesFactor,
    lnBayesFactorError: b.lnBayesFactorError,
    verdict: `${b.kassRafteryGrade} for ${favoured}`,
    details: {
      lnEvidencePerturbed: s.models.perturbed.lnEvidence,
      perturberFavoured: b.perturberFavoured,
      perturbers: s.perturbers.map((p) => ({ key: p.key, log10Mass: p.log10Mass, log10MassUpperLimit95: p.log10MassUpperLimit95, centerXArcsec: p.centerXArcsec, centerYArcsec: p.centerYArcsec })),
    },
  };
}

function vetResult(summary: unknown): BatchJobResult {
  const s = summary as VetSummary;
  const runs = [...s.candidates, ...(s.mapPrior === null ? [] : [s.mapPrior])];
  const best = runs.reduce<(typeof runs)[number] | null>((top, r) => (top === null || r.lnBayesFactor > top.lnBayesFactor ? r : top), null);
  const counts = (['confirmed', 'inconclusive', 'disfavoured', 'not-evidence'] as const).map((v) => `${runs.filter((r) => r.verdict === v).length} ${v}`);
  return {
    lnEvidence: s.smooth?.lnEvidence ?? null,
    lnBayesFactor: best?.lnBayesFactor ?? null,
    lnBayesFactorError: best?.lnBayesFactorError ?? null,
    verdict: counts.join(', '),
    details: { candidates: runs.map((r) => ({ id: r.id, lnBayesFactor: r.lnBayesFactor, verdict: r.verdict, log10Mass: r.log10Mass })) },
  };
}

function sensitivityResult(summary: unknown): BatchJobResult {
  const s = summary as SensitivitySummary;
  const detectable = s.points.map((p) => p.log10MinimumMass as number | null).filter((m): m is number => m !== null && Number.isFinite(m));
  return {
    lnEvidence: null,
    lnBayesFactor: null,
    lnBayesFactorError: null,
    verdict: detectable.length === 0 ? 'nothing detectable in the mass prior' : `detectable from 10^${Math.min(...detectable).toFixed(2)} Msun`,
    details: { gridPoints: s.gridPoints, decades: s.decades },
  };
}

// The robust verdict's row: ln Z of the family the smooth data prefer, the least favourable ln B
// among the acceptable families (null when none is acceptable: then no Bayes factor is evidence).
function verdictResult(summary: unknown): BatchJobResult {
  const s = summary as VerdictSummary;
  const v = s.verdict;
  const preferred = s.families.find((f) => f.name === v.preferredFamily);
  return {
    lnEvidence: preferred?.smooth.lnEvidence ?? null,
    lnBayesFactor: v.leastFavourable?.lnBayesFactor ?? null,
    lnBayesFactorError: v.leastFavourable?.lnBayesFactorError ?? null,
    verdict: `${v.verdict} (ln B > ${v.thresholdLnB}; ${v.acceptableFamilies.length} of ${s.families.length} families acceptable)`,
    details: {
      thresholdLnB: v.thresholdLnB,
      preferredFamily: v.preferredFamily,
      leastFavourableFamily: v.leastFavourable?.family ?? null,
      families: s.families.map((f) => ({
        name: f.name, lnEvidenceSmooth: f.smooth.lnEvidence, lnEvidencePerturbed: f.perturbed.lnEvidence,
        lnBayesFactor: f.lnBayesFactor, lnBayesFactorError: f.lnBayesFactorError, acceptable: f.acceptable,
      })),
    },
  };
}

/**
 * Every job a batch row can name, keyed by its manifest name. Adding a kind of job is one entry:
 * its command, the file it writes last, the columns it needs and how to read its result.
 */
export const batchJobs: Readonly<Record<string, BatchJob>> = Object.freeze({
  fit: { command: 'fit', describe: 'one model fitted by nested sampling (or ensemble MCMC)', summaryFile: 'summary.json', requires: [], arguments: noFlags, result: fitResult },
  compare: { command: 'compare', describe: 'smooth against perturbed model by evidence', summaryFile: 'summary.json', requires: [], arguments: noFlags, result: compareResult },
  vet: { command: 'vet', describe: 'network flags vetted one by one', summaryFile: 'vet.json', requires: ['flags'], arguments: (row) => ['--flags', row.flags as string], result: vetResult },
  sensitivity: { command: 'sensitivity', describe: 'smallest detectable perturber mass over the mask', summaryFile: 'sensitivity.json', requires: [], arguments: noFlags, result: sensitivityResult },
  verdict: { command: 'verdict', describe: 'smooth against perturbed under every smooth-model family', summaryFile: 'verdict.json', requires: [], arguments: noFlags, result: verdictResult },
});
