import type { ArcsiftConfig, ComponentConfig } from '../config/arcsiftConfig.js';

/** What a family's smooth model is made of, by config kind. */
export interface FamilyComponents {
  /** Main-lens mass kinds, in config order. */
  readonly massKinds: readonly string[];
  readonly shear: boolean;
  /** Multipole orders, in config order. */
  readonly multipoleOrders: readonly number[];
  /** Source light kinds a fit uses (simulateOnly components left out). */
  readonly sourceKinds: readonly string[];
  /** The same in words, one line for the lens and one for the source. */
  readonly lens: string;
  readonly source: string;
}

function sourceWords(c: ComponentConfig): string {
  if (c.kind === 'shapelets') return `shapelets (order ${c.order})`;
  if (c.kind === 'pixelated' && c.pixelated !== undefined) {
    const mesh = c.pixelated.mesh.kind === 'regular' ? `regular mesh of ${c.pixelated.mesh.cellsPerSide}^2 cells` : `adaptive mesh of about ${c.pixelated.mesh.cells} cells`;
    return `pixelated (${mesh}, ${c.pixelated.regularisation} regularisation)`;
  }
  return c.kind;
}

/** The components of a family's smooth model (its perturbers are the base's, the same in every family). */
export function familyComponents(config: ArcsiftConfig): FamilyComponents {
  const massKinds = config.lensMass.map((c) => c.kind);
  const multipoleOrders = config.multipoles.map((c) => c.order ?? 0);
  const fitted = config.sourceLight.filter((c) => c.simulateOnly !== true);
  const lens = [
    ...massKinds,
    ...(config.shear === undefined ? [] : ['external shear']),
    ...(multipoleOrders.length === 0 ? [] : [`multipoles m = ${multipoleOrders.join(', ')}`]),
  ].join(' + ');
  return {
    massKinds, shear: config.shear !== undefined, multipoleOrders, sourceKinds: fitted.map((c) => c.kind),
    lens, source: fitted.map(sourceWords).join(' + '),
  };
}
