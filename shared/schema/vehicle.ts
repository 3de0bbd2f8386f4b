/**
 * Vehicle definition of the balance model (issue 4). Our own JSON format,
 * stored in SI (mm, kg, N, deg) with a `formatVersion`. Inch/pound entry goes
 * through shared/schema/units.ts and is converted before it reaches here.
 * Every field is documented with its unit in docs/balance.md.
 */
import * as z from 'zod';
import { GENERIC_RANGE, VEHICLE_RANGES } from './ranges.js';
import { inRange } from './ranged.js';

export const VEHICLE_FORMAT_VERSION = 1 as const;

// Every number is also held to its plausible range (shared/schema/ranges.ts, by the key `what`; docs/inputs.md).
const ranged = (what: string, base: z.ZodNumber) => inRange(base, VEHICLE_RANGES[what] ?? GENERIC_RANGE, what);
const positive = (what: string) => ranged(what, z.number({ error: `${what} must be a number` }).finite().positive(`${what} must be > 0`));
const nonNegative = (what: string) => ranged(what, z.number({ error: `${what} must be a number` }).finite().min(0, `${what} must be ≥ 0`));
const finite = (what: string) => ranged(what, z.number({ error: `${what} must be a number` }).finite());

/** Cα(Fz) = a·Fz − b·Fz² per tyre; Cα in N/deg, Fz in N (a in 1/deg, b in 1/(deg·N)). */
export const loadSensitivitySchema = z.strictObject({
  a: positive('loadSensitivity.a'),
  b: nonNegative('loadSensitivity.b'),
});

export const tyreSchema = z
  .strictObject({
    /** Cornering stiffness of ONE tyre at its static load, N/deg. */
    corneringStiffnessNPerDeg: positive('corneringStiffnessNPerDeg').optional(),
    /** The axle tyres' own cornering compliance W/Cα, deg/g (alternative to the stiffness). */
    axleComplianceDegPerG: positive('axleComplianceDegPerG').optional(),
    /** Replaces the entered stiffness: Cα evaluated at each tyre's load. */
    loadSensitivity: loadSensitivitySchema.optional(),
    /** Camber thrust stiffness of ONE tyre, N/deg (force toward the side the top leans to). */
    camberStiffnessNPerDeg: nonNegative('camberStiffnessNPerDeg').optional(),
    /** Vertical rate of ONE tyre, N/mm (absent = rigid tyre). */
    verticalRateNPerMm: positive('verticalRateNPerMm').optional(),
    /** Pneumatic trail, mm (aligning torque = lateral force × trail). */
    pneumaticTrailMm: nonNegative('pneumaticTrailMm').optional(),
    /** Relaxation length of the side force, mm (ride model; absent = 500 mm, docs/ride.md). */
    relaxationLengthMm: positive('relaxationLengthMm').optional(),
  })
  .refine((t) => t.corneringStiffnessNPerDeg !== undefined || t.axleComplianceDegPerG !== undefined || t.loadSensitivity !== undefined, {
    message: 'give corneringStiffnessNPerDeg, axleComplianceDegPerG or loadSensitivity',
  });

/** Damper of one wheel, referred to the wheel (ride model; absent = a body damping ratio of 0.3, docs/ride.md). */
export const damperSchema = z.strictObject({
  /** Damping force per unit wheel velocity, N·s/mm (the damper's own rate × its motion ratio²). */
  wheelRateNsPerMm: positive('damper.wheelRateNsPerMm'),
});

export const springSchema = z.strictObject({
  /** Spring rate, N/mm. */
  rateNPerMm: positive('spring.rateNPerMm'),
  /** Spring travel per unit wheel travel (wheel rate = rate · MR²). */
  motionRatio: positive('spring.motionRatio'),
});

/** Anti-roll bar: its roll rate at the wheels, or its geometry. */
export const antiRollBarSchema = z.union([
  z.strictObject({
    /** Roll stiffness the bar adds to the axle, N·m/deg. */
    rollRateNmPerDeg: nonNegative('antiRollBar.rollRateNmPerDeg'),
  }),
  z
    .strictObject({
      /** Outer diameter of the bar's active section, mm. */
      outerDiameterMm: positive('antiRollBar.outerDiameterMm'),
      /** Inner diameter of a tube, mm (absent or 0 = solid bar). */
      innerDiameterMm: nonNegative('antiRollBar.innerDiameterMm').optional(),
      /** Active (twisting) length between the lever roots, mm. */
      activeLengthMm: positive('antiRollBar.activeLengthMm'),
      /** Lever (arm) length from the bar axis to the drop link, mm (with linkMotionRatio; not needed with twistRadPerM). */
      leverLengthMm: positive('antiRollBar.leverLengthMm').optional(),
      /** Drop-link travel per unit wheel travel (with leverLengthMm; not needed with twistRadPerM). */
      linkMotionRatio: positive('antiRollBar.linkMotionRatio').optional(),
      /** Bar twist per unit wheel travel, rad/m: replaces leverLengthMm and linkMotionRatio (a linked corner's bar geometry writes it). */
      twistRadPerM: positive('antiRollBar.twistRadPerM').optional(),
      /** Shear modulus, GPa (default 79.3, steel: Shigley table A-5). */
      shearModulusGPa: positive('antiRollBar.shearModulusGPa').optional(),
    })
    .refine((b) => (b.innerDiameterMm ?? 0) < b.outerDiameterMm, { message: 'innerDiameterMm must be smaller than outerDiameterMm', path: ['innerDiameterMm'] })
    .refine((b) => b.twistRadPerM !== undefined || (b.leverLengthMm !== undefined && b.linkMotionRatio !== undefined), {
      message: 'give leverLengthMm and linkMotionRatio, or twistRadPerM (bar twist per wheel travel)',
      path: ['leverLengthMm'],
    }),
]);

export const axleSchema = z
  .strictObject({
    trackMm: positive('trackMm'),
    rollCentreHeightMm: finite('rollCentreHeightMm'),
    unsprungMassKg: nonNegative('unsprungMassKg').optional(),
    unsprungCgHeightMm: nonNegative('unsprungCgHeightMm').optional(),
    tyre: tyreSchema,
    spring: springSchema.optional(),
    /** Damper wheel rate of the axle's wheels (ride model and bump cost). */
    damper: damperSchema.optional(),
    antiRollBar: antiRollBarSchema.optional(),
    /** Suspension roll stiffness entered directly (replaces springs and bar), N·m/deg. */
    rollStiffnessNmPerDeg: positive('rollStiffnessNmPerDeg').optional(),
    /** ε = −dδ̄/dφ, deg/deg (positive steers the axle out of the turn; domain.md). */
    rollSteerCoefficient: finite('rollSteerCoefficient').optional(),
    /** Wheel inclination to the ground toward the outside of the turn per degree of suspension roll. */
    rollCamberDegPerDeg: finite('rollCamberDegPerDeg').optional(),
    /** Lateral-force compliance steer of the axle, deg per kN, positive out of the turn. */
    complianceSteerDegPerKN: finite('complianceSteerDegPerKN').optional(),
    /** Steering (or toe-link) stiffness against aligning torque, N·m/deg of road-wheel steer. */
    steeringStiffnessNmPerDeg: positive('steeringStiffnessNmPerDeg').optional(),
    /** Lateral-force compliance camber of the axle: outward wheel inclination, deg per kN of axle lateral force. */
    complianceCamberDegPerKN: finite('complianceCamberDegPerKN').optional(),
    /** Mechanical (caster) trail at the ground, mm, positive when the steering axis meets the ground ahead of the contact patch (a linked corner's kinematics write it). */
    mechanicalTrailMm: finite('mechanicalTrailMm').optional(),
  })
  .superRefine((a, ctx) => {
    if (a.spring === undefined && a.rollStiffnessNmPerDeg === undefined) {
      ctx.addIssue({ code: 'custom', path: ['spring'], message: 'give spring (rateNPerMm, motionRatio) or rollStiffnessNmPerDeg' });
    }
    if ((a.unsprungMassKg ?? 0) > 0 && a.unsprungCgHeightMm === undefined) {
      ctx.addIssue({ code: 'custom', path: ['unsprungCgHeightMm'], message: 'required when unsprungMassKg is given' });
    }
  });

export const vehicleOptionsSchema = z.strictObject({
  /** Include the sprung mass's gravity term in the roll gradient (default true). */
  rollGravityTerm: z.boolean().default(true),
});

export const vehicleSchema = z
  .strictObject({
    formatVersion: z.literal(VEHICLE_FORMAT_VERSION, { error: `formatVersion must be ${VEHICLE_FORMAT_VERSION}` }),
    name: z.string().max(200).optional(),
    massKg: positive('massKg'),
    wheelbaseMm: positive('wheelbaseMm'),
    cgToFrontAxleMm: positive('cgToFrontAxleMm'),
    cgHeightMm: positive('cgHeightMm'),
    yawInertiaKgM2: positive('yawInertiaKgM2'),
    /** Sprung mass's roll inertia about the roll axis, kg·m² (with damping: enables the 3-DOF transient). */
    rollInertiaKgM2: positive('rollInertiaKgM2').optional(),
    /** Roll damping of the suspension, N·m·s/deg. */
    rollDampingNmsPerDeg: positive('rollDampingNmsPerDeg').optional(),
    /** Handwheel angle per road-wheel angle (overall steering ratio). */
    steeringRatio: positive('steeringRatio').optional(),
    options: vehicleOptionsSchema.default({ rollGravityTerm: true }),
    front: axleSchema,
    rear: axleSchema,
  })
  .superRefine((v, ctx) => {
    if (v.cgToFrontAxleMm >= v.wheelbaseMm) {
      ctx.addIssue({ code: 'custom', path: ['cgToFrontAxleMm'], message: 'must be less than wheelbaseMm' });
    }
    const unsprung = (v.front.unsprungMassKg ?? 0) + (v.rear.unsprungMassKg ?? 0);
    if (unsprung >= v.massKg) {
      ctx.addIssue({ code: 'custom', path: ['front', 'unsprungMassKg'], message: 'unsprung masses must be less than massKg' });
    }
  });

export type Vehicle = z.infer<typeof vehicleSchema>;
/** What a caller may write: defaults (options) may be omitted. */
export type VehicleInput = z.input<typeof vehicleSchema>;
/** One axle's data in a vehicle document (its name is `AxleName`, shared/schema/axle.ts). */
export type VehicleAxle = z.infer<typeof axleSchema>;
export type TyreData = z.infer<typeof tyreSchema>;
export type AntiRollBar = z.infer<typeof antiRollBarSchema>;

/**
 * Brings an older vehicle document to the current format. Version 1 is the
 * first; a document without `formatVersion` is treated as version 1 (early
 * exports carried none). Unknown future versions are returned unchanged so
 * the schema reports them by name.
 */
export function upgradeVehicleDocument(doc: unknown): unknown {
  if (doc === null || typeof doc !== 'object' || Array.isArray(doc)) return doc;
  const d = doc as Record<string, unknown>;
  if (d['formatVersion'] === undefined) return { ...d, formatVersion: VEHICLE_FORMAT_VERSION };
  return d;
}
