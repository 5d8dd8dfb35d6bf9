import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';

/** sha256 of the config file's bytes (or of its validated content when there is no file). */
export function configHash(config: ArcsiftConfig): string {
  let bytes: Buffer | string;
  try {
    bytes = readFileSync(config.file);
  } catch {
    bytes = JSON.stringify(config);
  }
  return createHash('sha256').update(bytes).digest('hex');
}
