import { describe, expect, it } from 'vitest';
import { fileURLToPath } from 'node:url';
import { readFileSync } from 'node:fs';
import { parse } from 'yaml';
import { familySlug, inFamily, loadSimulationConfig, loadVerdictConfig, parseVerdictConfig } from '../../src/config/verdictConfig.js';
import { InputError } from '../../src/errors.js';
import { inputErrorOf } from '../support/inputErrorOf.js';

// arcsift's own contract for verdict configs (README, "The robust verdict"): a base config and
// smoothFamilies, each replacing named parts of the base; every mistake names the file and the
// key, inside the family that made it (common practice of config validation).
const fixture = fileURLToPath(new URL('../fixtures/verdict/multipole-lens.yaml', import.meta.url));
const raw = (): any => parse(readFileSync(fixture, 'utf8'));
const messageOf = (data: unknown): string => inputErrorOf(() => parseVerdictConfig(data, 'families.yaml')).message;

describe('verdict configs', () => {
  it('read the base and each family, replacing only the parts a family gives', () => {
    const { base, families } = loadVerdictConfig(fixture);
    expect(base.multipoles.map((m) => m.order)).toEqual([3, 4]);
    expect(families.map((f) => [f.name, f.key, f.slug, f.replaces])).toEqual([
      ['isothermal ellipsoid', 'smoothFamilies[0]', 'isothermal-ellipsoid', ['lens.multipoles']],
      ['isothermal ellipsoid + m = 3, 4 multipoles', 'smoothFamilies[1]', 'isothermal-ellipsoid-m-3-4-multipoles', []],
    ]);
    expect(families[0].config.multipoles).toEqual([]);
    expect(families[0].config.lensMass).toEqual(base.lensMass);
    expect(families[0].config.perturbers).toEqual(base.perturbers);
    expect(families[1].config).toEqual(base);
  });

  it('replace shear, mass and source light, and remove the shear with `none`', () => {
    const data = raw();
    data.lens.shear = { shearStrength: { value: 0.03, prior: { uniform: [0, 0.1] } }, shearAngleDeg: 20 };
    data.smoothFamilies = [
      { name: 'no shear', lens: { shear: 'none' } },
      { name: 'power law', lens: { mass: [{ kind: 'powerLawEllipsoid', einsteinRadiusArcsec: 1.1, slope: { value: 2, prior: { uniform: [1.6, 2.4] } }, axisRatio: 0.8, positionAngleDeg: 40, centerXArcsec: 0, centerYArcsec: 0 }] } },
      { name: 'shapelets', source: { light: [{ kind: 'shapelets', order: 4, centerXArcsec: 0.1, centerYArcsec: 0.1, scaleArcsec: 0.1 }] } },
    ];
    const { base, families } = parseVerdictConfig(data, 'families.yaml');
    expect(base.shear).toBeDefined();
    expect(families[0].config.shear).toBeUndefined();
    expect(families[0].replaces).toEqual(['lens.shear']);
    expect(families[1].config.lensMass.map((m) => m.kind)).toEqual(['powerLawEllipsoid']);
    expect(families[1].config.shear).toEqual(base.shear);
    expect(families[1].config.multipoles).toEqual(base.multipoles);
    expect(families[2].config.sourceLight.map((c) => [c.kind, c.key])).toEqual([['shapelets', 'source.light[0]']]);
    expect(families[2].config.lensMass).toEqual(base.lensMass);
  });

  it('name the family\'s key for a mistake inside a part it replaced', () => {
    const data = raw();
    data.smoothFamilies[0].lens.multipoles = [{ order: 4, multipoleStrength: 'strong', multipoleAngleDeg: 0 }];
    expect(messageOf(data)).toMatch(/^families\.yaml, key smoothFamilies\[0\]\.lens\.multipoles\[0\]\.multipoleStrength: .*found "strong" \(smooth-model family "isothermal ellipsoid"\)$/);
  });

  it('refuse unknown keys of a family, a missing name, shared folder names, and no families', () => {
    const lensLight = raw();
    lensLight.smoothFamilies[0].lens.light = [];
    expect(messageOf(lensLight)).toMatch(/^families\.yaml, key smoothFamilies\[0\]\.lens\.light: unknown key \(known here: mass, multipoles, shear\)/);
    const extra = raw();
    extra.smoothFamilies[1].perturbers = [];
    expect(messageOf(extra)).toMatch(/^families\.yaml, key smoothFamilies\[1\]\.perturbers: unknown key/);
    const unnamed = raw();
    delete unnamed.smoothFamilies[1].name;
    expect(messageOf(unnamed)).toMatch(/^families\.yaml, key smoothFamilies\[1\]\.name: expected a string, found nothing/);
    const clash = raw();
    clash.smoothFamilies[1].name = 'Isothermal  ellipsoid!';
    expect(messageOf(clash)).toMatch(/^families\.yaml, key smoothFamilies\[1\]\.name: two families share the folder name "isothermal-ellipsoid" \(smoothFamilies\[0\] and smoothFamilies\[1\]\)/);
    const none = raw();
    delete none.smoothFamilies;
    expect(messageOf(none)).toMatch(/^families\.yaml, key smoothFamilies: a verdict config needs smoothFamilies/);
    const empty = raw();
    empty.smoothFamilies = [];
    expect(messageOf(empty)).toMatch(/^families\.yaml, key smoothFamilies: expected at least one smooth-model family, found a list of 0/);
    const smooth = raw();
    delete smooth.perturbers;
    expect(messageOf(smooth)).toMatch(/^families\.yaml, key perturbers: a verdict weighs a perturber in every family/);
  });

  it('leave errors in the base\'s parts, and other errors, as they are', () => {
    const family = { name: 'f', key: 'smoothFamilies[2]', replaces: ['lens.multipoles'] as const };
    const base = new InputError('bad', { file: 'x.yaml', key: 'lens.mass[0].axisRatio' });
    expect(inFamily(base, family)).toBe(base);
    const fault = new RangeError('internal');
    expect(inFamily(fault, family)).toBe(fault);
    expect((inFamily(new InputError('bad', { file: 'x.yaml', key: 'lens.multipoles' }), family) as InputError).place.key).toBe('smoothFamilies[2].lens.multipoles');
    expect((inFamily(new InputError('bad', { file: 'x.yaml', key: 'lens.multipolesX' }), family) as InputError).place.key).toBe('lens.multipolesX');
  });

  it('make folder names from family names and let simulate read the base', () => {
    expect(familySlug('Power law + m = 1, 3, 4 multipoles')).toBe('power-law-m-1-3-4-multipoles');
    expect(familySlug('  SIE  ')).toBe('sie');
    expect(loadSimulationConfig(fixture)).toEqual(loadVerdictConfig(fixture).base);
  });
});
