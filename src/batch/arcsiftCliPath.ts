import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

/**
 * The built command line, dist/cli/main.js, that batch rows and Slurm tasks run with node: beside
 * this module when it runs from dist/, the package's dist/ when it runs from source (tests).
 */
export function arcsiftCliPath(): string {
  const sibling = fileURLToPath(new URL('../cli/main.js', import.meta.url));
  if (existsSync(sibling)) return sibling;
  return fileURLToPath(new URL('../../dist/cli/main.js', import.meta.url));
}
