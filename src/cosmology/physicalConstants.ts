/**
 * Physical and astronomical constants, SI units, each with the body that fixes its value.
 * Masses in solar masses enter only through the nominal solar mass parameter GM_sun, which is
 * exact by definition, so results never carry the uncertainty of G itself.
 * Each value is checked against astropy.constants, which names the same bodies
 * (test/cosmology/referenceValues.test.ts, fixture made by test/fixtures/cosmology/make_references.py).
 */

/** Speed of light in vacuum, exact (SI definition of the metre; CODATA 2018). */
export const speedOfLightMetresPerSecond = 299_792_458;

/** Newtonian constant of gravitation (CODATA 2018 recommended value, m^3 kg^-1 s^-2). */
export const gravitationalConstantSi = 6.674_30e-11;

/** Nominal solar mass parameter GM_sun, exact by definition (IAU 2015 Resolution B3, m^3 s^-2). */
export const solarMassParameterSi = 1.327_124_4e20;

/** Solar mass in kg, GM_sun (IAU 2015 B3) divided by G (CODATA 2018). */
export const solarMassKilograms = solarMassParameterSi / gravitationalConstantSi;

/** Astronomical unit, exact (IAU 2012 Resolution B2, metres). */
export const astronomicalUnitMetres = 149_597_870_700;

/** Parsec, exact: 648000/pi au (IAU 2015 Resolution B2, metres). */
export const parsecMetres = (648_000 / Math.PI) * astronomicalUnitMetres;

/** Megaparsec in metres. */
export const megaparsecMetres = 1e6 * parsecMetres;

/** One arcsecond in radians. */
export const arcsecRadians = Math.PI / (180 * 3600);
