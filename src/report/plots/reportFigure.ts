import { join } from 'node:path';
import { writeFileAtomic } from '../../io/writeFileAtomic.js';

/** One figure of the report: its inline SVG and the files written for it. */
export interface ReportFigure {
  /** File stem in the figures folder, e.g. `perturbed-residual`. */
  readonly key: string;
  readonly section: 'images' | 'perturber-posterior' | 'posterior' | 'diagnostics';
  readonly title: string;
  /** HTML. */
  readonly caption: string;
  readonly svg: string;
  /** Absolute or working-directory-relative paths of the SVG (and PNG) written. */
  readonly files: readonly string[];
}

export function writeSvgFigure(
  folder: string, file: string, key: string, figure: Omit<ReportFigure, 'files' | 'key'>, png?: Buffer,
): ReportFigure {
  const svgFile = join(folder, `${file}.svg`);
  writeFileAtomic(svgFile, `${figure.svg}\n`);
  const files = [svgFile];
  if (png !== undefined) {
    const pngFile = join(folder, `${file}.png`);
    writeFileAtomic(pngFile, png);
    files.push(pngFile);
  }
  return { ...figure, key, svg: uniqueIds(figure.svg, key), files };
}

/** Inline SVGs share one page: prefix every id (image panels name their clip path) so two figures never clash. */
function uniqueIds(svg: string, key: string): string {
  return svg.replace(/\bid="([^"]+)"/g, `id="${key}-$1"`).replace(/url\(#([^)]+)\)/g, `url(#${key}-$1)`);
}
