import { describe, expect, it } from 'vitest';
import { formatPriors } from '../../src/cli/formatComparison.js';
import type { PriorDescription } from '../../src/priors/parameterSpace.js';

// The prior lines printed beside every Bayes factor: a held parameter is named with its
// component, since several components share parameter names (centerXArcsec of the lens, the
// lens light and the source).
const held = (name: string, value: number): PriorDescription => ({ name, kind: 'fixed' as PriorDescription['kind'], fixed: true, periodic: false, lower: null, upper: null, value });

describe('prior lines', () => {
  it('list held parameters under their components', () => {
    const lines = formatPriors([
      { name: 'lens.mass[0].einsteinRadiusArcsec', kind: 'uniform', fixed: false, periodic: false, lower: 1, upper: 1.3 },
      held('lens.mass[0].centerXArcsec', 0.02),
      held('lens.light[0].centerXArcsec', 0.02),
      held('source.light[0].centerXArcsec', 0.17),
      held('lens.mass[0].axisRatio', 0.8),
    ]);
    expect(lines).toEqual([
      '    lens.mass[0].einsteinRadiusArcsec: uniform [1, 1.3]',
      '    held fixed:',
      '      lens.mass[0]: centerXArcsec=0.02, axisRatio=0.8',
      '      lens.light[0]: centerXArcsec=0.02',
      '      source.light[0]: centerXArcsec=0.17',
    ]);
  });

  it('say none when every parameter is free', () => {
    expect(formatPriors([])).toEqual(['    held fixed: none']);
  });
});
