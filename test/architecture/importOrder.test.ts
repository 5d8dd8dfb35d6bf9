// The layering DEVELOPERS.md documents, checked on the source tree: a module imports only from
// modules to its left in the data flow, the general-purpose ones import no lensing code, and no
// two files import each other in a circle. Own contract (DEVELOPERS.md, "Layout").
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, normalize, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const src = fileURLToPath(new URL('../../src/', import.meta.url));

/** The documented order, left to right (DEVELOPERS.md). A module may import its own folder and any earlier one. */
export const LAYERS = [
  'errors.ts', 'settings', 'numeric', 'io', 'fits', 'config', 'priors', 'results',
  'cosmology', 'lens', 'perturber', 'light', 'lensing', 'imaging', 'data', 'records',
  'model', 'forward', 'inversion', 'simulate', 'likelihood', 'sampling', 'parallel',
  'inference', 'vet', 'verdict', 'sensitivity', 'batch', 'calibration', 'report', 'cli', 'bench', 'index.ts',
];

/** Modules that serve any problem, not only lenses: they import nothing that knows about lensing. */
const GENERAL = ['settings', 'numeric', 'io', 'priors', 'sampling', 'results'];
const LENSING = ['lens', 'perturber', 'light', 'lensing', 'model', 'forward', 'simulate', 'likelihood', 'data', 'imaging', 'cosmology'];

function sourceFiles(folder: string): string[] {
  return readdirSync(folder).flatMap((name) => {
    const path = join(folder, name);
    if (statSync(path).isDirectory()) return sourceFiles(path);
    return name.endsWith('.ts') ? [path] : [];
  });
}

/** Relative module specifiers of a file's static imports and re-exports (`import type` included). */
function importsOf(file: string): string[] {
  const text = readFileSync(file, 'utf8');
  const found: string[] = [];
  for (const match of text.matchAll(/^(?:import|export)\b[^;]*?\bfrom\s+'(\.{1,2}\/[^']+)'/gms)) found.push(match[1]);
  return found;
}

/** The top-level entry of src/ a file belongs to: its folder, or the file itself at the top. */
function moduleOf(file: string): string {
  return relative(src, file).split(/[\\/]/)[0];
}

const files = sourceFiles(src);
const edges = files.map((file) => ({
  file,
  targets: importsOf(file).map((specifier) => normalize(join(dirname(file), specifier.replace(/\.js$/, '.ts')))),
}));

describe('the layering of src/', () => {
  it('places every top-level module of src/ in the documented order', () => {
    const present = [...new Set(files.map(moduleOf))].sort();
    expect(present.filter((module) => !LAYERS.includes(module))).toEqual([]);
  });

  it('has no import that runs against the order', () => {
    const against: string[] = [];
    for (const { file, targets } of edges) {
      const from = LAYERS.indexOf(moduleOf(file));
      for (const target of targets) {
        const to = LAYERS.indexOf(moduleOf(target));
        if (to > from) against.push(`${relative(src, file)} -> ${relative(src, target)}`);
      }
    }
    expect(against).toEqual([]);
  });

  it('keeps the general-purpose modules free of lensing imports', () => {
    const leaks: string[] = [];
    for (const { file, targets } of edges) {
      if (!GENERAL.includes(moduleOf(file))) continue;
      for (const target of targets) if (LENSING.includes(moduleOf(target))) leaks.push(`${relative(src, file)} -> ${relative(src, target)}`);
    }
    expect(leaks).toEqual([]);
  });

  it('has no circle of files importing each other', () => {
    const graph = new Map(edges.map(({ file, targets }) => [file, targets]));
    const state = new Map<string, 'open' | 'done'>();
    const circles: string[] = [];
    const visit = (file: string, path: string[]): void => {
      if (state.get(file) === 'done') return;
      if (state.get(file) === 'open') {
        circles.push([...path.slice(path.indexOf(file)), file].map((f) => relative(src, f)).join(' -> '));
        return;
      }
      state.set(file, 'open');
      for (const target of graph.get(file) ?? []) visit(target, [...path, file]);
      state.set(file, 'done');
    };
    for (const file of files) visit(file, []);
    expect(circles).toEqual([]);
  });

  it('resolves every relative import to a file of the tree', () => {
    const known = new Set(files);
    const missing = edges.flatMap(({ file, targets }) => targets.filter((t) => !known.has(t)).map((t) => `${relative(src, file)} -> ${relative(src, t)}`));
    expect(missing).toEqual([]);
  });
});
