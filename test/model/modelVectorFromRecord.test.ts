import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config/arcsiftConfig.js';
import { InputError } from '../../src/errors.js';
import { buildLensSystem } from '../../src/model/lensSystem.js';
import { modelVectorFromRecord } from '../../src/model/modelVectorFromRecord.js';

// A run's bestFit record (parameter name -> value) back onto the model vector, by name
// (common practice: the record's key order is not trusted).
const config = loadConfig(fileURLToPath(new URL('../../configs/demo.yaml', import.meta.url)));

describe('modelVectorFromRecord', () => {
  it('puts each named value at its parameter index, whatever the record order', () => {
    const system = buildLensSystem(config);
    const names = system.parameters.map((p) => p.name);
    const record = Object.fromEntries([...names].reverse().map((name) => [name, names.indexOf(name) + 0.5]));
    expect(Array.from(modelVectorFromRecord(system, record, 'summary.json', 'bestFit'))).toEqual(names.map((_, k) => k + 0.5));
  });

  it('names the file and key of a missing or non-numeric value', () => {
    const system = buildLensSystem(config, { perturberCount: 0 });
    const record: Record<string, unknown> = Object.fromEntries(system.parameters.map((p) => [p.name, 1]));
    const name = system.parameters[2].name;
    record[name] = 'wide';
    expect(() => modelVectorFromRecord(system, record, 'run/summary.json', 'models.smooth.bestFit')).toThrow(InputError);
    expect(() => modelVectorFromRecord(system, record, 'run/summary.json', 'models.smooth.bestFit')).toThrow(`run/summary.json, key models.smooth.bestFit.${name}`);
    delete record[name];
    expect(() => modelVectorFromRecord(system, record, 'run/summary.json', 'models.smooth.bestFit')).toThrow(/found nothing/);
  });
});
