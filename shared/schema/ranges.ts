/**
 * Plausible ranges of every engineering input (issue 12 §6), in one place
 * for the zod schemas (which refuse values outside `min`…`max`, naming the
 * field) and for the screens (which warn, without refusing, about values
 * outside the `typical` band). docs/inputs.md lists them.
 *
 * `min`/`max` bound what is physically possible for a wheeled road, race or
 * off-road vehicle, with a wide margin: they exist so that a 1e308 kg
 * vehicle or a 1e29 mm coordinate is refused at the door rather than
 * overflowing an engine. `typical` is the band most cars, from a Formula
 * Student car to a light truck, fall inside (common practice; the figures
 * are from memory, rounded outward): outside it the value is accepted and
 * shown as unusual, since special vehicles exist.
 *
 * Pure data and functions: no zod here (the browser's workers import it).
 */

export interface InputRange {
  /** In the user's words, for messages ("wheel radius"). */
  readonly label: string;
  /** The stored unit as written on screen ('' for a ratio). */
  readonly unit: string;
  /** Refused below (inclusive bound unless `minExclusive`). */
  readonly min: number;
  readonly minExclusive?: boolean;
  /** Refused above. */
  readonly max: number;
  /** The usual band [low, high]; outside it the screens warn. */
  readonly typical: readonly [number, number];
}

// Marked free of side effects so a bundle that imports one helper of this module drops the tables it does not use.
/* @__NO_SIDE_EFFECTS__ */
const r = (label: string, unit: string, min: number, max: number, typical: [number, number], minExclusive = false): InputRange => ({
  label,
  unit,
  min,
  max,
  typical,
  ...(minExclusive ? { minExclusive } : {}),
});
/** Strictly positive quantity up to `max`. */
/* @__NO_SIDE_EFFECTS__ */
const pos = (label: string, unit: string, max: number, typical: [number, number]) => r(label, unit, 0, max, typical, true);

/**
 * Vehicle document (shared/schema/vehicle.ts), by the key its schema names
 * the field with: the top-level key, or `spring.…`, `antiRollBar.…`,
 * `loadSensitivity.…` inside an axle; axle and tyre keys without their
 * `front.`/`rear.`/`tyre.` prefix. Every numeric key of VEHICLE_FIELD_UNITS
 * has an entry (test/shared/schema/ranges.test.ts checks).
 */
export const VEHICLE_RANGES: Readonly<Record<string, InputRange>> = {
  massKg: r('vehicle mass', 'kg', 20, 50_000, [150, 3500]),
  wheelbaseMm: r('wheelbase', 'mm', 300, 10_000, [1500, 3500]),
  cgToFrontAxleMm: pos('CG distance behind the front axle', 'mm', 10_000, [300, 2500]),
  cgHeightMm: r('CG height', 'mm', 20, 3000, [200, 700]),
  yawInertiaKgM2: pos('yaw inertia', 'kg·m²', 1_000_000, [50, 6000]),
  rollInertiaKgM2: pos('roll inertia', 'kg·m²', 100_000, [10, 1500]),
  rollDampingNmsPerDeg: pos('roll damping', 'N·m·s/deg', 100_000, [1, 1000]),
  steeringRatio: r('overall steering ratio', '', 1, 100, [4, 25]),
  trackMm: r('track', 'mm', 300, 4000, [1000, 1800]),
  rollCentreHeightMm: r('roll-centre height', 'mm', -1000, 2000, [-100, 300]),
  unsprungMassKg: r('unsprung mass of an axle', 'kg', 0, 5000, [10, 250]),
  unsprungCgHeightMm: r('unsprung CG height', 'mm', 0, 2000, [150, 450]),
  corneringStiffnessNPerDeg: pos('cornering stiffness per tyre', 'N/deg', 100_000, [200, 3000]),
  axleComplianceDegPerG: pos('axle tyre compliance', 'deg/g', 50, [0.5, 10]),
  'loadSensitivity.a': pos('load sensitivity a', '1/deg', 10, [0.05, 2]),
  'loadSensitivity.b': r('load sensitivity b', '1/(deg·N)', 0, 1, [0, 5e-4]),
  camberStiffnessNPerDeg: r('camber stiffness per tyre', 'N/deg', 0, 20_000, [0, 300]),
  verticalRateNPerMm: pos('tyre vertical rate', 'N/mm', 10_000, [50, 600]),
  relaxationLengthMm: pos('tyre relaxation length', 'mm', 5000, [150, 1000]),
  pneumaticTrailMm: r('pneumatic trail', 'mm', 0, 500, [0, 80]),
  'spring.rateNPerMm': pos('spring rate', 'N/mm', 10_000, [5, 500]),
  'spring.motionRatio': pos('spring motion ratio', '', 10, [0.3, 1.5]),
  'damper.wheelRateNsPerMm': pos('damper wheel rate', 'N·s/mm', 1000, [0.5, 15]),
  'antiRollBar.rollRateNmPerDeg': r('anti-roll bar roll rate', 'N·m/deg', 0, 100_000, [0, 3000]),
  'antiRollBar.outerDiameterMm': pos('anti-roll bar outer diameter', 'mm', 200, [10, 40]),
  'antiRollBar.innerDiameterMm': r('anti-roll bar inner diameter', 'mm', 0, 200, [0, 35]),
  'antiRollBar.activeLengthMm': pos('anti-roll bar active length', 'mm', 4000, [200, 1500]),
  'antiRollBar.leverLengthMm': pos('anti-roll bar lever length', 'mm', 2000, [50, 400]),
  'antiRollBar.linkMotionRatio': pos('anti-roll bar link motion ratio', '', 10, [0.2, 1.5]),
  'antiRollBar.twistRadPerM': pos('anti-roll bar twist per wheel travel', 'rad/m', 100, [1, 15]),
  'antiRollBar.shearModulusGPa': pos('bar shear modulus', 'GPa', 500, [20, 90]),
  rollStiffnessNmPerDeg: pos('roll stiffness', 'N·m/deg', 1_000_000, [100, 5000]),
  rollSteerCoefficient: r('roll steer coefficient', 'deg/deg', -1, 1, [-0.3, 0.3]),
  rollCamberDegPerDeg: r('roll camber coefficient', 'deg/deg', -5, 5, [-1.5, 1.5]),
  complianceSteerDegPerKN: r('compliance steer', 'deg/kN', -10, 10, [-0.5, 0.5]),
  complianceCamberDegPerKN: r('compliance camber', 'deg/kN', -10, 10, [-0.5, 0.5]),
  mechanicalTrailMm: r('mechanical trail', 'mm', -300, 500, [-10, 60]),
  steeringStiffnessNmPerDeg: pos('steering stiffness', 'N·m/deg', 1_000_000, [50, 3000]),
};

/** Corner document (shared/schema/corner.ts) and intent settings (shared/schema/intent.ts). */
export const CORNER_RANGES = {
  /** Any hardpoint coordinate (x, y or z), ISO 8855 vehicle axes from the ground under the front axle centre. */
  coordinateMm: r('hardpoint coordinate', 'mm', -10_000, 10_000, [-4000, 4000]),
  /** Components of a direction (rack axis, arm, rocker and bar axes); only the direction counts. */
  directionComponent: r('direction component', '', -1e6, 1e6, [-1e6, 1e6]),
  wheelRadiusMm: pos('wheel radius', 'mm', 2000, [200, 450]),
  /** Distance of any hardpoint from the wheel centre (a corner fits around its wheel). */
  pointFromWheelCentreMm: r('distance of a hardpoint from the wheel centre', 'mm', 0, 3000, [0, 1500]),
  /** Lower to upper ball joint of a double wishbone's upright. */
  kingpinLengthMm: pos('kingpin length', 'mm', 1500, [120, 600]),
  rackStrokeMm: r('rack stroke end', 'mm', -500, 500, [-120, 120]),
  armStrokeDeg: r('steering arm stroke end', 'deg', -180, 180, [-60, 60]),
  /**
   * A compliance rate (a bushing's radial or axial rate, a link's own axial stiffness, the steering at the rack);
   * absent is rigid. Above 1e7 N/mm a mount is rigid in all but name (a short solid steel link is about 2e5 N/mm).
   */
  complianceRateNPerMm: pos('compliance rate', 'N/mm', 1e7, [50, 500_000]),
} as const satisfies Record<string, InputRange>;

export const INTENT_RANGES = {
  travelMm: r('suspension travel', 'mm', -1000, 1000, [-150, 150]),
  bumpHeightMm: pos('bump height', 'mm', 1000, [5, 100]),
  bumpLengthMm: pos('bump length', 'mm', 100_000, [100, 2000]),
  speedKph: r('speed', 'km/h', 1, 400, [20, 250]),
  cornerRadiusM: r('corner radius', 'm', 2, 10_000, [10, 500]),
  landingDropMm: pos('landing drop height', 'mm', 5000, [50, 1500]),
  bumpYawBudgetPct: pos('bump-cost budget', '% of the steady yaw rate', 1000, [0.5, 20]),
  rackPositionMm: r('rack position', 'mm', -500, 500, [-120, 120]),
  travelStepMm: pos('travel step', 'mm', 500, [0.5, 20]),
  worstToeBoundDeg: pos('worst toe bound', 'deg', 45, [0.01, 2]),
  shimThicknessMm: pos('shim thickness', 'mm', 50, [0.1, 5]),
  threadPitchMm: pos('thread pitch', 'mm', 20, [0.5, 3]),
  /** How far the adjuster can change the link's length either way before its threads run out. */
  adjusterReachMm: pos('adjuster reach', 'mm', 200, [3, 20]),
  /** Tallest shim stack an end takes (the bolt's spare length). */
  shimStackMaxMm: pos('largest shim stack', 'mm', 200, [3, 25]),
  /** Intent targets. */
  rollSteerCoefficient: r('roll steer coefficient', 'deg/deg', -1, 1, [-0.2, 0.2]),
  understeerChangeDegPerG: r('understeer-gradient change', 'deg/g', -20, 20, [-1, 1]),
  axleSteerDegPerG: r('axle steer per g', 'deg/g', -20, 20, [-1, 1]),
  referenceRollDeg: pos('reference roll angle', 'deg', 15, [0.5, 5]),
  /** Compute requests: body roll of an axle roll sweep. */
  rollDeg: r('body roll angle', 'deg', -30, 30, [-6, 6]),
  /** Rack travel per handwheel revolution. */
  rackMmPerHandwheelRev: pos('rack travel per handwheel turn', 'mm', 500, [25, 90]),
  /** Caution thresholds are in each caution's own unit (deg, mm, deg/m²…): only kept finite and bounded. */
  cautionThreshold: r('caution threshold', '', -1e6, 1e6, [-1e6, 1e6]),
} as const satisfies Record<string, InputRange>;

/** Any other number a document holds (a key added without its own range): finite and bounded, so it cannot overflow an engine. */
export const GENERIC_RANGE: InputRange = r('value', '', -1e9, 1e9, [-1e9, 1e9]);

/** Formats a number for a message: up to 4 significant digits, no exponent below 1e6. */
export function formatRangeValue(v: number): string {
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e6 || a < 1e-3) return v.toExponential(2).replace(/\.?0+e/, 'e');
  return String(Number(v.toPrecision(4)));
}

const withUnit = (v: number, unit: string) => (unit ? `${formatRangeValue(v)} ${unit}` : formatRangeValue(v));

/** Why `value` is refused (outside min…max), or null when it is possible. */
export function impossibleValue(range: InputRange, value: number): string | null {
  if (!Number.isFinite(value)) return `must be a finite number (${range.label})`;
  const below = range.minExclusive ? value <= range.min : value < range.min;
  if (below || value > range.max) {
    const low = range.minExclusive ? `more than ${withUnit(range.min, range.unit)}` : `at least ${withUnit(range.min, range.unit)}`;
    return `${withUnit(value, range.unit)} is not a possible ${range.label}: give ${low} and at most ${withUnit(range.max, range.unit)}`;
  }
  return null;
}

/**
 * "1200 mm is unusual for a wheel radius (typical 200 to 450 mm)", or null inside the typical band (or when
 * impossible). `shown` writes a stored figure in the units the screen shows (its number and unit); by default
 * the stored unit, which the unit rewriting of sentences (shared/units/text.ts) reads as one range in one unit.
 */
export function unusualValue(range: InputRange, value: number, shown: (stored: number) => { value: string; unit: string } = (v) => ({ value: formatRangeValue(v), unit: range.unit })): string | null {
  if (!Number.isFinite(value) || impossibleValue(range, value)) return null;
  const [lo, hi] = range.typical;
  if (value >= lo && value <= hi) return null;
  const [v, a, b] = [shown(value), shown(lo), shown(hi)];
  const unit = (u: string) => (u ? ` ${u}` : '');
  return `${v.value}${unit(v.unit)} is unusual for a ${range.label} (typical ${a.value} to ${b.value}${unit(b.unit)})`;
}

/** The range of a vehicle form field by its document path (`front.tyre.verticalRateNPerMm` → `verticalRateNPerMm`). */
export function vehicleRangeFor(path: string): InputRange | undefined {
  const key = path.replace(/^(front|rear)\./, '').replace(/^tyre\./, '');
  return VEHICLE_RANGES[key];
}
