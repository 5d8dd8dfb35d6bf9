import { readFileSync } from 'node:fs';
import { InputError, describeValue } from '../errors.js';
import { ImagePlaneSky } from '../data/imagePlaneSky.js';
import { columnToXArcsec, imageHalfExtentArcsec, rowToYArcsec, type FlagCandidate, type FlagGrid } from './flagCandidate.js';

/**
 * arcsift's flag list, a CSV file of one candidate per line:
 *
 *     # lines starting with '#' and blank lines are skipped
 *     x,y,score,id
 *     0.90,0.62,0.97,north-knot
 *     -1.10,0.25,0.61,west
 *
 * The first other line is the header; columns may come in any order:
 * - `x`, `y`: position in arcsec, arcsift's convention (origin at the image centre, x with the
 *   column, y with the row); or `column`, `row`: pixel indices counted from 0 (fractions allowed,
 *   pixel (i, j) centred at x = (i - (columns - 1) / 2) * pixelScale); or `ra`, `dec`: sky
 *   coordinates in degrees, in the frame of the image's celestial WCS (which it must have).
 *   Exactly one of the pairs.
 * - `coordinates` (optional, with `x`, `y` only): `arcsec` (the default) or `pixel` on each line,
 *   saying which the line's x, y are.
 * - `score` (optional): the network's score, a number; an empty cell means none.
 * - `id` (optional): a name, unique in the file; default the candidate's number (1, 2, ...).
 * Cells are separated by commas and trimmed; there is no quoting.
 */
export const FLAG_LIST_COLUMNS = ['x', 'y', 'column', 'row', 'ra', 'dec', 'coordinates', 'score', 'id'] as const;

function numberCell(text: string, file: string, line: number, column: string): number {
  const value = text === '' ? Number.NaN : Number(text);
  if (!Number.isFinite(value)) {
    throw new InputError(`line ${line}, column ${column}: expected a finite number, found ${describeValue(text)}`, { file });
  }
  return value;
}

/** Reads a flag list (format above) and places every candidate on the image `grid`; InputError names the file and line. */
export function readFlagList(file: string, grid: FlagGrid): FlagCandidate[] {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (error) {
    throw new InputError(`cannot read the flag list: ${(error as Error).message}`, { file });
  }
  if (text.includes('\u0000')) {
    throw new InputError('not a flag list: the file holds binary bytes (NUL); expected a text CSV list (x,y or column,row or ra,dec), a FITS map or an NPY map', { file });
  }
  const lines = text.split(/\r?\n/).map((content, k) => ({ content: content.trim(), line: k + 1 }))
    .filter(({ content }) => content !== '' && !content.startsWith('#'));
  if (lines.length === 0) {
    throw new InputError('empty flag list: expected a header line (e.g. x,y,score,id) and at least one candidate, found nothing', { file });
  }
  const header = lines[0].content.split(',').map((cell) => cell.trim());
  const headerLine = lines[0].line;
  const at = new Map<string, number>();
  header.forEach((name, k) => {
    if (!(FLAG_LIST_COLUMNS as readonly string[]).includes(name)) {
      throw new InputError(`line ${headerLine} (header): unknown column ${describeValue(name)}; expected columns among ${FLAG_LIST_COLUMNS.join(', ')}`, { file });
    }
    if (at.has(name)) throw new InputError(`line ${headerLine} (header): column ${name} appears twice`, { file });
    at.set(name, k);
  });
  const pairs = [['x', 'y'], ['column', 'row'], ['ra', 'dec']].filter(([a, b]) => at.has(a) || at.has(b));
  if (pairs.length !== 1 || !(at.has(pairs[0][0]) && at.has(pairs[0][1]))) {
    throw new InputError(
      `line ${headerLine} (header): expected the columns x,y (arcsec), column,row (pixels) or ra,dec (degrees), one pair only, found ${header.join(',')}`, { file },
    );
  }
  const [first, second] = pairs[0];
  const pixelPair = first === 'column';
  const skyPair = first === 'ra';
  if (first !== 'x' && at.has('coordinates')) {
    throw new InputError(`line ${headerLine} (header): the coordinates column goes with x,y, not with ${first},${second}`, { file });
  }
  const sky = skyPair ? ImagePlaneSky.of(grid) : undefined;
  if (skyPair && sky === undefined) {
    throw new InputError(
      `line ${headerLine} (header): flags in ra,dec need the image's celestial WCS (CTYPE1 = RA---TAN, CTYPE2 = DEC--TAN in its header), found none; give x,y or column,row`,
      { file },
    );
  }
  if (lines.length === 1) {
    throw new InputError(`empty flag list: expected at least one candidate after the header on line ${headerLine}, found none`, { file });
  }
  const { halfWidth, halfHeight } = imageHalfExtentArcsec(grid);
  const seen = new Set<string>();
  return lines.slice(1).map(({ content, line }, k) => {
    const cells = content.split(',').map((cell) => cell.trim());
    if (cells.length !== header.length) {
      throw new InputError(`line ${line}: expected ${header.length} cells as in the header (${header.join(',')}), found ${cells.length}`, { file });
    }
    const cell = (name: string): string | undefined => (at.has(name) ? cells[at.get(name) as number] : undefined);
    let units: 'arcsec' | 'pixel' = pixelPair ? 'pixel' : 'arcsec';
    const stated = cell('coordinates');
    if (stated !== undefined) {
      if (stated !== 'arcsec' && stated !== 'pixel') {
        throw new InputError(`line ${line}, column coordinates: expected arcsec or pixel, found ${describeValue(stated)}`, { file });
      }
      units = stated;
    }
    const a = numberCell(cell(first) as string, file, line, first);
    const b = numberCell(cell(second) as string, file, line, second);
    const onSky = sky?.positionOf(a, b);
    const xArcsec = onSky !== undefined ? onSky.xArcsec : units === 'pixel' ? columnToXArcsec(a, grid) : a;
    const yArcsec = onSky !== undefined ? onSky.yArcsec : units === 'pixel' ? rowToYArcsec(b, grid) : b;
    if (!(Math.abs(xArcsec) <= halfWidth && Math.abs(yArcsec) <= halfHeight)) {
      const given = onSky !== undefined
        ? `RA ${a}, Dec ${b} (x = ${xArcsec.toFixed(3)}", y = ${yArcsec.toFixed(3)}")`
        : units === 'pixel' ? `column ${a}, row ${b} (x = ${xArcsec.toFixed(3)}", y = ${yArcsec.toFixed(3)}")` : `x = ${a}", y = ${b}"`;
      throw new InputError(
        `line ${line}: flag outside the image: expected |x| <= ${halfWidth}" and |y| <= ${halfHeight}" ` +
          `(columns -0.5 to ${grid.columns - 0.5}, rows -0.5 to ${grid.rows - 0.5}), found ${given}`,
        { file },
      );
    }
    const scoreText = cell('score');
    const score = scoreText === undefined || scoreText === '' ? undefined : numberCell(scoreText, file, line, 'score');
    const id = cell('id') || String(k + 1);
    if (seen.has(id)) throw new InputError(`line ${line}, column id: expected ids to be unique, found ${describeValue(id)} a second time`, { file });
    seen.add(id);
    return { id, xArcsec, yArcsec, score, origin: `${file} line ${line}` };
  });
}
