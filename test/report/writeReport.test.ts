import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { reportPalette } from '../../src/report/colour/reportPalette.js';
import { writeReport } from '../../src/report/writeReport.js';
import { SYNTHETIC, writeSyntheticRun } from './syntheticRun.js';

// The report of a hand-made run folder (syntheticRun.ts): a page that stands alone (no network),
// whose links all resolve, that shows summary.json's evidence numbers and every figure.

/** Every src and href value in an HTML text (attribute values in double quotes, as the report writes them). */
function references(html: string): string[] {
  return [...html.matchAll(/\s(?:src|href)="([^"]*)"/g)].map((m) => m[1]);
}

/** The references a browser would load or follow to another file: not in-page anchors, not data URIs. */
const fileReferences = (html: string): string[] => references(html).filter((r) => !r.startsWith('#') && !r.startsWith('data:'));

let root: string;
let run: string;
let page: string;
let html: string;

describe('writeReport on a synthetic run folder', () => {
  beforeAll(() => {
    root = mkdtempSync(join(tmpdir(), 'arcsift-report-'));
    run = writeSyntheticRun(root);
    page = writeReport(run);
    html = readFileSync(page, 'utf8');
  });

  it('writes report.html in the run folder and its figures in figures/', () => {
    expect(page).toBe(join(run, 'report.html'));
    const figures = readdirSync(join(run, 'figures'));
    for (const name of ['data', 'noise', 'smooth-model', 'smooth-residual', 'smooth-normalised-residual', 'perturbed-model', 'perturbed-residual', 'perturbed-normalised-residual']) {
      expect(figures).toContain(`${name}.svg`);
      expect(figures).toContain(`${name}.png`);
    }
    expect(figures).toContain('corner-perturber.svg');
    expect(figures).toContain('corner-all.svg');
  });

  it('draws the lens and source planes from the run\'s config and best fits', () => {
    const figures = readdirSync(join(run, 'figures'));
    for (const name of ['perturbed-convergence', 'perturbed-source-plane', 'smooth-source-plane']) {
      expect(figures).toContain(`${name}.svg`);
      expect(figures).toContain(`${name}.png`);
      const inline = new RegExp(`<figure id="figure-${name}"><div class="art"><svg xmlns="http://www.w3.org/2000/svg"[\\s\\S]*?</figure>`).exec(html)?.[0] ?? '';
      expect(inline, name).toContain('data:image/png;base64,');
      // Critical curves (image plane) or caustics (source plane): paths in the model's colour.
      expect(inline, name).toContain(`stroke="${name.startsWith('smooth') ? reportPalette.smooth : reportPalette.perturbed}" stroke-width="1.4"`);
    }
    expect(html).toContain('Lens and source planes');
    expect(html).not.toContain('the lens and source plane panels are left out');
    expect(html).not.toContain('has changed since the run');
  });

  it('leaves the lens and source planes out, naming the key, when a best fit lacks a parameter of the config', () => {
    const other = mkdtempSync(join(tmpdir(), 'arcsift-report-nobest-'));
    const folder = writeSyntheticRun(other);
    const summaryFile = join(folder, 'summary.json');
    const summary = JSON.parse(readFileSync(summaryFile, 'utf8'));
    delete summary.models.smooth.bestFit['lens.shear.shearStrength'];
    writeFileSync(summaryFile, JSON.stringify(summary));
    const text = readFileSync(writeReport(folder), 'utf8');
    expect(text).toContain('key models.smooth.bestFit.lens.shear.shearStrength');
    expect(text).toContain('the lens and source plane panels are left out');
    expect(text).not.toContain('figure-perturbed-convergence');
    rmSync(other, { recursive: true, force: true });
  });

  it('says so when the config has changed since the run', () => {
    const other = mkdtempSync(join(tmpdir(), 'arcsift-report-changed-'));
    const folder = writeSyntheticRun(other);
    const config = join(other, 'configs', 'synthetic.yaml');
    writeFileSync(config, `${readFileSync(config, 'utf8')}# edited after the run\n`);
    const text = readFileSync(writeReport(folder), 'utf8');
    expect(text).toContain('has changed since the run (its sha256 differs)');
    expect(text).toContain('figure-perturbed-convergence');
    rmSync(other, { recursive: true, force: true });
  });

  it('leaves the lens and source planes out, with a notice, when the config is missing', () => {
    const other = mkdtempSync(join(tmpdir(), 'arcsift-report-noconfig-'));
    const folder = writeSyntheticRun(other);
    rmSync(join(other, 'configs'), { recursive: true, force: true });
    const text = readFileSync(writeReport(folder), 'utf8');
    expect(text).toContain('configs/synthetic.yaml (named in');
    expect(text).toContain('the lens and source plane panels are left out');
    expect(text).not.toContain('figure-perturbed-convergence');
    expect(text).toContain('figure-perturbed-model');
    rmSync(other, { recursive: true, force: true });
  });

  it('needs no network and refers only to files that exist', () => {
    const all = references(html);
    expect(all.length).toBeGreaterThan(0);
    for (const r of all) expect(r).not.toMatch(/^(https?:)?\/\//);
    expect(html).not.toMatch(/<script|<link\s|@import|url\(\s*['"]?https?:/);
    for (const r of fileReferences(html)) expect(existsSync(resolve(dirname(page), decodeURI(r))), r).toBe(true);
    // Every in-page anchor has its target.
    for (const r of all.filter((x) => x.startsWith('#'))) expect(html).toContain(`id="${r.slice(1)}"`);
  });

  it('links every figure file and shows every SVG figure inline', () => {
    const linked = new Set(fileReferences(html).map((r) => resolve(dirname(page), decodeURI(r))));
    const figures = readdirSync(join(run, 'figures'));
    for (const name of figures) expect(linked.has(resolve(run, 'figures', name)), name).toBe(true);
    const inline = (html.match(/<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg"/g) ?? []).length;
    expect(inline).toBe(figures.filter((f) => f.endsWith('.svg')).length);
  });

  it("contains the numbers of summary.json's evidence table, to the two decimals it shows", () => {
    const table = /<table id="evidence-table">[\s\S]*?<\/table>/.exec(html)?.[0] ?? '';
    for (const value of [SYNTHETIC.smoothLnZ, SYNTHETIC.smoothLnZError, SYNTHETIC.perturbedLnZ, SYNTHETIC.perturbedLnZError]) {
      expect(table).toContain(value.toFixed(2));
    }
    const bayes = /<table id="bayes-factor-table"[\s\S]*?<\/table>/.exec(html)?.[0] ?? '';
    expect(bayes).toContain(`${SYNTHETIC.lnB.toFixed(2)} &plusmn; ${SYNTHETIC.lnBError.toFixed(2)}`);
    expect(bayes).toContain('strong evidence for the perturbed model');
    expect(bayes).toContain('0.00123');
  });

  it('states the detection claim with its threshold and the misfit test of each model (own report contract)', () => {
    const verdict = /<section class="verdict[^"]*" id="verdict">[\s\S]*?<\/section>/.exec(html)?.[0] ?? '';
    expect(verdict).toContain('class="verdict not-evidence"');
    expect(verdict).toContain('not evidence: smooth model misfits');
    expect(verdict).toContain(SYNTHETIC.claimSentence);
    expect(verdict).toContain('synthetic threshold source');
    const bayes = /<table id="bayes-factor-table"[\s\S]*?<\/table>/.exec(html)?.[0] ?? '';
    expect(bayes).toContain('ln B &gt; 50');
    expect(bayes).toContain('<span class="tag claim-not-evidence">not-evidence</span>');
    const misfit = /<table id="misfit-table">[\s\S]*?<\/table>/.exec(html)?.[0] ?? '';
    expect(misfit).toContain('<span class="tag misfit">misfit</span>');
    expect(misfit).toContain('<span class="tag fits">passes</span>');
    for (const value of [SYNTHETIC.smoothMoransI.toFixed(4), SYNTHETIC.perturbedMoransI.toFixed(4), SYNTHETIC.smoothPValue.toFixed(3), SYNTHETIC.perturbedPValue.toFixed(3), '1.087']) {
      expect(misfit).toContain(value);
    }
  });

  it('shows the caution, the priors behind the Bayes factor, the truth and the sampler diagnostics', () => {
    expect(html).toContain(SYNTHETIC.caution);
    const priors = /<table id="prior-table">[\s\S]*?<\/table>/.exec(html)?.[0] ?? '';
    expect(priors).toContain('uniform on [8, 12]');
    expect(priors).toContain('not in this model');
    expect(priors).toContain('Normal(0, 100^2)');
    expect(priors).toContain('position uniform over the used pixels of the mask');
    expect(html).toContain('simulated truth');
    const diagnostics = /<table id="diagnostics-table">[\s\S]*?<\/table>/.exec(html)?.[0] ?? '';
    for (const text of ['slice', '43\u2009210', '1.23%', '0.420']) expect(diagnostics).toContain(text);
    // Where each ln Z came from: the importance stage with its effective sample size and k-hat, or
    // the nested sum for a record without an evidence block.
    for (const text of ['nested-sampling sum', 'importance sampling', '1\u2009234 of 4\u2009000 draws', '0.31 (limit 0.70)']) expect(diagnostics).toContain(text);
  });

  it('does not call the perturber measured when the evidence favours it but the claim is no detection', () => {
    // Own report contract: ln B = 5.44 favours a perturber (ln B > 1), while the claim is
    // 'not-evidence' (threshold ln B > 50), so the intervals must not read as a measurement.
    const section = /<section class="card" id="perturber">[\s\S]*?<\/section>/.exec(html)?.[0] ?? '';
    expect(section).toContain('but makes no detection (threshold ln B &gt; 50');
    expect(section).not.toContain('the intervals are the measurement');
  });

  it('writes elsewhere with --out, its links still resolving from there', () => {
    const other = join(root, 'elsewhere', 'page.html');
    expect(writeReport(run, other)).toBe(other);
    const text = readFileSync(other, 'utf8');
    for (const r of fileReferences(text)) expect(existsSync(resolve(dirname(other), decodeURI(r))), r).toBe(true);
  });
});

describe('writeReport on a bad run folder', () => {
  it('names summary.json when it is missing, not JSON, or misses a key', () => {
    const folder = mkdtempSync(join(tmpdir(), 'arcsift-report-bad-'));
    const summary = join(folder, 'summary.json');
    expect(() => writeReport(folder)).toThrow(InputError);
    expect(() => writeReport(folder)).toThrow(summary);
    writeFileSync(summary, '{ "kind": "comparison", ');
    expect(() => writeReport(folder)).toThrow(/summary\.json: not valid JSON/);
    const good = JSON.parse(readFileSync(join(writeSyntheticRun(folder), 'summary.json'), 'utf8'));
    good.models.perturbed.lnEvidence = 'big';
    writeFileSync(summary, JSON.stringify(good));
    expect(() => writeReport(folder)).toThrow(/summary\.json, key models\.perturbed\.lnEvidence: expected a number, found "big"/);
    rmSync(folder, { recursive: true, force: true });
  });

  it('exits with status 2 from the command line, naming the file', () => {
    // The CLI contract of src/errors.ts: user mistakes print one line and exit 2. Runs the built CLI (npm test builds first).
    const cli = fileURLToPath(new URL('../../dist/cli/main.js', import.meta.url));
    const folder = mkdtempSync(join(tmpdir(), 'arcsift-report-cli-'));
    const result = spawnSync(process.execPath, [cli, 'report', folder], { encoding: 'utf8', timeout: 60_000 });
    expect(result.status).toBe(2);
    expect(result.stderr).toContain(join(folder, 'summary.json'));
    rmSync(folder, { recursive: true, force: true });
  });
});
