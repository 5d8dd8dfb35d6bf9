import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadVerdictConfig } from '../../src/config/verdictConfig.js';
import { simulateToFolder } from '../../src/simulate/simulateToFolder.js';
import type { VerdictSummary } from '../../src/records/verdictSummary.js';
import { arcsift } from './batchFixture.js';

// A robust verdict as a batch row: `batch run` starts `arcsift verdict` with the options every
// row gets (--resume on a fresh folder, --quiet, --threads, --no-report), the row is finished
// when verdict.json exists, and status and merge read its result back from that file. The
// reference is verdict.json itself (the least favourable ln B among the acceptable families, the
// preferred family's smooth ln Z, each family's ln B), copied to the merged table unchanged
// (the batch's own contract: a row's result is its command's record). The lens is the small
// multipole mock of the verdict tests, with few live points and an evaluation cap: seconds a run.
const fixture = fileURLToPath(new URL('../fixtures/verdict/multipole-lens.yaml', import.meta.url));
const JOB_OPTIONS = ['--live-points', '20', '--max-evaluations', '4000'];

describe('batch rows of job verdict', () => {
  it('run the verdict and report its least favourable ln B, verdict and families', () => {
    const root = mkdtempSync(join(tmpdir(), 'arcsift-batch-verdict-'));
    simulateToFolder({ ...loadVerdictConfig(fixture).base, perturbers: [] }, join(root, 'mock'), { seed: 5, noiseless: false });
    const manifest = join(root, 'lenses.csv');
    writeFileSync(manifest, ['id,job,config,data,seed', `multipoles,verdict,${fixture},mock,9`, ''].join('\n'));
    const out = join(root, 'batch');
    const r = arcsift(['batch', 'run', manifest, '--out', out, '--quiet', '--', ...JOB_OPTIONS]);
    expect(r.status, r.stderr).toBe(0);

    const verdict = JSON.parse(readFileSync(join(out, 'rows', 'multipoles', 'verdict.json'), 'utf8')) as VerdictSummary;
    expect(verdict.families).toHaveLength(2);
    const merged = arcsift(['batch', 'merge', out]);
    expect(merged.status, merged.stderr).toBe(0);
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8'));
    const row = results.rows.find((x: { id: string }) => x.id === 'multipoles');
    const v = verdict.verdict;
    expect(row.state).toBe('finished');
    expect(row.result.lnBayesFactor).toBe(v.leastFavourable?.lnBayesFactor ?? null);
    expect(row.result.lnEvidence).toBe(verdict.families.find((f) => f.name === v.preferredFamily)!.smooth.lnEvidence);
    expect(row.result.verdict).toBe(`${v.verdict} (ln B > 50; ${v.acceptableFamilies.length} of 2 families acceptable)`);
    expect(row.result.details.families.map((f: { lnBayesFactor: number }) => f.lnBayesFactor)).toEqual(verdict.families.map((f) => f.lnBayesFactor));
    expect(readFileSync(join(out, 'results.csv'), 'utf8')).toMatch(/multipoles,verdict,/);
  }, 300_000);
});
