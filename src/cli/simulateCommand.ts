import type { CommandModule } from 'yargs';
import { loadSimulationConfig } from '../config/verdictConfig.js';
import { simulateToFolder } from '../simulate/simulateToFolder.js';
import { InputError, expectedFound } from '../errors.js';
import { wholeNumberOption } from './dataOptions.js';

interface SimulateArguments {
  config: string;
  out: string;
  seed: number;
  noiseless: boolean;
  force: boolean;
  perturbers?: number;
}

export const simulateCommand: CommandModule<object, SimulateArguments> = {
  command: 'simulate',
  describe: 'Make a mock observation with known truth from a config',
  builder: (y) => y
    .option('config', { type: 'string', demandOption: true, describe: 'scenario config (YAML or JSON); parameter `value`s are the truth (of a verdict config, its base: smoothFamilies are for fits)' })
    .option('out', { type: 'string', demandOption: true, describe: 'folder for image.fits, noise.fits, psf.fits, mask.fits, truth.json' })
    .option('seed', { type: 'number', default: 1, describe: 'seed of the noise realisation (same seed, same bytes)' })
    .option('perturbers', { type: 'number', describe: 'plant only the first N of the config\'s perturbers (0: a smooth lens) [default: all]' })
    .option('noiseless', { type: 'boolean', default: false, describe: 'write the model image without noise (noise.fits still holds the 1-sigma map)' })
    .option('force', { type: 'boolean', default: false, describe: 'replace the data set --out already holds (refused otherwise)' })
    .example('$0 simulate --config configs/demo.yaml --out chains/mock', 'simulate the built-in scenario')
    .example('$0 simulate --config configs/verdict-demo.yaml --out chains/smooth-mock --perturbers 0', 'the same lens without its subhalo'),
  handler: (args) => {
    const loaded = loadSimulationConfig(args.config);
    const planted = args.perturbers === undefined ? loaded.perturbers.length : wholeNumberOption('perturbers', args.perturbers, 0);
    if (planted > loaded.perturbers.length) {
      throw new InputError(`--perturbers: ${expectedFound(`at most ${loaded.perturbers.length}, the number listed under perturbers`, planted)}`, { file: args.config, key: 'perturbers' });
    }
    const config = { ...loaded, perturbers: loaded.perturbers.slice(0, planted) };
    const written = simulateToFolder(config, args.out, { seed: args.seed, noiseless: args.noiseless, overwrite: args.force });
    for (const path of written) process.stdout.write(`wrote ${path}\n`);
  },
};
