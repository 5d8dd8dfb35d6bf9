import type { CommandModule } from 'yargs';
import { fileURLToPath } from 'node:url';
import { join } from 'node:path';
import { loadConfig } from '../config/arcsiftConfig.js';
import { simulateToFolder } from '../model/simulateToFolder.js';

interface DemoArguments {
  out: string;
  seed: number;
}

/** configs/demo.yaml of the installed package. */
export const demoConfigPath = fileURLToPath(new URL('../../configs/demo.yaml', import.meta.url));

export const demoCommand: CommandModule<object, DemoArguments> = {
  command: 'demo',
  describe: 'Run the main job on the built-in scenario (configs/demo.yaml)',
  builder: (y) => y
    .option('out', { type: 'string', default: 'chains/demo', describe: 'folder for the demo run' })
    .option('seed', { type: 'number', default: 1, describe: 'seed of the simulated noise' }),
  handler: (args) => {
    const config = loadConfig(demoConfigPath);
    const dataDir = join(args.out, 'data');
    process.stdout.write(`arcsift demo: simulating "${config.title}"\n`);
    const written = simulateToFolder(config, dataDir, { seed: args.seed, noiseless: false });
    for (const path of written) process.stdout.write(`wrote ${path}\n`);
    process.stdout.write('the smooth-versus-perturbed comparison is not yet available in this version\n');
  },
};
