import { ConfigNode } from './configNode.js';
import { readConfigFile } from './readConfigFile.js';
import { parseConfig, type ArcsiftConfig } from './arcsiftConfig.js';
import { InputError, expectedFound } from '../errors.js';

/** The config key listing the smooth-model families of a verdict. */
export const FAMILIES_KEY = 'smoothFamilies';

/** The parts of the base config a family may replace, as dotted config keys. */
export type ReplacedPart = 'lens.mass' | 'lens.shear' | 'lens.multipoles' | 'source.light';

/** One smooth-model family: the base config with some of its lens-mass and source parts replaced. */
export interface SmoothFamily {
  /** The name the config gives it (unique). */
  readonly name: string;
  /** Its key in the config, e.g. `smoothFamilies[2]`. */
  readonly key: string;
  /** A folder name made from the name (lower case, runs of other characters as `-`), unique. */
  readonly slug: string;
  /** The parts it replaces; the rest is the base config's. */
  readonly replaces: readonly ReplacedPart[];
  /** The whole config of the family (its perturbers, observation, lens light from the base). */
  readonly config: ArcsiftConfig;
}

/** A verdict config: a complete base config (with its perturbers) and the families to weigh it under. */
export interface VerdictConfig {
  readonly base: ArcsiftConfig;
  readonly families: readonly SmoothFamily[];
}

/** A family's folder name: its name in lower case, every run of other characters than a-z and 0-9 made one `-`. */
export function familySlug(name: string): string {
  return name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '');
}

const PARTS: readonly { readonly section: 'lens' | 'source'; readonly name: string; readonly part: ReplacedPart }[] = [
  { section: 'lens', name: 'mass', part: 'lens.mass' },
  { section: 'lens', name: 'shear', part: 'lens.shear' },
  { section: 'lens', name: 'multipoles', part: 'lens.multipoles' },
  { section: 'source', name: 'light', part: 'source.light' },
];

/**
 * Where an InputError about a family's config really is: a key inside a part the family replaced
 * is moved under the family's own key (lens.multipoles[0].order -> smoothFamilies[1].lens.multipoles[0].order),
 * and the message names the family. Other errors (in the base's parts) are returned as they are.
 */
export function inFamily(error: unknown, family: Pick<SmoothFamily, 'name' | 'key' | 'replaces'>): unknown {
  if (!(error instanceof InputError)) return error;
  const key = error.place.key;
  const replaced = key === undefined ? undefined : family.replaces.find((part) => key === part || key.startsWith(`${part}[`) || key.startsWith(`${part}.`));
  if (replaced === undefined || key === undefined) return error;
  return new InputError(`${error.bareMessage} (smooth-model family "${family.name}")`, { ...error.place, key: `${family.key}.${key}` });
}

/** Reads one family's mapping: its name and the parts it replaces (raw values, validated later by parseConfig). */
function readFamily(node: ConfigNode): { name: string; parts: Map<ReplacedPart, unknown> } {
  if (!node.isMapping()) node.fail(expectedFound('a mapping with name and lens and/or source', node.value));
  const nameNode = node.get('name');
  const name = nameNode.string().trim();
  if (name === '' || familySlug(name) === '') nameNode.fail(expectedFound('a name with at least one letter or digit', nameNode.value));
  const parts = new Map<ReplacedPart, unknown>();
  for (const section of ['lens', 'source'] as const) {
    const sectionNode = node.get(section);
    if (sectionNode.value === undefined) continue;
    if (!sectionNode.isMapping()) sectionNode.fail(expectedFound(section === 'lens' ? 'a mapping of mass, shear and/or multipoles' : 'a mapping with light', sectionNode.value));
    for (const { name: partName, part } of PARTS.filter((p) => p.section === section)) {
      const child = sectionNode.get(partName);
      if (child.value !== undefined) parts.set(part, child.value);
    }
    sectionNode.finish();
  }
  node.finish();
  return { name, parts };
}

/**
 * A verdict config (YAML or JSON): a complete config, whose lens, source and perturbers are the
 * base, and under `smoothFamilies` a list of families, each `{ name, lens: { mass, shear,
 * multipoles }, source: { light } }`. Each part a family gives replaces the base's part of the same
 * key (`shear: none` removes the shear, `multipoles: []` the multipoles); a family that gives
 * nothing is the base itself. Lens light, observation, redshifts and perturbers always come from
 * the base. Every family is validated as a whole config; a mistake inside a part it replaced
 * names the family's key (e.g. `smoothFamilies[1].lens.multipoles[0].order`).
 */
export function parseVerdictConfig(data: unknown, file: string): VerdictConfig {
  const root = new ConfigNode(data, file, '');
  if (!root.isMapping()) root.fail(expectedFound('a mapping at the top of the config', data));
  const familiesNode = root.get(FAMILIES_KEY);
  if (familiesNode.value === undefined) {
    root.fail(`a verdict config needs ${FAMILIES_KEY}: a list of smooth-model families, each { name, lens: { mass, shear, multipoles }, source: { light } } replacing the base config's parts`, FAMILIES_KEY);
  }
  const familyNodes = familiesNode.list();
  if (familyNodes.length === 0) familiesNode.fail(expectedFound('at least one smooth-model family', familiesNode.value));
  const raw = data as Record<string, unknown>;
  const { [FAMILIES_KEY]: _families, ...baseData } = raw;
  const base = parseConfig(baseData, file);
  if (base.perturbers.length === 0) throw new InputError('a verdict weighs a perturber in every family: expected at least one perturber under perturbers, found none', { file, key: 'perturbers' });
  const seen = new Map<string, string>();
  const families = familyNodes.map((node, k): SmoothFamily => {
    const { name, parts } = readFamily(node);
    const key = `${FAMILIES_KEY}[${k}]`;
    const slug = familySlug(name);
    const clash = seen.get(slug);
    if (clash !== undefined) node.get('name').fail(`two families share the folder name "${slug}" (${clash} and ${key}): expected distinct names`);
    seen.set(slug, key);
    const lens = { ...(baseData.lens as Record<string, unknown>) };
    const source = { ...(baseData.source as Record<string, unknown>) };
    for (const [part, value] of parts) {
      const [section, name_] = part.split('.') as ['lens' | 'source', string];
      const target = section === 'lens' ? lens : source;
      if (part === 'lens.shear' && value === 'none') delete target[name_];
      else target[name_] = value;
    }
    const replaces = PARTS.map((p) => p.part).filter((p) => parts.has(p));
    let config: ArcsiftConfig;
    try {
      config = parseConfig({ ...baseData, lens, source }, file);
    } catch (error) {
      throw inFamily(error, { name, key, replaces });
    }
    return { name, key, slug, replaces, config };
  });
  return { base, families };
}

/** Reads and validates a verdict config file (see parseVerdictConfig). */
export function loadVerdictConfig(path: string): VerdictConfig {
  return parseVerdictConfig(readConfigFile(path), path);
}

/**
 * A config for `simulate`: a plain config, or a verdict config's base (its `smoothFamilies` are
 * for fits; the base's values are the truth).
 */
export function loadSimulationConfig(path: string): ArcsiftConfig {
  const data = readConfigFile(path);
  const isVerdict = typeof data === 'object' && data !== null && !Array.isArray(data) && Object.prototype.hasOwnProperty.call(data, FAMILIES_KEY);
  return isVerdict ? parseVerdictConfig(data, path).base : parseConfig(data, path);
}
