import type { FamilyComponents } from './familyComponents.js';

/** Kinds of a decomposed lens: stars that follow the light, and a dark halo. */
const STELLAR = ['stellarSersic'];
const HALOES = ['nfwHalo', 'generalisedNfwHalo'];

/**
 * The smooth-model freedom none of the families tried has, as families to add (arcsift's own
 * list, after the systematics the trade reports: angular structure of the lens, as m = 1, 3 and 4
 * multipoles of about 1% (O'Riordan & Vegetti 2024); a single power law against stars plus dark
 * matter (Nightingale et al. 2024); the source model and its regularisation (Ballard et al. 2024)).
 * When every suggestion has been tried, it says where else a misfit can come from.
 */
export function familySuggestions(families: readonly FamilyComponents[]): string[] {
  const suggestions: string[] = [];
  const any = (test: (f: FamilyComponents) => boolean): boolean => families.some(test);
  const orders = new Set(families.flatMap((f) => f.multipoleOrders));
  const missingOrders = [1, 3, 4].filter((m) => !orders.has(m));
  if (orders.size === 0) {
    suggestions.push('the lens with m = 1, 3 and 4 multipoles (lens.multipoles, order 1, 3 and 4): real lenses carry about 1% of them, and a perturber can mimic them');
  } else if (missingOrders.length > 0) {
    suggestions.push(`multipoles of order ${missingOrders.join(' and ')} (lens.multipoles), which no family has`);
  }
  if (!any((f) => f.massKinds.includes('powerLawEllipsoid'))) {
    suggestions.push('an elliptical power law with a free slope (kind: powerLawEllipsoid), with multipoles');
  }
  if (!any((f) => f.massKinds.some((k) => STELLAR.includes(k)) && f.massKinds.some((k) => HALOES.includes(k)))) {
    suggestions.push('a decomposed lens: stellar mass following the light (kind: stellarSersic) plus a dark halo (nfwHalo, or generalisedNfwHalo with a free inner slope)');
  }
  if (!any((f) => f.shear)) suggestions.push('external shear (lens.shear)');
  if (!any((f) => f.sourceKinds.includes('pixelated'))) {
    suggestions.push('a pixelated source (source.light kind: pixelated)' + (any((f) => f.sourceKinds.includes('shapelets')) ? '' : ', or a shapelets source of a few orders'));
  }
  if (suggestions.length === 0) {
    suggestions.push('every kind of smooth freedom arcsift offers was tried: look at the data and their model instead (the PSF, the noise map, ' +
      'the lens light, correlated noise of resampled images, which the misfit test takes for structure)');
  }
  return suggestions;
}
