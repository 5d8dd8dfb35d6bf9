// Tests of src/settings/runDefaults.ts: one frozen object of run defaults, overrides validated.
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { runDefaults, settleRunSettings } from '../../src/settings/runDefaults.js';

describe('run defaults', () => {
  it('hold the published robust-detection threshold, ln B = 50 (Ritondale et al. 2019, MNRAS 485, 2179: 10 sigma)', () => {
    expect(runDefaults.detection.lnBayesFactorThreshold).toBe(50);
  });

  it('are frozen at every depth', () => {
    expect(Object.isFrozen(runDefaults)).toBe(true);
    for (const section of Object.values(runDefaults)) expect(Object.isFrozen(section)).toBe(true);
    expect(() => { (runDefaults.nested as { livePoints: number }).livePoints = 3; }).toThrow(TypeError);
  });

  it('take valid overrides section by section, leaving the rest at their defaults', () => {
    const settled = settleRunSettings({ nested: { livePoints: 80, method: 'slice' }, detection: { lnBayesFactorThreshold: 5 } });
    expect(settled.nested.livePoints).toBe(80);
    expect(settled.nested.method).toBe('slice');
    expect(settled.nested.replacementsPerStep).toBe(runDefaults.nested.replacementsPerStep);
    expect(settled.detection.lnBayesFactorThreshold).toBe(5);
    expect(settled.vet).toEqual(runDefaults.vet);
    expect(settled.demo).toEqual(runDefaults.demo);
    expect(Object.isFrozen(settled.nested)).toBe(true);
  });

  it('refuse a bad or unknown setting with an InputError naming it', () => {
    expect(() => settleRunSettings({ nested: { livePoints: 1.5 } })).toThrow(/key nested.livePoints: expected a whole number >= 2, found 1.5/);
    expect(() => settleRunSettings({ nested: { lnZTolerance: 0 } })).toThrow(/key nested.lnZTolerance: expected a number > 0/);
    expect(() => settleRunSettings({ nested: { method: 'guess' as 'slice' } })).toThrow(/expected one of auto, ellipsoids, slice/);
    expect(() => settleRunSettings({ vet: { windowArcsec: Number.NaN } })).toThrow(InputError);
    expect(() => settleRunSettings({ nested: { livePionts: 100 } as never })).toThrow(/key nested.livePionts: no such setting/);
    expect(() => settleRunSettings({ detection: { lnBayesFactorThreshold: Number.POSITIVE_INFINITY } })).toThrow(/key detection.lnBayesFactorThreshold: expected a finite number/);
  });
});
