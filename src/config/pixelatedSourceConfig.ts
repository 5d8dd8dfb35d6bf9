import { expectedFound } from '../errors.js';
import type { ConfigNode } from './configNode.js';

/** How a pixelated source's cells are laid out in the source plane. */
export type SourceMeshConfig =
  | {
    /** A regular grid of cellsPerSide x cellsPerSide cells over the region the masked image maps to (bilinear interpolation). */
    readonly kind: 'regular';
    readonly cellsPerSide: number;
  }
  | {
    /** Cells whose vertices are the traced positions of a fixed subset of image pixels (Delaunay, natural-neighbour interpolation). */
    readonly kind: 'adaptive';
    /** How many vertices (cells): the traced pixels of a lattice chosen once to hold exactly this many. */
    readonly cells: number;
    /**
     * The share of the cells (0: none, the default) placed on a lattice of their own over the
     * bright pixels: the used pixels whose data exceed brightSignalToNoise times their noise.
     */
    readonly brightShare: number;
    readonly brightSignalToNoise: number;
  };

/**
 * The data-to-noise ratio above which a used pixel counts as bright for an adaptive mesh's
 * brightShare (common practice: a clear detection in one pixel; on the pixelated demo's mock it
 * selects 945 of the 5,160 used pixels, on the arcs).
 */
export const DEFAULT_BRIGHT_SIGNAL_TO_NOISE = 10;

/** The prior on a pixelated source's cell values (Suyu et al. 2006 forms; brightness-weighted). */
export type RegularisationForm = 'zeroth' | 'gradient' | 'curvature' | 'brightness';

export const REGULARISATION_FORMS: readonly RegularisationForm[] = ['zeroth', 'gradient', 'curvature', 'brightness'];

/** The settings of a pixelated source component that are not sampled parameters. */
export interface PixelatedSourceConfig {
  readonly mesh: SourceMeshConfig;
  readonly regularisation: RegularisationForm;
  /** Rays per image pixel along each axis (r x r per pixel) that sample the source. */
  readonly raysPerPixelSide: number;
}

/** The non-parameter keys a pixelated source component takes. */
export const PIXELATED_SETTING_KEYS = ['mesh', 'regularisation', 'raysPerPixelSide'] as const;

/** Reads a pixelated component's settings from its mapping (the parameters are read elsewhere). */
export function readPixelatedSource(node: ConfigNode): PixelatedSourceConfig {
  const meshNode = node.get('mesh');
  if (!meshNode.isMapping()) meshNode.fail(expectedFound('{ kind: regular, cellsPerSide: N } or { kind: adaptive, cells: N }', meshNode.value));
  const kind = meshNode.get('kind').oneOf(['regular', 'adaptive'] as const);
  const mesh: SourceMeshConfig = kind === 'regular'
    ? { kind, cellsPerSide: meshNode.get('cellsPerSide').number({ integer: true, min: 3, max: 200 }) }
    : {
      kind,
      cells: meshNode.get('cells').number({ integer: true, min: 16, max: 20000 }),
      brightShare: meshNode.get('brightShare').optionalNumber(0, { min: 0, max: 0.95 }),
      brightSignalToNoise: meshNode.get('brightSignalToNoise').optionalNumber(DEFAULT_BRIGHT_SIGNAL_TO_NOISE, { min: 0, exclusiveMin: true }),
    };
  meshNode.finish();
  const regularisation = node.get('regularisation').oneOf(REGULARISATION_FORMS);
  const raysPerPixelSide = node.get('raysPerPixelSide').optionalNumber(2, { integer: true, min: 1, max: 8 });
  return { mesh, regularisation, raysPerPixelSide };
}
