// Earth constants shared by the catalogue's orbit problems, in metres and seconds.
// GM and the equatorial radius are the WGS 84 values (NIMA TR8350.2, 3rd ed., 2000, tables 3.1
// and 3.3); J2 is the EGM96 value of the unnormalised second zonal coefficient as printed in
// Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., table D-1 (0.0010826267; table number from memory).

/** Earth's gravitational parameter GM, m^3/s^2 (WGS 84). */
export const EARTH_GM = 3.986004418e14;
/** Earth's equatorial radius, m (WGS 84 semi-major axis). */
export const EARTH_RADIUS = 6378137;
/** Second zonal harmonic J2 (EGM96, unnormalised). */
export const EARTH_J2 = 0.0010826267;

/** Unit vectors of an orbit plane inclined `inclination` radians about the x axis. */
export function inclinedPlane(inclination: number): { e1: [number, number, number]; e2: [number, number, number]; normal: [number, number, number] } {
  const c = Math.cos(inclination);
  const s = Math.sin(inclination);
  return { e1: [1, 0, 0], e2: [0, c, s], normal: [0, -s, c] };
}
