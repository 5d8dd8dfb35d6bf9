import { readFileSync } from 'node:fs';
import { InputError, expectedFound } from '../errors.js';
import type { SourceFile } from './sourceFile.js';

/** Reads source.json and checks its shape (a damaged file is an InputError naming the key). */
export function readSourceFile(file: string): SourceFile {
  let data: unknown;
  try {
    data = JSON.parse(readFileSync(file, 'utf8'));
  } catch (error) {
    throw new InputError(`cannot read the source reconstruction (${(error as Error).message})`, { file });
  }
  const record = data as Record<string, unknown>;
  const numbers = (key: string): number[] => {
    const v = record?.[key];
    if (!Array.isArray(v) || !v.every((x) => typeof x === 'number')) throw new InputError(expectedFound('a list of numbers', v), { file, key });
    return v as number[];
  };
  const mesh = record?.mesh;
  if (mesh !== 'regular' && mesh !== 'adaptive') throw new InputError(expectedFound('"regular" or "adaptive"', mesh), { file, key: 'mesh' });
  const cellXArcsec = numbers('cellXArcsec');
  const cellYArcsec = numbers('cellYArcsec');
  const values = numbers('values');
  const standardDeviations = numbers('standardDeviations');
  for (const [key, list] of [['cellYArcsec', cellYArcsec], ['values', values], ['standardDeviations', standardDeviations]] as const) {
    if (list.length !== cellXArcsec.length) throw new InputError(expectedFound(`${cellXArcsec.length} values`, list), { file, key });
  }
  const triangles = mesh === 'adaptive' ? numbers('triangles') : null;
  const side = mesh === 'regular' ? record.side : null;
  if (mesh === 'regular' && !(typeof side === 'number' && side * side === cellXArcsec.length)) {
    throw new InputError(expectedFound(`the side of a ${cellXArcsec.length}-cell square grid`, side), { file, key: 'side' });
  }
  const bright = record.brightCells as Record<string, unknown> | undefined;
  if (bright !== undefined && !(typeof bright?.count === 'number' && typeof bright?.signalToNoise === 'number')) {
    throw new InputError(expectedFound('{ count, signalToNoise }', bright), { file, key: 'brightCells' });
  }
  return {
    ...(bright === undefined ? {} : { brightCells: { count: bright.count as number, signalToNoise: bright.signalToNoise as number } }),
    mesh, regularisation: String(record.regularisation ?? ''), cellXArcsec, cellYArcsec, values, standardDeviations,
    triangles, side: side as number | null, raysOutside: typeof record.raysOutside === 'number' ? record.raysOutside : 0,
  };
}
