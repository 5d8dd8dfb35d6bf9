// Tests of src/records/posteriorTables.ts (and its readers) against outside readers: Python's csv
// module and numpy.load (Debian's python3-numpy), both reading the files written here.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { splitCsvLine } from '../../src/io/splitCsvLine.js';
import {
  POSTERIOR_SIDECAR, readPosteriorTable, readWeightedPosterior, writePosteriorTables, type PosteriorTablesContent,
} from '../../src/records/index.js';

const root = mkdtempSync(join(tmpdir(), 'arcsift-posterior-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

// Doubles chosen to need all 17 digits, to sit at the ends of the range, or to be signed zero.
const AWKWARD = [0.1 + 0.2, 1 / 3, -Math.PI * 1e200, 5e-324, 1.7976931348623157e308, -0, 2 ** -1074 * 3, 123456789.12345679];
// Names with a comma, quotes and a leading "#", which CSV must quote and NPY must escape.
const NAMES = ['thetaE', 'mass, log', 'say "x"', "#it's"];
const UNITS = ['arcsec', 'log10 Msun', '', 'deg'];

function nested(): PosteriorTablesContent {
  const count = 6;
  const points = Float64Array.from({ length: count * NAMES.length }, (_, k) => AWKWARD[k % AWKWARD.length] * (k % 3 === 0 ? -1 : 1));
  return {
    sampler: 'nested', names: NAMES, units: UNITS, lnEvidence: -1250.0000000000002, lnEvidenceError: 0.1234,
    weighted: {
      points,
      lnWeight: Float64Array.from([-0.5, -1e-17, -745.2, -Infinity, -2.302585092994046, -3]),
      lnLikelihood: Float64Array.from([-1234.5678901234567, -1e6 / 7, 0, -0, -Infinity, 42]),
    },
    draws: { points: points.slice(0, 2 * NAMES.length), lnLikelihood: [-1.5, 7] },
  };
}

function expectSameDoubles(got: ArrayLike<number>, expected: ArrayLike<number>): void {
  expect(got.length).toBe(expected.length);
  for (let i = 0; i < got.length; i++) expect(Object.is(got[i], expected[i]), `${i}: ${got[i]} vs ${expected[i]}`).toBe(true);
}

/** Runs a Python script with Debian's numpy; its standard output is JSON. */
function python(script: string, ...args: string[]): any {
  const run = spawnSync('/usr/bin/python3', ['-c', script, ...args], { encoding: 'utf8' });
  expect(run.status, run.stderr).toBe(0);
  return JSON.parse(run.stdout);
}

/** The shortest text of a double, as Python's repr writes it for these values. */
const repr = (x: number): string => String(x);

/** Python's repr of a float read back as a double (repr is the shortest round-tripping text too). */
const fromRepr = (text: string): number => Number(text.replace('inf', 'Infinity').replace('nan', 'NaN'));

describe('nested-sampling tables', () => {
  const folder = join(root, 'nested');
  const content = nested();
  const files = writePosteriorTables(folder, content);

  it('write CSV with the header as the first line and every double bit for bit', () => {
    const lines = readFileSync(files.posteriorWeighted, 'utf8').split('\n');
    expect(lines.pop()).toBe('');
    expect(lines[0]).toBe('lnLikelihood,lnWeight,weight,thetaE,"mass, log","say ""x""","#it\'s"');
    expect(splitCsvLine(lines[0], 'x', 1)).toEqual(['lnLikelihood', 'lnWeight', 'weight', ...NAMES]);
    const rows = lines.slice(1).map((line) => splitCsvLine(line, 'x', 2).map(Number));
    expect(rows).toHaveLength(6);
    expectSameDoubles(rows.map((row) => row[0]), content.weighted!.lnLikelihood);
    expectSameDoubles(rows.map((row) => row[1]), content.weighted!.lnWeight);
    expectSameDoubles(rows.map((row) => row[2]), Array.from(content.weighted!.lnWeight, (w) => Math.exp(w)));
    expectSameDoubles(rows.flatMap((row) => row.slice(3)), content.weighted!.points);
    expect(readdirSync(folder).sort()).toEqual([
      'posterior-draws.csv', 'posterior-draws.npy', 'posterior-weighted.csv', 'posterior-weighted.npy', POSTERIOR_SIDECAR,
    ]);
  });

  it('are read back by arcsift: parameters, sampler columns, units and ln Z', () => {
    const weighted = readWeightedPosterior(files.posteriorWeighted);
    expect(weighted.names).toEqual(NAMES);
    expect(weighted.units).toEqual(UNITS);
    expect(weighted.lnEvidence).toBe(-1250.0000000000002);
    expectSameDoubles(weighted.points, content.weighted!.points);
    expectSameDoubles(weighted.lnWeight, content.weighted!.lnWeight);
    const draws = readPosteriorTable(files.posteriorDraws);
    expect([...draws.samplerColumns.keys()]).toEqual(['lnLikelihood']);
    expectSameDoubles(draws.points, content.draws!.points);
  });

  it("are read the same by Python's csv module (an outside RFC 4180 reader)", () => {
    const parsed = python([
      'import csv, json, sys',
      'rows = list(csv.reader(open(sys.argv[1], newline="")))',
      'print(json.dumps({"header": rows[0], "values": [[repr(float(v)) for v in r] for r in rows[1:]]}))',
    ].join('\n'), files.posteriorWeighted) as { header: string[]; values: string[][] };
    expect(parsed.header).toEqual(['lnLikelihood', 'lnWeight', 'weight', ...NAMES]);
    expectSameDoubles(parsed.values.flatMap((row) => row.slice(3).map(fromRepr)), content.weighted!.points);
  });

  it('have NPY copies that numpy.load reads as named float64 columns equal to the CSV', () => {
    const parsed = python([
      'import json, sys, numpy as np',
      'a = np.load(sys.argv[1])',
      'print(json.dumps({"names": list(a.dtype.names), "kinds": [a.dtype[n].str for n in a.dtype.names], "shape": list(a.shape),',
      '  "columns": {n: [repr(float(v)) for v in a[n]] for n in a.dtype.names}}))',
    ].join('\n'), files.posteriorWeightedNpy) as { names: string[]; kinds: string[]; shape: number[]; columns: Record<string, string[]> };
    expect(parsed.names).toEqual(['lnLikelihood', 'lnWeight', 'weight', ...NAMES]);
    expect(new Set(parsed.kinds)).toEqual(new Set(['<f8']));
    expect(parsed.shape).toEqual([6]);
    expectSameDoubles(parsed.columns.lnWeight.map(fromRepr), content.weighted!.lnWeight);
    NAMES.forEach((name, j) => {
      expectSameDoubles(parsed.columns[name].map(fromRepr), Array.from({ length: 6 }, (_, r) => content.weighted!.points[r * NAMES.length + j]));
    });
  });

  it('describe themselves in posterior.json', () => {
    const sidecar = JSON.parse(readFileSync(files.posteriorSidecar, 'utf8'));
    expect(sidecar).toMatchObject({
      format: 'arcsift posterior tables', version: 1, sampler: 'nested', lnEvidence: -1250.0000000000002, lnEvidenceError: 0.1234,
      parameters: NAMES.map((name, j) => ({ name, unit: UNITS[j] })),
    });
    expect(sidecar.tables.map((t: { table: string; rows: number; csv: string; npy: string }) => [t.table, t.rows, t.csv, t.npy])).toEqual([
      ['posterior-weighted', 6, 'posterior-weighted.csv', 'posterior-weighted.npy'],
      ['posterior-draws', 2, 'posterior-draws.csv', 'posterior-draws.npy'],
    ]);
  });
});

describe('walker paths', () => {
  // 2 stored steps (sweeps 10 and 20) of 3 walkers, one parameter: value = 100 step + walker.
  const folder = join(root, 'ensemble');
  const files = writePosteriorTables(folder, {
    sampler: 'ensemble', names: ['a.b'], units: ['kpc'],
    walkerPaths: {
      walkers: 3, sweeps: [10, 20],
      points: [0, 1, 2, 100, 101, 102], lnPosterior: [-0, -1, -2, -3, -4, -5], lnLikelihood: [5, 4, 3, 2, 1, 0],
    },
  });

  it('are written walker by walker with explicit walker and sweep columns', () => {
    expect(readFileSync(files.walkerPaths, 'utf8')).toBe([
      'walker,sweep,lnPosterior,lnLikelihood,a.b',
      '0,10,-0,5,0', '0,20,-3,2,100',
      '1,10,-1,4,1', '1,20,-4,1,101',
      '2,10,-2,3,2', '2,20,-5,0,102', '',
    ].join('\n'));
  });

  it('store walker and sweep as int64 in the NPY copy', () => {
    const parsed = python([
      'import json, sys, numpy as np',
      'a = np.load(sys.argv[1])',
      'print(json.dumps({"kinds": [a.dtype[n].str for n in a.dtype.names], "walker": a["walker"].tolist(), "sweep": a["sweep"].tolist(), "a": a["a.b"].tolist()}))',
    ].join('\n'), files.walkerPathsNpy);
    expect(parsed).toEqual({ kinds: ['<i8', '<i8', '<f8', '<f8', '<f8'], walker: [0, 0, 1, 1, 2, 2], sweep: [10, 20, 10, 20, 10, 20], a: [0, 100, 1, 101, 2, 102] });
  });
});

describe('a header longer than 65535 bytes', () => {
  // numpy.load refuses headers above 10000 bytes unless max_header_size is raised (numpy 1.24):
  // about 150 parameters of 60-character names; arcsift's models have a few dozen at most.
  it('is written as NPY format 2.0, which numpy.load reads when allowed so large a header', () => {
    const names = Array.from({ length: 2000 }, (_, j) => `perturbers[${j}].centerXArcsecWithALongName`);
    const files = writePosteriorTables(join(root, 'wide'), {
      sampler: 'nested', names, units: names.map(() => 'arcsec'), lnEvidence: 0, lnEvidenceError: 0,
      draws: { points: Float64Array.from({ length: names.length }, (_, j) => j / 7), lnLikelihood: [-1] },
    });
    expect(readFileSync(files.posteriorDrawsNpy)[6]).toBe(2);
    const parsed = python([
      'import json, sys, numpy as np',
      'a = np.load(sys.argv[1], max_header_size=200000)',
      'print(json.dumps({"fields": len(a.dtype.names), "last": repr(float(a[a.dtype.names[-1]][0]))}))',
    ].join('\n'), files.posteriorDrawsNpy);
    expect(parsed).toEqual({ fields: 2001, last: repr(1999 / 7) });
  });
});

describe('refusals', () => {
  it('refuse tables whose columns do not line up, and a parameter named as a sampler column', () => {
    const content = nested();
    expect(() => writePosteriorTables(join(root, 'bad'), { ...content, units: UNITS.slice(1) })).toThrow(/units: expected 4 units, one per name, found 3/);
    expect(() => writePosteriorTables(join(root, 'bad'), { ...content, weighted: { ...content.weighted!, lnLikelihood: [1, 2] } }))
      .toThrow(/lnLikelihood: expected 6 values, one per row, found 2/);
    expect(() => writePosteriorTables(join(root, 'bad'), { ...content, names: ['weight', ...NAMES.slice(1)] })).toThrow(/"weight" is a sampler column's/);
  });

  it('name a samples file of an earlier version that starts with comment lines', () => {
    const old = join(root, 'old.csv');
    writeFileSync(old, '# arcsift equal-weight posterior samples, format 1\nlnLikelihood,a\n1,2\n');
    expect(() => readPosteriorTable(old)).toThrow(/old\.csv: expected a header line of column names first .*earlier arcsift version/);
  });
});
