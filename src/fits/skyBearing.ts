/** Angles between two points on the celestial sphere, all in degrees. */

const DEG = Math.PI / 180;

/**
 * Position angle of point 2 seen from point 1, east of north (north = 0, east = 90), in
 * [0, 360): the initial bearing of the great circle, tan PA = sin(da) cos(d2) /
 * (cos(d1) sin(d2) - sin(d1) cos(d2) cos(da)) (Smart 1977, Textbook on Spherical Astronomy, sec. 9).
 */
export function skyPositionAngleDeg(ra1Deg: number, dec1Deg: number, ra2Deg: number, dec2Deg: number): number {
  const dAlpha = (ra2Deg - ra1Deg) * DEG;
  const d1 = dec1Deg * DEG;
  const d2 = dec2Deg * DEG;
  const angle = Math.atan2(Math.sin(dAlpha) * Math.cos(d2), Math.cos(d1) * Math.sin(d2) - Math.sin(d1) * Math.cos(d2) * Math.cos(dAlpha)) / DEG;
  return angle < 0 ? angle + 360 : angle;
}

/** Angular separation by the Vincenty (1975) form of the great-circle distance, accurate at all separations. */
export function skySeparationDeg(ra1Deg: number, dec1Deg: number, ra2Deg: number, dec2Deg: number): number {
  const dAlpha = (ra2Deg - ra1Deg) * DEG;
  const d1 = dec1Deg * DEG;
  const d2 = dec2Deg * DEG;
  const a = Math.cos(d2) * Math.sin(dAlpha);
  const b = Math.cos(d1) * Math.sin(d2) - Math.sin(d1) * Math.cos(d2) * Math.cos(dAlpha);
  const c = Math.sin(d1) * Math.sin(d2) + Math.cos(d1) * Math.cos(d2) * Math.cos(dAlpha);
  return Math.atan2(Math.hypot(a, b), c) / DEG;
}
