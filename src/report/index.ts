// The HTML report of a run folder: what the library offers (the figures and tables are internal).
export { FIGURES_FOLDER, REPORT_FILE, writeReport } from './writeReport.js';
export { readRunFolder, type RunFolder } from './runFolder/readRunFolder.js';
