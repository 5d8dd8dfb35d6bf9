import { join } from 'node:path';
import { writeFileAtomic } from '../io/writeFileAtomic.js';
import { packageVersion } from '../model/packageVersion.js';
import { readRunFolder } from './readRunFolder.js';
import { writeReportFigures } from './reportFigures.js';
import { reportPage } from './reportPage.js';

/** Default page of a run folder: report.html inside it. */
export const REPORT_FILE = 'report.html';
/** Folder of the figure files, inside the run folder. */
export const FIGURES_FOLDER = 'figures';

/**
 * Writes the report of a comparison run folder (from `arcsift compare`): one self-contained HTML
 * page (default `runFolder/report.html`) and its figures as SVG and PNG files in
 * `runFolder/figures/`. A missing or malformed summary.json throws an InputError naming it.
 * Returns the page's path.
 */
export function writeReport(runFolder: string, outFile?: string): string {
  const run = readRunFolder(runFolder);
  const pageFile = outFile ?? join(runFolder, REPORT_FILE);
  const { figures, notices } = writeReportFigures(run, join(runFolder, FIGURES_FOLDER));
  const html = reportPage({ run, figures, notices, pageFile, arcsiftVersion: packageVersion() });
  writeFileAtomic(pageFile, html);
  return pageFile;
}
