/** The caution printed and written beside every Bayes factor. */
export const priorCaution =
  'The Bayes factor and the perturber mass depend on the priors and on the model family (mass profiles, ' +
  'source model, PSF and noise model) listed here; a detection deserves a check with a more flexible source ' +
  'model (e.g. shapelets) and other reasonable priors before it is published.';

/** The caution of the robust verdict: it already tries several families, so it points at what is left. */
export const verdictCaution =
  'Every ln B here holds for its family\'s mass profiles, source model, PSF and noise model and for the priors ' +
  'listed below; the verdict covers the families tried and no others. Before a confirmed perturber is published, ' +
  'add the families listed as not tried (a pixelated source above all) and weigh other reasonable priors.';

/** Said beside every evidence that took the network's map as its position prior. */
export const mapPriorNote =
  "The map-prior run takes the network's probability map (normalised over the mask) as the prior on the " +
  "perturber's position: its evidence, and so its Bayes factor, depends on the network, not on the pixels alone.";

/** What the sensitivity map approximates, written beside every map. */
export const sensitivityApproximation =
  'Expected detection statistic on noise-free (Asimov) data: a perturber is planted in the smooth best fit, the smooth ' +
  'model is refitted locally (Nelder-Mead from the best fit, amplitudes solved linearly) and Delta chi^2 = chi^2(smooth ' +
  'refit) - chi^2(planted truth) is compared with 2 x the threshold. Approximated: the noise is not drawn (the statistic ' +
  'is its expected value, not one realisation), the refit is local (a distant better smooth solution is not sought), ' +
  'the perturber sits at the grid point with its other settings fixed, and no evidence is computed (an evidence ' +
  'threshold would also pay the Occam factor of the perturber\'s prior). The minimum mass is found by bisection in log10 ' +
  'mass, assuming Delta chi^2 grows with mass.';
