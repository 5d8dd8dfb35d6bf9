// An adaptive mesh's bright share needs bright pixels: arcsift's own input contract (common
// practice: a setting that cannot act on these data is refused with the file and key named,
// rather than quietly ignored).
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { parse } from 'yaml';
import { describe, expect, it } from 'vitest';
import { parseConfig } from '../../src/config/arcsiftConfig.js';
import type { ObservedData } from '../../src/data/observedData.js';
import { InputError } from '../../src/errors.js';
import { checkBrightShare } from '../../src/likelihood/pixelLikelihood.js';

const path = fileURLToPath(new URL('../../configs/demo-pixelated.yaml', import.meta.url));

/** The demo config with the pixelated source's mesh replaced. */
function configWithMesh(mesh: Record<string, unknown>): ReturnType<typeof parseConfig> {
  const raw = parse(readFileSync(path, 'utf8'));
  raw.source.light.find((c: { kind: string }) => c.kind === 'pixelated').mesh = mesh;
  return parseConfig(raw, 'pixelated.yaml');
}

/** Three used pixels of data 1, 5 and 20 with noise 1 (only the fields the check reads). */
const data = {
  image: Float64Array.of(1, 5, 20, 100),
  noise: Float64Array.of(1, 1, 1, 1),
  usedPixels: Int32Array.of(0, 1, 2),
} as unknown as ObservedData;

describe('the bright share of an adaptive mesh', () => {
  it('accepts data with a pixel above the ratio, and any mesh without a share', () => {
    expect(() => checkBrightShare(configWithMesh({ kind: 'adaptive', cells: 600, brightShare: 0.9 }), data)).not.toThrow();
    expect(() => checkBrightShare(configWithMesh({ kind: 'adaptive', cells: 600, brightShare: 0.9, brightSignalToNoise: 19 }), data)).not.toThrow();
    expect(() => checkBrightShare(configWithMesh({ kind: 'adaptive', cells: 600, brightSignalToNoise: 1e9 }), data)).not.toThrow();
  });

  it('refuses a share with no used pixel above the ratio, naming the file and key (the unused pixel 3 does not count)', () => {
    const config = configWithMesh({ kind: 'adaptive', cells: 600, brightShare: 0.9, brightSignalToNoise: 20 });
    expect(() => checkBrightShare(config, data)).toThrow(InputError);
    expect(() => checkBrightShare(config, data)).toThrow(
      /^pixelated\.yaml, key source\.light\[5\]\.mesh\.brightSignalToNoise: no used pixel's data exceed 20 times their noise/,
    );
  });
});
