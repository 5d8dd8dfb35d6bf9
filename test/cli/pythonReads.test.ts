import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';

// README's Python reads of the posterior tables, run as written by Debian's python3-numpy (and
// python3-pandas where installed; .ci/run installs it) on the files real runs wrote: a nested fit
// in chains/fit and an ensemble fit in chains/mcmc, as README names them. The blocks are taken
// from README itself, so README cannot drift from what works. Each variable they make is compared
// value for value with the CSV text: the CSV holds the shortest decimal that reads back as the
// same double (ECMA-262 Number::toString), and Python's float() and repr() round-trip it
// (IEEE 754 correct rounding), so the comparison is exact, negative zero included.
const cli = fileURLToPath(new URL('../../dist/cli/main.js', import.meta.url));
const fixture = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));
const readme = readFileSync(fileURLToPath(new URL('../../README.md', import.meta.url)), 'utf8');
const PYTHON = '/usr/bin/python3';

let root: string;

function arcsift(args: readonly string[]): { status: number | null; stderr: string } {
  const run = spawnSync(process.execPath, [cli, ...args], { cwd: root, encoding: 'utf8', timeout: 300_000 });
  return { status: run.status, stderr: run.stderr };
}

/** The ```python blocks of README's section on reading the posterior in Python. */
function readmePythonBlocks(): string[] {
  const start = readme.indexOf('### Reading the posterior in Python');
  expect(start).toBeGreaterThan(0);
  const section = readme.slice(start, readme.indexOf('\n## ', start));
  return [...section.matchAll(/```python\n([\s\S]*?)```/g)].map((m) => m[1]);
}

/** Runs `code` with Python in the runs' folder; what it prints is JSON. */
function python(code: string): Record<string, { names: string[]; columns: string[][]; kinds?: string[] }> {
  const run = spawnSync(PYTHON, ['-c', code], { cwd: root, encoding: 'utf8', timeout: 120_000 });
  expect(run.status, run.stderr).toBe(0);
  return JSON.parse(run.stdout);
}

/** The CSV table as Python must see it: header names and every column as numbers. */
function csvColumns(file: string): { names: string[]; columns: number[][] } {
  const lines = readFileSync(join(root, file), 'utf8').trimEnd().split('\n');
  const names = lines[0].split(',');
  const rows = lines.slice(1).map((line) => line.split(',').map(Number));
  return { names, columns: names.map((_, c) => rows.map((row) => row[c])) };
}

/** Python's repr of a float back to a number ('inf', 'nan' are Python's spellings). */
const fromRepr = (text: string): number => ({ inf: Infinity, '-inf': -Infinity, nan: NaN } as Record<string, number>)[text] ?? Number(text);

function expectSameTable(read: { names: string[]; columns: string[][] }, csvFile: string): void {
  const csv = csvColumns(csvFile);
  expect(read.names).toEqual(csv.names);
  expect(csv.columns[0].length).toBeGreaterThan(10);
  read.columns.forEach((column, c) => expect(column.map(fromRepr), `${csvFile} ${csv.names[c]}`).toEqual(csv.columns[c]));
}

// Appended to README's numpy block: every column of the three arrays it made, as float reprs.
const NUMPY_DUMP = `
import json
def table(a):
    return {"names": list(a.dtype.names), "columns": [[repr(float(x)) for x in a[n]] for n in a.dtype.names], "kinds": [a.dtype[n].kind for n in a.dtype.names]}
print(json.dumps({"draws": table(draws), "weighted": table(weighted), "paths": table(paths)}))
`;

// Appended to README's pandas block: the same for its two data frames.
const PANDAS_DUMP = `
import json
def table(f):
    return {"names": list(f.columns), "columns": [[repr(float(x)) for x in f[n]] for n in f.columns]}
print(json.dumps({"draws": table(draws), "weighted": table(weighted)}))
`;

const hasPandas = spawnSync(PYTHON, ['-c', 'import pandas'], { encoding: 'utf8' }).status === 0;

beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), 'arcsift-python-'));
  writeFileSync(join(root, 'lens.yaml'), readFileSync(fixture, 'utf8'));
  expect(arcsift(['simulate', '--config', 'lens.yaml', '--out', 'data', '--seed', '3']).status).toBe(0);
  const common = ['--config', 'lens.yaml', '--data', 'data', '--perturbers', '0', '--threads', '1', '--quiet', '--no-report'];
  const nested = arcsift(['fit', ...common, '--out', 'chains/fit', '--live-points', '30', '--method', 'slice', '--tolerance', '0.5', '--seed', '5']);
  expect(nested.status, nested.stderr).toBe(0);
  // 200 sweeps do not meet the ensemble's stop rule: cut short (status 3), its tables written all the same.
  const ensemble = arcsift(['fit', ...common, '--out', 'chains/mcmc', '--sampler', 'ensemble', '--start-at-values', '--walkers', '12',
    '--max-sweeps', '200', '--seed', '4']);
  expect(ensemble.status, ensemble.stderr).toBe(3);
}, 600_000);

describe("README's Python reads of a run's posterior", () => {
  it('numpy: the NPY draws and walker paths and the weighted CSV hold every column of the CSV tables, names as written', () => {
    const [numpyBlock] = readmePythonBlocks();
    expect(numpyBlock).toContain('import numpy as np');
    const read = python(numpyBlock + NUMPY_DUMP);
    expectSameTable(read.draws, 'chains/fit/posterior-draws.csv');
    expectSameTable(read.weighted, 'chains/fit/posterior-weighted.csv');
    expectSameTable(read.paths, 'chains/mcmc/walker-paths.csv');
    // Parameter names with '.', '[' and ']' survive: the README's comment indexes one.
    expect(read.draws.names).toContain('lens.mass[0].einsteinRadiusArcsec');
    // walker and sweep are integers in the NPY copy, the rest float64.
    expect(read.paths.kinds?.slice(0, 3)).toEqual(['i', 'i', 'f']);
    // The weights sum to 1 (normalised): ~1000 additions each rounding by at most 1.1e-16 bound
    // the error by ~1.1e-13; exp() of each lnWeight adds one more rounding per term.
    const weight = read.weighted.columns[read.weighted.names.indexOf('weight')].map(fromRepr);
    expect(Math.abs(weight.reduce((a, b) => a + b, 0) - 1)).toBeLessThan(1e-12);
  });

  it.skipIf(!hasPandas)(`pandas: read_csv (round trip) and a DataFrame of the NPY give the same columns and values${hasPandas ? '' : ' (SKIPPED: python3-pandas is not installed)'}`, () => {
    const pandasBlock = readmePythonBlocks()[1];
    expect(pandasBlock).toContain('import pandas as pd');
    const read = python(pandasBlock + PANDAS_DUMP);
    expectSameTable(read.draws, 'chains/fit/posterior-draws.csv');
    expectSameTable(read.weighted, 'chains/fit/posterior-weighted.csv');
  });
});
