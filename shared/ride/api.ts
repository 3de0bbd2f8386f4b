/**
 * Entry point of the ride model for the CLI, the HTTP worker pool and the
 * browser's Web Worker: validates the request (InputError naming the field),
 * evaluates (`evaluateRide`) and returns a JSON-safe plain object with the
 * safety caution. docs/ride.md.
 */
import * as z from 'zod';
import { parseOrThrow } from '../errors.js';
import { cornerDocumentSchema } from '../schema/corner.js';
import { upgradeVehicleDocument, vehicleSchema } from '../schema/vehicle.js';
import { SAFETY_CAUTION } from '../cautions/cautions.js';
import { ENGINE_VERSION } from '../version.js';
import { evaluateRide, ROAD_CLASSES, type RideResult } from './index.js';
import { AXLE_NAMES } from '../schema/axle.js';

const finite = z.number().finite();

export const rideRequestSchema = z.strictObject({
  vehicle: z.preprocess(upgradeVehicleDocument, vehicleSchema),
  axle: z.enum(AXLE_NAMES, { error: 'axle must be "front" or "rear"' }),
  roadClass: z.enum(ROAD_CLASSES, { error: 'roadClass must be one of the ISO 8608 classes A to H' }),
  /** Speed, km/h. */
  speedKph: finite.min(1, 'speedKph must be at least 1 km/h').max(400, 'speedKph must be at most 400 km/h'),
  /** The axle's left corner (toe, side-force and yaw outputs). */
  corner: cornerDocumentSchema.optional(),
  /** Operating corner radius, m: a steered axle is also judged at the steer L/R. */
  cornerRadiusM: finite.min(2, 'cornerRadiusM must be at least 2 m').max(10000).optional(),
  /** Single-wheel half-sine bump z = h·sin(πx/ℓ). */
  bump: z
    .strictObject({
      heightMm: finite.positive('bump.heightMm must be > 0').max(1000, 'bump.heightMm must be at most 1000 mm'),
      lengthMm: finite.positive('bump.lengthMm must be > 0').max(100000, 'bump.lengthMm must be at most 100 m'),
    })
    .optional(),
  /** Landing of the axle's wheels from a drop height. */
  landing: z.strictObject({ dropHeightMm: finite.positive('landing.dropHeightMm must be > 0').max(5000, 'landing.dropHeightMm must be at most 5000 mm') }).optional(),
  /** Wheel-travel range (droop, bump), mm: the toe curve is read inside it. */
  travelRangeMm: z
    .tuple([finite, finite])
    .refine((r) => r[0] < 0 && r[1] > 0, 'travelRangeMm must be [droop < 0, bump > 0]')
    .optional(),
  /** Report bump steer at the ends of the steering stroke (default true). */
  fullLock: z.boolean().optional(),
});

export interface RideResponse extends RideResult {
  vehicleName: string | null;
  engineVersion: string;
  caution: string;
}

export function computeRide(input: unknown): RideResponse {
  const req = parseOrThrow(rideRequestSchema, input, 'ride request');
  const result = evaluateRide(req.vehicle, {
    axle: req.axle,
    roadClass: req.roadClass,
    speedKph: req.speedKph,
    corner: req.corner,
    cornerRadiusM: req.cornerRadiusM,
    bump: req.bump,
    landing: req.landing,
    travelRangeMm: req.travelRangeMm,
    fullLock: req.fullLock,
  });
  return { vehicleName: req.vehicle.name ?? null, engineVersion: ENGINE_VERSION, ...result, caution: SAFETY_CAUTION };
}
