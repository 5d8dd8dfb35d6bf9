import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../errors.js';
import { writeFileAtomic } from '../io/writeFileAtomic.js';
import { packageVersion } from '../io/packageVersion.js';
import { writeFitReport } from './pages/fitPage.js';
import { isMapping, readJson, readRunFolder } from './runFolder/readRunFolder.js';
import { writeReportFigures } from './pages/comparisonFigures.js';
import { reportPage } from './pages/comparisonPage.js';
import { writeSensitivityReport } from './pages/sensitivityPage.js';
import { writeVetReport } from './pages/vetPage.js';
import { writeVerdictReport } from './pages/verdictPage.js';
import { writeCalibrationReport } from './pages/calibrationPage.js';

/** Default page of a run folder: report.html inside it. */
export const REPORT_FILE = 'report.html';
/** Folder of the figure files, inside the run folder. */
export const FIGURES_FOLDER = 'figures';

/**
 * Writes the report of a run folder: one self-contained HTML page (default
 * `runFolder/report.html`) and its figures as SVG and PNG files in `runFolder/figures/`. The kind
 * of run is read from the folder: a comparison or a fit (summary.json), a vetting (vet.json), a
 * robust verdict (verdict.json, with each family's compare report), a sensitivity map
 * (sensitivity.json) or a calibration (calibration.json). A folder with none of them, or a
 * malformed one, throws an InputError naming the file. Returns the page's path.
 */
export function writeReport(runFolder: string, outFile?: string): string {
  const pageFile = outFile ?? join(runFolder, REPORT_FILE);
  const figuresFolder = join(runFolder, FIGURES_FOLDER);
  if (existsSync(join(runFolder, 'vet.json'))) return writeVetReport(runFolder, pageFile, figuresFolder);
  if (existsSync(join(runFolder, 'verdict.json'))) return writeVerdictReport(runFolder, pageFile, figuresFolder, (family) => writeReport(family));
  if (existsSync(join(runFolder, 'sensitivity.json'))) return writeSensitivityReport(runFolder, pageFile, figuresFolder);
  if (existsSync(join(runFolder, 'calibration.json'))) return writeCalibrationReport(runFolder, pageFile, figuresFolder);
  const summaryFile = join(runFolder, 'summary.json');
  if (!existsSync(summaryFile)) {
    throw new InputError(`file not found: a finished run folder holds summary.json (compare, fit), vet.json (vet), verdict.json (verdict), sensitivity.json (sensitivity) or calibration.json (calibrate), and ${runFolder} has none of them`, { file: summaryFile });
  }
  const json = readJson(summaryFile);
  if (isMapping(json) && (json as { kind?: unknown }).kind === 'fit') return writeFitReport(runFolder, pageFile, figuresFolder);
  const run = readRunFolder(runFolder);
  const { figures, notices } = writeReportFigures(run, figuresFolder);
  const html = reportPage({ run, figures, notices, pageFile, arcsiftVersion: packageVersion() });
  writeFileAtomic(pageFile, html);
  return pageFile;
}
