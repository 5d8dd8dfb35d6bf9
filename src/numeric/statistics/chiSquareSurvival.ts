import { gammainc } from '../special/stdlibSpecial.js';

// P(X >= x) for X chi-square with k degrees of freedom: the regularised upper incomplete gamma
// function Q(k/2, x/2) (Abramowitz & Stegun 26.4.19).
export function chiSquareSurvival(x: number, degreesOfFreedom: number): number {
  if (!(x > 0)) return 1;
  return gammainc(x / 2, degreesOfFreedom / 2, true, true);
}
