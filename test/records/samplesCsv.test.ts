// Tests of src/results/writeSamplesCsv.ts.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import {
  EQUAL_WEIGHT_SAMPLES_TITLE,
  formatWeightedSamplesCsv,
  WEIGHTED_SAMPLES_TITLE,
  writeEqualWeightSamplesCsv,
  writeWeightedSamplesCsv,
} from '../../src/records/index.js';

const folder = mkdtempSync(join(tmpdir(), 'arcsift-samples-'));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

// Doubles chosen to need all 17 digits, to sit at the ends of the range, or to be signed zero.
const AWKWARD = [0.1 + 0.2, 1 / 3, -Math.PI * 1e200, 5e-324, 1.7976931348623157e308, -0, 2 ** -1074 * 3, 123456789.12345679];
const NAMES = ['thetaE', 'mass, log', 'say "x"', '#hash'];
const UNITS = ['arcsec', 'log10 Msun', '', 'deg'];

function table() {
  const count = 6;
  const points = Float64Array.from({ length: count * NAMES.length }, (_, k) => AWKWARD[k % AWKWARD.length] * (k % 3 === 0 ? -1 : 1));
  const lnWeight = Float64Array.from([-0.5, -1e-17, -745.2, -Infinity, -2.302585092994046, -3]);
  const lnLikelihood = Float64Array.from([-1234.5678901234567, -1e6 / 7, 0, -0, -Infinity, 42]);
  return { names: NAMES, units: UNITS, points, lnWeight, lnLikelihood, lnEvidence: -1250.0000000000002, lnEvidenceError: 0.1234 };
}

/** RFC 4180 reading of one line (no embedded line breaks in these tables). */
function splitCsvLine(line: string): string[] {
  const fields: string[] = [];
  let field = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const c = line[i];
    if (quoted) {
      if (c === '"' && line[i + 1] === '"') {
        field += '"';
        i++;
      } else if (c === '"') quoted = false;
      else field += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') {
      fields.push(field);
      field = '';
    } else field += c;
  }
  fields.push(field);
  return fields;
}

function expectSameDoubles(got: number[], expected: ArrayLike<number>): void {
  expect(got.length).toBe(expected.length);
  for (let i = 0; i < got.length; i++) expect(Object.is(got[i], expected[i]), `${got[i]} vs ${expected[i]}`).toBe(true);
}

describe('writeWeightedSamplesCsv', () => {
  it('reads back exactly: header, evidence lines and every double bit for bit', () => {
    const samples = table();
    const path = join(folder, 'weighted.csv');
    writeWeightedSamplesCsv(path, samples);
    const lines = readFileSync(path, 'utf8').split('\n');
    expect(lines.pop()).toBe('');
    expect(lines.slice(0, 3)).toEqual([WEIGHTED_SAMPLES_TITLE, '# lnEvidence = -1250.0000000000002', '# lnEvidenceError = 0.1234']);
    expect(splitCsvLine(lines[3])).toEqual([
      'posteriorWeight',
      'lnPosteriorWeight',
      'lnLikelihood',
      'thetaE [arcsec]',
      'mass, log [log10 Msun]',
      'say "x"',
      '#hash [deg]',
    ]);
    const rows = lines.slice(4).map((line) => splitCsvLine(line).map(Number));
    expect(rows).toHaveLength(6);
    expectSameDoubles(
      rows.map((row) => row[0]),
      Array.from(samples.lnWeight, (w) => Math.exp(w)),
    );
    expectSameDoubles(rows.map((row) => row[1]), samples.lnWeight);
    expectSameDoubles(rows.map((row) => row[2]), samples.lnLikelihood);
    expectSameDoubles(rows.flatMap((row) => row.slice(3)), samples.points);
    // Nothing but the file is left in the folder (the temporary name was renamed away).
    expect(readdirSync(folder).filter((name) => name.startsWith('weighted'))).toEqual(['weighted.csv']);
  });

  it("is read the same by Python's csv module (an outside RFC 4180 reader)", () => {
    const text = formatWeightedSamplesCsv(table());
    const script = [
      'import csv, json, sys',
      'lines = [l for l in sys.stdin.read().split("\\n") if l and not l.startswith("#")]',
      'rows = list(csv.reader(lines))',
      'print(json.dumps({"header": rows[0], "values": [[repr(float(v)) for v in r] for r in rows[1:]]}))',
    ].join('\n');
    const run = spawnSync('/usr/bin/python3', ['-c', script], { input: text, encoding: 'utf8' });
    expect(run.status, run.stderr).toBe(0);
    const parsed = JSON.parse(run.stdout) as { header: string[]; values: string[][] };
    expect(parsed.header.slice(3)).toEqual(['thetaE [arcsec]', 'mass, log [log10 Msun]', 'say "x"', '#hash [deg]']);
    // Python's repr(float) is the shortest round-tripping text too, so it reads the same doubles.
    const samples = table();
    expectSameDoubles(
      parsed.values.flatMap((row) => row.slice(3).map((v) => Number(v.replace('inf', 'Infinity')))),
      samples.points,
    );
  });

  it('refuses tables whose columns do not line up', () => {
    const samples = table();
    expect(() => formatWeightedSamplesCsv({ ...samples, units: UNITS.slice(1) })).toThrow(/units: expected 4 units, one per name, found 3/);
    expect(() => formatWeightedSamplesCsv({ ...samples, lnLikelihood: [1, 2] })).toThrow(/lnLikelihood: expected 6 values, one per sample, found 2/);
  });
});

describe('writeEqualWeightSamplesCsv', () => {
  it('reads back exactly, with and without ln L', () => {
    const { points, lnLikelihood } = table();
    const withL = join(folder, 'equal-with.csv');
    const without = join(folder, 'equal-without.csv');
    writeEqualWeightSamplesCsv(withL, { names: NAMES, units: UNITS, points, lnLikelihood });
    writeEqualWeightSamplesCsv(without, { names: ['a'], units: ['kpc'], points: [1.5, -0, 3] });
    const first = readFileSync(withL, 'utf8').trimEnd().split('\n');
    expect(first[0]).toBe(EQUAL_WEIGHT_SAMPLES_TITLE);
    expect(splitCsvLine(first[1])[0]).toBe('lnLikelihood');
    const rows = first.slice(2).map((line) => splitCsvLine(line).map(Number));
    expectSameDoubles(rows.map((row) => row[0]), lnLikelihood);
    expectSameDoubles(rows.flatMap((row) => row.slice(1)), points);
    expect(readFileSync(without, 'utf8')).toBe(`${EQUAL_WEIGHT_SAMPLES_TITLE}\na [kpc]\n1.5\n-0\n3\n`);
  });
});
