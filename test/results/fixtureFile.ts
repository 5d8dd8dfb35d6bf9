import { readFileSync } from 'node:fs';

/** Parsed JSON of a fixture in test/results/fixtures/ (each made by the script beside it). */
export function readResultsFixture<T>(name: string): T {
  return JSON.parse(readFileSync(new URL(`./fixtures/${name}`, import.meta.url), 'utf8')) as T;
}
