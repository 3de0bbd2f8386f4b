/**
 * Which axle: the one name for "front or rear" in every layer (schemas,
 * engines, server, screens). An axle's data is `VehicleAxle`
 * (shared/schema/vehicle.ts); this is only its name.
 */

/** The axles in order, front first. */
export const AXLE_NAMES = ['front', 'rear'] as const;

/** `'front' | 'rear'`. */
export type AxleName = (typeof AXLE_NAMES)[number];
