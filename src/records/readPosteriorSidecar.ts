import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { InputError, expectedFound } from '../errors.js';
import { POSTERIOR_FORMAT, POSTERIOR_FORMAT_VERSION, POSTERIOR_SIDECAR, type PosteriorSidecar } from './posteriorTables.js';

/** posterior.json of `folder` (format of writePosteriorTables), or null when there is none. */
export function readPosteriorSidecar(folder: string): PosteriorSidecar | null {
  const file = join(folder, POSTERIOR_SIDECAR);
  if (!existsSync(file)) return null;
  let parsed: Partial<PosteriorSidecar>;
  try {
    parsed = JSON.parse(readFileSync(file, 'utf8')) as Partial<PosteriorSidecar>;
  } catch (error) {
    throw new InputError(`cannot read the posterior tables' description: ${(error as Error).message}`, { file });
  }
  if (parsed?.format !== POSTERIOR_FORMAT || parsed.version !== POSTERIOR_FORMAT_VERSION) {
    throw new InputError(expectedFound(`"${POSTERIOR_FORMAT}" version ${POSTERIOR_FORMAT_VERSION}`, `${String(parsed?.format)} version ${String(parsed?.version)}`), { file, key: 'format' });
  }
  if (!Array.isArray(parsed.parameters) || !Array.isArray(parsed.tables)) {
    throw new InputError(expectedFound('lists of parameters and tables', parsed.parameters), { file, key: 'parameters' });
  }
  return parsed as PosteriorSidecar;
}
