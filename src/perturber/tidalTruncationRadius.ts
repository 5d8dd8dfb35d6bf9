/**
 * Tidal truncation radius of a subhalo of mass m at distance r from the centre of a host whose mass
 * within r is M(<r):
 *   r_t = r (m / (2 M(<r)))^(1/3),
 * the tidal radius of Tormen, Diaferio & Syer 1998 (MNRAS 299, 728) with the host's logarithmic mass
 * slope dropped from their factor (2 - dln M / dln r), i.e. its point-mass form (from memory). r_t
 * comes in the unit of r. A host with no mass inside r (r = 0) gives r_t = 0.
 */
export function tidalTruncationRadius(distance: number, subhaloMassSolar: number, hostMassWithinSolar: number): number {
  if (!(hostMassWithinSolar > 0)) return 0;
  return distance * Math.cbrt(subhaloMassSolar / (2 * hostMassWithinSolar));
}
