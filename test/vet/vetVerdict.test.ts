// Tests of src/vet/vetVerdict.ts: a flag's verdict from ln B and the shared smooth fit's misfit
// alarm (arcsift's own rule, README: a misfit smooth model makes no ln B evidence of a subhalo).
import { describe, expect, it } from 'vitest';
import { defaultVetThresholds, vetVerdict } from '../../src/vet/vetVerdict.js';

describe('the verdict of a vetted flag', () => {
  it('confirms only above the detection threshold, by default the published 50 (Ritondale et al. 2019: 10 sigma)', () => {
    const t = defaultVetThresholds();
    expect(t).toEqual({ confirmAboveLnB: 50, disfavourBelowLnB: -1 });
    expect(vetVerdict(50.5, t)).toBe('confirmed');
    expect(vetVerdict(50, t)).toBe('inconclusive');
    expect(vetVerdict(13.5, t)).toBe('inconclusive');
    expect(vetVerdict(-1.5, t)).toBe('disfavoured');
  });

  it('is not-evidence for every ln B when the smooth fit fails the misfit alarm', () => {
    const t = defaultVetThresholds();
    for (const lnB of [-5, 0, 20, 500]) expect(vetVerdict(lnB, t, true)).toBe('not-evidence');
    expect(vetVerdict(500, t, false)).toBe('confirmed');
  });
});
