import { fileURLToPath } from 'node:url';
import { parseConfig, type ArcsiftConfig } from '../config/arcsiftConfig.js';
import { readConfigFile } from '../config/readConfigFile.js';

/** configs/demo-pixelated.yaml, the scene of the pixelated-source benchmarks. */
export const PIXELATED_DEMO_CONFIG = fileURLToPath(new URL('../../configs/demo-pixelated.yaml', import.meta.url));

/** The source components of a config file as read, before parsing. */
export type SourceLight = Record<string, unknown>[];

/**
 * configs/demo-pixelated.yaml parsed after `edit` returned its source components changed (the
 * same list edited in place, or a new one): each benchmark fits the demo's mock with a source
 * of its own.
 */
export function pixelatedDemoConfig(edit: (light: SourceLight) => SourceLight): ArcsiftConfig {
  const data = readConfigFile(PIXELATED_DEMO_CONFIG) as { source: { light: SourceLight } };
  data.source.light = edit(data.source.light);
  return parseConfig(data, PIXELATED_DEMO_CONFIG);
}
