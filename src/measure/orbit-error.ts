// Orbit error split in the reference orbit's radial / in-track / cross-track frame:
// R = r/|r|, C = r x v/|r x v|, I = C x R, with r, v the reference position and velocity
// (Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., ch. 3, the RSW frame, there
// with S for in-track and W for cross-track; chapter from memory).
// The position error r_run - r_ref is projected on R, I, C; RSS is its length.
import type { OrbitStates } from '../core/types.js';

/** Index of each part in the buffer orbitErrorInto writes. */
export const RIC = { position: 0, radial: 1, inTrack: 2, crossTrack: 3 } as const;

/** Writes [RSS, radial, in-track, cross-track] (signed parts) of y's position error into out (length 4). */
export function orbitErrorInto(y: ArrayLike<number>, ref: ArrayLike<number>, orbit: OrbitStates, out: Float64Array): void {
  const [ix, iy, iz] = orbit.position;
  const [jx, jy, jz] = orbit.velocity;
  const rx = ref[ix]!, ry = ref[iy]!, rz = ref[iz]!;
  const vx = ref[jx]!, vy = ref[jy]!, vz = ref[jz]!;
  const rn = Math.sqrt(rx * rx + ry * ry + rz * rz);
  const Rx = rx / rn, Ry = ry / rn, Rz = rz / rn;
  let cx = ry * vz - rz * vy;
  let cy = rz * vx - rx * vz;
  let cz = rx * vy - ry * vx;
  const cn = Math.sqrt(cx * cx + cy * cy + cz * cz);
  cx /= cn;
  cy /= cn;
  cz /= cn;
  const Ix = cy * Rz - cz * Ry;
  const Iy = cz * Rx - cx * Rz;
  const Iz = cx * Ry - cy * Rx;
  const dx = y[ix]! - rx, dy = y[iy]! - ry, dz = y[iz]! - rz;
  out[0] = Math.sqrt(dx * dx + dy * dy + dz * dz);
  out[1] = dx * Rx + dy * Ry + dz * Rz;
  out[2] = dx * Ix + dy * Iy + dz * Iz;
  out[3] = dx * cx + dy * cy + dz * cz;
}
