import type { CommandModule } from 'yargs';
import { simulateCommand } from './simulateCommand.js';
import { demoCommand } from './demoCommand.js';
import { compareCommand } from './compareCommand.js';
import { fitCommand } from './fitCommand.js';
import { vetCommand } from './vetCommand.js';
import { verdictCommand } from './verdictCommand.js';
import { sensitivityCommand } from './sensitivityCommand.js';
import { reportCommand } from './reportCommand.js';
import { batchCommand } from './batchCommand.js';
import { calibrateCommand } from './calibrateCommand.js';

/** Every `arcsift` command, in the order `--help` lists them. */
export const commands: CommandModule<object, any>[] = [simulateCommand, fitCommand, compareCommand, verdictCommand, vetCommand, sensitivityCommand, batchCommand, calibrateCommand, reportCommand, demoCommand];
