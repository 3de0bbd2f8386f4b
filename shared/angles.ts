/**
 * Angle conversions, named by what they turn into what: multiply radians by
 * `DEG_PER_RAD` to get degrees, degrees by `RAD_PER_DEG` to get radians.
 * The one definition for shared/ (no local copies under other names).
 */

/** Degrees per radian, 180/π. */
export const DEG_PER_RAD = 180 / Math.PI;
/** Radians per degree, π/180. */
export const RAD_PER_DEG = Math.PI / 180;
