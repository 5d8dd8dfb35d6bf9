import { describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { InputError } from '../../src/errors.js';
import { readBatchManifest } from '../../src/batch/readBatchManifest.js';
import { rowCommand } from '../../src/batch/rowCommand.js';
import { batchJobs } from '../../src/batch/batchJobs.js';
import type { BatchPlan } from '../../src/batch/batchPlan.js';

// Manifests as a user writes them: CSV with RFC 4180 quoting (RFC 4180, section 2) or YAML with
// shared defaults; every mistake is an InputError naming the file, the line or row and the column
// (arcsift's contract for user mistakes, README).

function scratch(): string {
  const root = mkdtempSync(join(tmpdir(), 'arcsift-manifest-'));
  writeFileSync(join(root, 'lens.yaml'), 'title: x\n');
  mkdirSync(join(root, 'data-1'));
  mkdirSync(join(root, 'data 2'));
  writeFileSync(join(root, 'flags.csv'), 'x,y\n0,0\n');
  return root;
}

function write(root: string, name: string, text: string): string {
  const file = join(root, name);
  writeFileSync(file, text);
  return file;
}

function message(fn: () => unknown): string {
  try {
    fn();
  } catch (error) {
    expect(error).toBeInstanceOf(InputError);
    return (error as Error).message;
  }
  throw new Error('expected an InputError');
}

describe('readBatchManifest', () => {
  it('reads CSV rows with quoted cells, paths relative to the manifest, and default ids', () => {
    const root = scratch();
    const file = write(root, 'm.csv', [
      '# a comment line',
      'job,config,data,flags,seed,options',
      'compare,lens.yaml,data-1,,7,"--live-points 50 --method slice"',
      'vet,lens.yaml,"data 2",flags.csv,,',
      '',
    ].join('\r\n'));
    const rows = readBatchManifest(file);
    expect(rows.map((r) => r.id)).toEqual(['row-0001', 'row-0002']);
    expect(rows[0]).toMatchObject({ job: 'compare', config: join(root, 'lens.yaml'), data: { folder: join(root, 'data-1') }, seed: 7, options: ['--live-points', '50', '--method', 'slice'] });
    expect(rows[1]).toMatchObject({ job: 'vet', data: { folder: join(root, 'data 2') }, flags: join(root, 'flags.csv'), options: [] });
    expect(rows[1].origin).toBe(`${file} line 4`);
  });

  it('reads YAML rows with defaults, and builds each row\'s command', () => {
    const root = scratch();
    const file = write(root, 'm.yaml', 'defaults: { job: fit, config: lens.yaml, options: [--perturbers, "0"] }\nrows:\n  - { id: north, data: data-1 }\n  - { id: south, data: data 2, job: sensitivity, options: --grid 4 }\n');
    const rows = readBatchManifest(file);
    expect(rows.map((r) => [r.id, r.job, r.options])).toEqual([['north', 'fit', ['--perturbers', '0']], ['south', 'sensitivity', ['--grid', '4']]]);
    const plan: BatchPlan = { format: 'arcsift batch plan', version: 1, manifest: file, rows, runOptions: ['--live-points', '30'], reports: false };
    expect(rowCommand('/b', plan, rows[0], 2)).toEqual([
      'fit', '--config', join(root, 'lens.yaml'), '--data', join(root, 'data-1'), '--out', '/b/rows/north', '--resume', '--take-over-lock', '--quiet', '--threads', '2',
      '--no-report', '--live-points', '30', '--perturbers', '0',
    ]);
  });

  it('names the place of each mistake', () => {
    const root = scratch();
    const csv = (body: string): string => write(root, 'bad.csv', `id,job,config,data,flags,options\n${body}\n`);
    expect(message(() => readBatchManifest(csv('a,refit,lens.yaml,data-1,,')))).toMatch(/bad\.csv line 2, job: expected one of fit, compare, vet, sensitivity.*found "refit"/);
    expect(message(() => readBatchManifest(csv('a,fit,lens.yaml,data-9,,')))).toMatch(/line 2, data: folder not found: .*data-9/);
    expect(message(() => readBatchManifest(csv('a,vet,lens.yaml,data-1,,')))).toMatch(/line 2, flags: the vet job needs a flag list/);
    expect(message(() => readBatchManifest(csv('a,fit,lens.yaml,data-1,,--out elsewhere')))).toMatch(/line 2, options: --out is set by the batch itself/);
    expect(message(() => readBatchManifest(csv('a,fit,lens.yaml,data-1,,\na,fit,lens.yaml,data-1,,')))).toMatch(/line 3, id: a is already the id of .*line 2/);
    expect(message(() => readBatchManifest(csv('a/b,fit,lens.yaml,data-1,,')))).toMatch(/id: expected letters, digits/);
    expect(message(() => readBatchManifest(write(root, 'h.csv', 'id,job,lens\n')))).toMatch(/unknown column "lens"/);
    expect(message(() => readBatchManifest(write(root, 'y.yaml', 'rows:\n  - { job: fit, config: lens.yaml, data: data-1, walkers: 8 }\n')))).toMatch(/key rows\[0\]: unknown key "walkers"/);
    expect(message(() => readBatchManifest(write(root, 'm.txt', '')))).toMatch(/expected a manifest ending \.csv, \.yaml, \.yml or \.json/);
  });

  it('has one job-table entry per manifest job, each naming an arcsift command and the file it writes last', () => {
    expect(Object.keys(batchJobs)).toEqual(['fit', 'compare', 'vet', 'sensitivity', 'verdict']);
    expect(Object.values(batchJobs).map((j) => [j.command, j.summaryFile])).toEqual([
      ['fit', 'summary.json'], ['compare', 'summary.json'], ['vet', 'vet.json'], ['sensitivity', 'sensitivity.json'], ['verdict', 'verdict.json'],
    ]);
  });
});
