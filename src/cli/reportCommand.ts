import type { CommandModule } from 'yargs';
import { join } from 'node:path';
import { FIGURES_FOLDER, writeReport } from '../report/writeReport.js';

interface ReportArguments {
  run: string;
  out?: string;
}

export const reportCommand: CommandModule<object, ReportArguments> = {
  command: 'report <run>',
  describe: 'Write a self-contained HTML report (with SVG and PNG figures) of a run folder of compare, fit, vet, verdict or sensitivity',
  builder: (y) => y
    .positional('run', { type: 'string', demandOption: true, describe: 'folder written by `arcsift compare` or `fit` (summary.json), `vet` (vet.json), `verdict` (verdict.json) or `sensitivity` (sensitivity.json)' })
    .option('out', { type: 'string', describe: 'HTML file to write [default: <run>/report.html]' })
    .example('$0 report chains/mock-compare', 'write chains/mock-compare/report.html and chains/mock-compare/figures/'),
  handler: (args) => {
    const page = writeReport(args.run, args.out);
    process.stdout.write(`wrote ${page} (figures in ${join(args.run, FIGURES_FOLDER)})\n`);
  },
};
