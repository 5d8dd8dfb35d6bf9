import { readFileSync } from 'node:fs';

let cached: string | undefined;

/** The version in arcsift's package.json (read once). */
export function packageVersion(): string {
  if (cached === undefined) {
    const text = readFileSync(new URL('../../package.json', import.meta.url), 'utf8');
    cached = (JSON.parse(text) as { version: string }).version;
  }
  return cached;
}
