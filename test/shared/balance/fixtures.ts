/** Vehicles built from published check values (shared/docs/check-values.md) for the balance tests. */
import { vehicleSchema, type Vehicle, type VehicleInput } from '../../../shared/schema/vehicle.js';

type AxleInput = VehicleInput['front'];

export function vehicle(input: Omit<VehicleInput, 'formatVersion'>): Vehicle {
  return vehicleSchema.parse({ formatVersion: 1, ...input });
}

/**
 * kktse.github.io, "Typical cornering compliances" (2019-06-01): a = 1.041 m,
 * b = 1.629 m, m = 1619 kg, Iz = 2746 kg·m², Df = 6.7 deg/g, Dr = 3.1 deg/g.
 * Roll data are not part of the fixture; with no roll steer, roll camber or
 * compliance entered they do not enter K or the bicycle model.
 */
export function kktseBicycle(overrides: { front?: Partial<AxleInput>; rear?: Partial<AxleInput> } = {}): Vehicle {
  const axle = (D: number, extra: Partial<AxleInput> = {}): AxleInput => ({ trackMm: 1500, rollCentreHeightMm: 50, rollStiffnessNmPerDeg: 1000, tyre: { axleComplianceDegPerG: D }, ...extra });
  return vehicle({
    massKg: 1619,
    wheelbaseMm: 2670,
    cgToFrontAxleMm: 1041,
    cgHeightMm: 500,
    yawInertiaKgM2: 2746,
    front: axle(6.7, overrides.front),
    rear: axle(3.1, overrides.rear),
  });
}

/**
 * kktse.github.io, "Simplified lateral load transfer analysis" (2021-03-21),
 * stock front-drive coupé: m = 1288 kg, 61 % front, tracks 1.482 / 1.481 m,
 * CG 0.533 m, roll centres 0.096 / 0.168 m, roll stiffness 1027 / 1004 N·m/deg.
 * The post needs no wheelbase (the split follows from 61 %); 2.5 m is ours.
 */
export function kktseCoupe(rollGravityTerm: boolean): Vehicle {
  const L = 2500;
  const axle = (t: number, rc: number, k: number): AxleInput => ({ trackMm: t, rollCentreHeightMm: rc, rollStiffnessNmPerDeg: k, tyre: { corneringStiffnessNPerDeg: 1000 } });
  return vehicle({
    massKg: 1288,
    wheelbaseMm: L,
    cgToFrontAxleMm: 0.39 * L,
    cgHeightMm: 533,
    yawInertiaKgM2: 2000,
    options: { rollGravityTerm },
    front: axle(1482, 96, 1027),
    rear: axle(1481, 168, 1004),
  });
}
