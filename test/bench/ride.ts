/**
 * Ride benchmark (issue 13): `ride.axle` = one axle on one ISO 8608 class at
 * one speed with toe, side-force and yaw outputs (quarter car, toe through
 * the kinematics by Gauss–Hermite, tyre lag and bicycle model over the band,
 * both correlation limits, on-centre and at the operating steer);
 * `ride.bump` = one single-wheel half-sine bump in the time domain with the
 * toe chain on-centre and at the operating steer. Targets: medians ≤ 5 ms.
 */
import { performance } from 'node:perf_hooks';
import { exampleVehicles } from '../../shared/balance/examples.js';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { evaluateRide } from '../../shared/ride/index.js';
import { median, round, timeRuns } from './stats.js';

export async function run(): Promise<Record<string, number>> {
  const vehicle = exampleVehicles.tur26Ember;
  const corner = exampleCorners.fsFrontWishbone;
  const axle = { axle: 'front' as const, roadClass: 'B' as const, speedKph: 80, corner, cornerRadiusM: 20, fullLock: false };
  const t0 = performance.now();
  evaluateRide(vehicle, axle);
  const firstRunMs = performance.now() - t0;
  const axleRuns = timeRuns(() => evaluateRide(vehicle, axle), 60, 30);
  const bump = { ...axle, bump: { heightMm: 20, lengthMm: 400 } };
  const bumpRuns = timeRuns(() => evaluateRide(vehicle, bump), 40, 10);
  // The bump alone: the event's figure minus the random-road part it also computes.
  const bumpOnly = bumpRuns.map((ms, i) => ms - axleRuns[i % axleRuns.length]!);
  console.log('  target ride.axle.medianMs ≤ 5, ride.bump.medianMs ≤ 5 (the whole call with the bump)');
  return {
    'ride.axle.medianMs': round(median(axleRuns)),
    'ride.axle.firstRunMs': round(firstRunMs),
    'ride.bump.medianMs': round(median(bumpRuns)),
    'ride.bump.eventOnlyMedianMs': round(Math.max(0, median(bumpOnly))),
  };
}
