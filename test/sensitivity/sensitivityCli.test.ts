import { describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadConfig } from '../../src/config/arcsiftConfig.js';
import { simulateToFolder } from '../../src/simulate/simulateToFolder.js';
import { runCli as run } from '../vet/runCli.js';

// Bad options of `sensitivity` must stop it before any fit with a message and exit status 2
// (arcsift's contract for user mistakes, README). The CLI runs from dist/, which `npm test` builds first.
const config = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));

describe('sensitivity: bad options through the CLI', () => {
  it('exits 2 on --grid 0 and on a best-fit folder without a run', () => {
    const scratch = mkdtempSync(join(tmpdir(), 'arcsift-sens-cli-'));
    const data = join(scratch, 'mock');
    simulateToFolder(loadConfig(config), data, { seed: 1, noiseless: false });
    const grid = run(['sensitivity', '--config', config, '--data', data, '--grid', '0', '--out', join(scratch, 'a'), '--quiet']);
    expect(grid.stderr).toMatch(/--grid: expected a whole number >= 1, found 0/);
    expect(grid.status).toBe(2);
    const best = run(['sensitivity', '--config', config, '--data', data, '--best-fit', scratch, '--out', join(scratch, 'b'), '--quiet']);
    expect(best.stderr).toMatch(/best-fit run folder: expected a finished run holding summary\.json/);
    expect(best.status).toBe(2);
  });
});
