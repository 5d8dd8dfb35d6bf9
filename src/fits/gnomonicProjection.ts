/**
 * The gnomonic (TAN) projection of the FITS celestial WCS, Calabretta & Greisen (2002, A&A 395,
 * 1077): intermediate world coordinates (x, y) in degrees on the projection plane to celestial
 * (right ascension, declination) in degrees and back. The native reference point of a zenithal
 * projection is the native pole (phi0, theta0) = (0, 90 deg), so the celestial coordinates of
 * the native pole are CRVAL itself and only LONPOLE (phi_p) is needed.
 */

const DEG = Math.PI / 180;

/** The tangent point (CRVAL1, CRVAL2) and LONPOLE of a TAN projection, in degrees. */
export interface TanPole {
  readonly raDeg: number;
  readonly decDeg: number;
  readonly lonpoleDeg: number;
}

/** The default LONPOLE of a zenithal projection, Calabretta & Greisen (2002) sec. 2.4: 0 if delta0 >= theta0 = 90 deg, else 180 deg. */
export function defaultLonpoleDeg(decDeg: number): number {
  return decDeg >= 90 ? 0 : 180;
}

/**
 * (x, y) -> (alpha, delta): Calabretta & Greisen (2002) eq. 54-55 (TAN: phi = arg(-y, x),
 * theta = atan(180 / (pi R))) then eq. 2 (native to celestial spherical rotation). Writes
 * [raDeg in [0, 360), decDeg] into `out`.
 */
export function tanDeproject(xDeg: number, yDeg: number, pole: TanPole, out: Float64Array): void {
  const phi = Math.atan2(xDeg, -yDeg);
  const theta = Math.atan2(180 / Math.PI, Math.hypot(xDeg, yDeg));
  const deltaP = pole.decDeg * DEG;
  const dPhi = phi - pole.lonpoleDeg * DEG;
  const sinTheta = Math.sin(theta);
  const cosTheta = Math.cos(theta);
  const ra = pole.raDeg * DEG + Math.atan2(-cosTheta * Math.sin(dPhi), sinTheta * Math.cos(deltaP) - cosTheta * Math.sin(deltaP) * Math.cos(dPhi));
  const sinDec = sinTheta * Math.sin(deltaP) + cosTheta * Math.cos(deltaP) * Math.cos(dPhi);
  const raDeg = (ra / DEG) % 360;
  out[0] = raDeg < 0 ? raDeg + 360 : raDeg;
  out[1] = Math.asin(Math.max(-1, Math.min(1, sinDec))) / DEG;
}

/**
 * (alpha, delta) -> (x, y): Calabretta & Greisen (2002) eq. 5 (celestial to native) then eq. 54
 * (TAN: R = (180 / pi) cot theta, x = R sin phi, y = -R cos phi). Writes [xDeg, yDeg] into `out`;
 * NaN for a point 90 degrees or more from the tangent point, which the projection cannot show.
 */
export function tanProject(raDeg: number, decDeg: number, pole: TanPole, out: Float64Array): void {
  const delta = decDeg * DEG;
  const deltaP = pole.decDeg * DEG;
  const dAlpha = (raDeg - pole.raDeg) * DEG;
  const cosDelta = Math.cos(delta);
  // cos(theta) sin(phi - phi_p), cos(theta) cos(phi - phi_p) and sin(theta) of eq. 5; the second
  // written as sin(delta - delta_p) + 2 cos(delta) sin(delta_p) sin^2(dAlpha / 2), which keeps its
  // digits near the tangent point, where the textbook form subtracts two numbers close to 1.
  const a = -cosDelta * Math.sin(dAlpha);
  const halfSine = Math.sin(dAlpha / 2);
  const b = Math.sin(delta - deltaP) + 2 * cosDelta * Math.sin(deltaP) * halfSine * halfSine;
  const sinTheta = Math.sin(delta) * Math.sin(deltaP) + cosDelta * Math.cos(deltaP) * Math.cos(dAlpha);
  if (!(sinTheta > 0)) {
    out[0] = Number.NaN;
    out[1] = Number.NaN;
    return;
  }
  const phi = pole.lonpoleDeg * DEG + Math.atan2(a, b);
  const r = (180 / Math.PI) * (Math.hypot(a, b) / sinTheta);
  out[0] = r * Math.sin(phi);
  out[1] = -r * Math.cos(phi);
}
