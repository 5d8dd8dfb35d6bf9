import { beforeAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadConfig } from '../../src/config/arcsiftConfig.js';
import { simulateToFolder } from '../../src/simulate/simulateToFolder.js';
import { runCli as run } from './runCli.js';
import { npyBytes } from '../io/npyBytes.js';

// Bad flags through the command line must stop `vet` before any fit with one message naming the
// file (and line or pixel) and exit status 2 (arcsift's contract for user mistakes, README).
// The CLI runs from dist/, which `npm test` builds first.
const config = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));

describe('vet: bad flags through the CLI', () => {
  let scratch: string;
  let data: string;
  let columns: number;
  let rows: number;
  beforeAll(() => {
    scratch = mkdtempSync(join(tmpdir(), 'arcsift-vet-cli-'));
    data = join(scratch, 'mock');
    const parsed = loadConfig(config);
    ({ columns, rows } = parsed.observation);
    simulateToFolder(parsed, data, { seed: 1, noiseless: false });
  });

  function vet(flags: string, ...extra: string[]): { status: number | null; stderr: string } {
    return run(['vet', '--config', config, '--data', data, '--flags', flags, '--out', join(scratch, `out-${Math.random()}`), '--quiet', ...extra]);
  }
  function file(name: string, content: string | Uint8Array): string {
    const path = join(scratch, name);
    writeFileSync(path, content);
    return path;
  }

  const cases: [string, () => string, RegExp, string[]?][] = [
    ['a non-numeric cell', () => file('letters.csv', 'x,y\n0.9,0.62\n0.1,north\n'), /letters\.csv: line 3, column y: expected a finite number, found "north"/],
    ['a flag outside the image', () => file('outside.csv', 'id,x,y\na,0.9,0.62\nb,-5,0\n'), /outside\.csv: line 3: flag outside the image/],
    ['pixel coordinates outside the image', () => file('pixels.csv', 'column,row\n12,45\n'), /pixels\.csv: line 2: flag outside the image: .*column 12, row 45/],
    ['an empty list', () => file('empty.csv', '# nothing flagged\n'), /empty\.csv: empty flag list/],
    ['a header without candidates', () => file('header.csv', 'x,y,score\n'), /header\.csv: empty flag list: expected at least one candidate after the header on line 1/],
    ['an NPY map of the wrong shape', () => file('map.npy', npyBytes({ descr: '<f4', fortran: false, shape: [rows, columns + 1], values: new Array(rows * (columns + 1)).fill(0.1) })),
      /map\.npy: probability map shape: expected numpy shape \(\d+, \d+\) \(rows, columns\)/],
    ['--map-prior with a list', () => file('list.csv', 'x,y\n0.9,0.62\n'), /list\.csv: --map-prior takes the probability map/, ['--map-prior']],
    ['a missing flags file', () => join(scratch, 'absent.csv'), /absent\.csv: cannot read the flag list/],
    ['an .npz archive', () => file('maps.npz', Uint8Array.of(0x50, 0x4b, 0x03, 0x04, 0, 0, 0, 0)), /maps\.npz: not a readable 2-D NPY array: this is a zip archive, as numpy\.savez writes/],
  ];
  for (const [what, make, message, extra] of cases) {
    it(`exits 2 on ${what}, naming the file`, () => {
      const r = vet(make(), ...(extra ?? []));
      expect(r.stderr).toMatch(message);
      expect(r.stderr).not.toMatch(/internal error|\n\s+at /);
      expect(r.status).toBe(2);
    });
  }

  it('exits 0 with an empty table when no map value reaches the threshold, writing vet.json and vet.csv', () => {
    // A bool map (numpy's dtype |b1) with nothing flagged: a valid answer for a survey batch.
    const out = join(scratch, 'out-nothing');
    const r = run(['vet', '--config', config, '--data', data, '--flags', file('nothing.npy', npyBytes({ descr: '|b1', fortran: false, shape: [rows, columns], values: new Array(rows * columns).fill(0) })),
      '--out', out, '--quiet']);
    expect(r.stderr).not.toMatch(/internal error|\n\s+at /);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/No candidates to vet in .*nothing\.npy: no fit was run/);
    const summary = JSON.parse(readFileSync(join(out, 'vet.json'), 'utf8'));
    expect(summary.candidates).toEqual([]);
    expect(summary.smooth).toBeNull();
    expect(summary.flags.notices).toEqual(['no candidates: no map value inside the mask reaches the threshold 0.5 (the highest is 0); nothing to vet']);
    const csv = readFileSync(join(out, 'vet.csv'), 'utf8').split('\n').filter((line) => line !== '' && !line.startsWith('#'));
    expect(csv).toHaveLength(1);
    expect(csv[0]).toMatch(/^candidate,flag_x_arcsec,/);
    expect(existsSync(join(out, 'smooth'))).toBe(false);
    expect(existsSync(join(out, 'report.html'))).toBe(true);
  });

  it('exits 2 when the config has no perturber to place', () => {
    const smooth = file('smooth.yaml', readFileSync(config, 'utf8').split('perturbers:')[0]);
    const r = run(['vet', '--config', smooth, '--data', data, '--flags', file('one.csv', 'x,y\n0.9,0.62\n'), '--out', join(scratch, 'out-smooth'), '--quiet']);
    expect(r.stderr).toMatch(/smooth\.yaml, key perturbers: vetting needs a perturber/);
    expect(r.status).toBe(2);
  });
});
