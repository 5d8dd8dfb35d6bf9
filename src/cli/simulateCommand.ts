import type { CommandModule } from 'yargs';
import { loadConfig } from '../config/arcsiftConfig.js';
import { simulateToFolder } from '../simulate/simulateToFolder.js';

interface SimulateArguments {
  config: string;
  out: string;
  seed: number;
  noiseless: boolean;
  force: boolean;
}

export const simulateCommand: CommandModule<object, SimulateArguments> = {
  command: 'simulate',
  describe: 'Make a mock observation with known truth from a config',
  builder: (y) => y
    .option('config', { type: 'string', demandOption: true, describe: 'scenario config (YAML or JSON); parameter `value`s are the truth' })
    .option('out', { type: 'string', demandOption: true, describe: 'folder for image.fits, noise.fits, psf.fits, mask.fits, truth.json' })
    .option('seed', { type: 'number', default: 1, describe: 'seed of the noise realisation (same seed, same bytes)' })
    .option('noiseless', { type: 'boolean', default: false, describe: 'write the model image without noise (noise.fits still holds the 1-sigma map)' })
    .option('force', { type: 'boolean', default: false, describe: 'replace the data set --out already holds (refused otherwise)' })
    .example('$0 simulate --config configs/demo.yaml --out chains/mock', 'simulate the built-in scenario'),
  handler: (args) => {
    const config = loadConfig(args.config);
    const written = simulateToFolder(config, args.out, { seed: args.seed, noiseless: args.noiseless, overwrite: args.force });
    for (const path of written) process.stdout.write(`wrote ${path}\n`);
  },
};
