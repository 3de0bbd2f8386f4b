import type { AxleName } from '../../../../shared/schema/axle';
/**
 * The vehicle data of the balance model as form fields: dotted path into the
 * vehicle document, label in plain words, and the unit the document stores
 * (the unit in the key's name, shared/schema/units.ts).
 */
export interface VehicleField {
  readonly path: string;
  readonly label: string;
  /** Stored unit as mathjs reads it, or null for a pure number. */
  readonly storedUnit: string | null;
  /** How the unit is written on screen when it has no inch/pound form. */
  readonly plainUnit: string;
  readonly required: boolean;
  /** An anti-roll bar field: of the bar given by its roll rate, or by its geometry (one or the other is stored). */
  readonly bar?: 'rate' | 'geometry';
  /** What replaces this value in the balance view when an axle design is chosen there (said beside the field). */
  readonly linked?: string;
}

export interface VehicleFieldGroup {
  readonly id: string;
  readonly title: string;
  readonly fields: readonly VehicleField[];
}

function f(path: string, label: string, storedUnit: string | null, plainUnit: string, required = false, more: Pick<VehicleField, 'bar' | 'linked'> = {}): VehicleField {
  return { path, label, storedUnit, plainUnit, required, ...more };
}

/** The note beside a value the balance view takes from the chosen axle design's kinematics instead. */
const FROM_KINEMATICS = 'The balance view uses the axle design\'s kinematics instead when a design is chosen there.';
const FROM_BAR_DRAWN = 'Replaced in the balance view by the bar drawn on the axle design, when it has one.';

function axleFields(axle: AxleName): VehicleField[] {
  const p = (k: string) => `${axle}.${k}`;
  return [
    f(p('trackMm'), 'Track', 'mm', 'mm', true),
    f(p('rollCentreHeightMm'), 'Roll-centre height', 'mm', 'mm', true, { linked: FROM_KINEMATICS }),
    f(p('unsprungMassKg'), 'Unsprung mass (axle)', 'kg', 'kg'),
    f(p('unsprungCgHeightMm'), 'Unsprung CG height', 'mm', 'mm'),
    f(p('tyre.corneringStiffnessNPerDeg'), 'Cornering stiffness per tyre', 'N / deg', 'N/deg'),
    f(p('tyre.axleComplianceDegPerG'), 'Axle tyre compliance (instead of the stiffness)', null, 'deg/g'),
    f(p('tyre.loadSensitivity.a'), 'Load sensitivity a (Cα = a·Fz − b·Fz², per tyre)', null, '1/deg'),
    f(p('tyre.loadSensitivity.b'), 'Load sensitivity b', 'deg^-1 N^-1', '1/(deg·N)'),
    f(p('tyre.camberStiffnessNPerDeg'), 'Camber stiffness per tyre', 'N / deg', 'N/deg'),
    f(p('tyre.verticalRateNPerMm'), 'Tyre vertical rate', 'N / mm', 'N/mm'),
    f(p('tyre.pneumaticTrailMm'), 'Pneumatic trail', 'mm', 'mm'),
    f(p('tyre.relaxationLengthMm'), 'Tyre relaxation length', 'mm', 'mm'),
    f(p('spring.rateNPerMm'), 'Spring rate', 'N / mm', 'N/mm'),
    f(p('spring.motionRatio'), 'Spring motion ratio (spring per wheel travel)', null, 'ratio', false, { linked: FROM_KINEMATICS }),
    f(p('damper.wheelRateNsPerMm'), 'Damper rate at the wheel', 'N s / mm', 'N·s/mm'),
    f(p('antiRollBar.rollRateNmPerDeg'), 'Anti-roll bar roll rate', 'N m / deg', 'N·m/deg', false, { bar: 'rate' }),
    f(p('antiRollBar.outerDiameterMm'), 'Bar outer diameter', 'mm', 'mm', false, { bar: 'geometry' }),
    f(p('antiRollBar.innerDiameterMm'), 'Bar inner diameter (empty or 0: solid)', 'mm', 'mm', false, { bar: 'geometry' }),
    f(p('antiRollBar.activeLengthMm'), 'Bar active (twisting) length', 'mm', 'mm', false, { bar: 'geometry' }),
    f(p('antiRollBar.leverLengthMm'), 'Bar lever length', 'mm', 'mm', false, { bar: 'geometry', linked: FROM_BAR_DRAWN }),
    f(p('antiRollBar.linkMotionRatio'), 'Bar drop-link motion ratio', null, 'ratio', false, { bar: 'geometry', linked: FROM_BAR_DRAWN }),
    f(p('antiRollBar.twistRadPerM'), 'Bar twist per wheel travel (instead of lever and link)', null, 'rad/m', false, { bar: 'geometry', linked: FROM_BAR_DRAWN }),
    f(p('antiRollBar.shearModulusGPa'), 'Bar shear modulus (empty: steel, 79.3 GPa = 11.5 Mpsi)', 'GPa', 'GPa', false, { bar: 'geometry' }),
    f(p('rollStiffnessNmPerDeg'), 'Roll stiffness entered directly (replaces spring and bar)', 'N m / deg', 'N·m/deg'),
    f(p('rollSteerCoefficient'), 'Roll steer coefficient ε (+ out of the turn)', null, 'deg/deg', false, { linked: FROM_KINEMATICS }),
    f(p('rollCamberDegPerDeg'), 'Roll camber coefficient', null, 'deg/deg', false, { linked: FROM_KINEMATICS }),
    f(p('mechanicalTrailMm'), 'Mechanical trail', 'mm', 'mm', false, { linked: FROM_KINEMATICS }),
    f(p('complianceSteerDegPerKN'), 'Compliance steer (+ out of the turn)', 'deg / kN', 'deg/kN'),
    f(p('complianceCamberDegPerKN'), 'Compliance camber (+ wheels lean out)', 'deg / kN', 'deg/kN'),
    f(p('steeringStiffnessNmPerDeg'), 'Steering stiffness against aligning torque', 'N m / deg', 'N·m/deg'),
  ];
}

export const VEHICLE_FIELD_GROUPS: readonly VehicleFieldGroup[] = [
  {
    id: 'whole',
    title: 'Whole vehicle',
    fields: [
      f('massKg', 'Total mass', 'kg', 'kg', true),
      f('wheelbaseMm', 'Wheelbase', 'mm', 'mm', true),
      f('cgToFrontAxleMm', 'CG behind the front axle', 'mm', 'mm', true),
      f('cgHeightMm', 'CG height', 'mm', 'mm', true),
      f('yawInertiaKgM2', 'Yaw inertia', 'kg m^2', 'kg·m²', true),
      f('rollInertiaKgM2', 'Roll inertia of the sprung mass', 'kg m^2', 'kg·m²'),
      f('rollDampingNmsPerDeg', 'Roll damping', 'N m s / deg', 'N·m·s/deg'),
      f('steeringRatio', 'Overall steering ratio (handwheel per road wheel)', null, 'ratio'),
    ],
  },
  { id: 'front', title: 'Front axle', fields: axleFields('front') },
  { id: 'rear', title: 'Rear axle', fields: axleFields('rear') },
];

export const ALL_VEHICLE_FIELDS: readonly VehicleField[] = VEHICLE_FIELD_GROUPS.flatMap((g) => g.fields);

/** Reads a dotted path from a document (undefined where absent). */
export function readPath(doc: unknown, path: string): unknown {
  let v: unknown = doc;
  for (const k of path.split('.')) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<string, unknown>)[k];
  }
  return v;
}

/**
 * Writes (or with `undefined` removes) a dotted path in a document, creating
 * objects on the way; removes an object left empty by a removal.
 */
export function writePath(doc: Record<string, unknown>, path: string, value: number | undefined): void {
  const keys = path.split('.');
  const parents: Record<string, unknown>[] = [doc];
  let o = doc;
  for (const k of keys.slice(0, -1)) {
    if (o[k] === null || typeof o[k] !== 'object') {
      if (value === undefined) return;
      o[k] = {};
    }
    o = o[k] as Record<string, unknown>;
    parents.push(o);
  }
  const last = keys[keys.length - 1]!;
  if (value === undefined) delete o[last];
  else o[last] = value;
  for (let i = keys.length - 1; i > 0 && value === undefined; i--) {
    const child = parents[i]!;
    if (Object.keys(child).length === 0) delete parents[i - 1]![keys[i - 1]!];
  }
}

/** How an axle's anti-roll bar is given: by its roll rate, by its geometry, or none. */
export type BarMode = 'rate' | 'geometry' | 'none';

/** The bar mode of a stored axle (`front` / `rear`). */
export function barModeOf(data: unknown, axle: AxleName): BarMode {
  const bar = readPath(data, `${axle}.antiRollBar`);
  if (!bar || typeof bar !== 'object') return 'none';
  return 'rollRateNmPerDeg' in bar ? 'rate' : 'geometry';
}

/** A field's label as it reads inside a sentence ("the wheelbase"). */
function inSentence(field: VehicleField): string {
  return `the ${field.label.charAt(0).toLowerCase()}${field.label.slice(1)}`.replace(/ \(.*\)$/, '');
}

/** Checks of the vehicle document that span fields, in the user's words, by the schema's own message. */
const RULES: readonly [RegExp, string][] = [
  [/must be less than wheelbaseMm/, 'must be less than the wheelbase'],
  [/unsprung masses must be less than massKg/, 'the two axles\' unsprung masses together must be less than the total mass'],
  [/required when unsprungMassKg is given/, 'is needed when an unsprung mass is given'],
  [/give spring \(rateNPerMm, motionRatio\) or rollStiffnessNmPerDeg/, 'give the spring rate and motion ratio, or a roll stiffness entered directly'],
  [/give corneringStiffnessNPerDeg, axleComplianceDegPerG or loadSensitivity/, 'give the cornering stiffness, the axle tyre compliance or the load sensitivity'],
  [/innerDiameterMm must be smaller than outerDiameterMm/, 'must be smaller than the bar outer diameter'],
  [/give leverLengthMm and linkMotionRatio, or twistRadPerM/, 'give the bar lever length and drop-link motion ratio, or the bar twist per wheel travel'],
];

/**
 * A vehicle-schema issue in the user's words, never the document's keys: the
 * rules across fields by their meaning, other messages with every key named by
 * its label ("massKg must be > 0" → "the total mass must be > 0").
 */
export function vehicleIssueText(message: string): string {
  for (const [pattern, words] of RULES) if (pattern.test(message)) return words;
  return message.replace(/\b(?:[a-z]+\.)*[a-z]+(?:[A-Z][a-z0-9]*)+\b/g, (key) => {
    const field = ALL_VEHICLE_FIELDS.find((x) => x.path === key || x.path.endsWith(`.${key}`));
    return field ? inSentence(field) : key;
  });
}

/** Where a vehicle-schema issue belongs, in words: "Front axle, track" or "Whole vehicle". */
export function vehicleIssuePlace(path: readonly PropertyKey[]): string {
  const dotted = path.map(String).join('.');
  const group = VEHICLE_FIELD_GROUPS.find((g) => g.id === String(path[0])) ?? VEHICLE_FIELD_GROUPS[0]!;
  const field = ALL_VEHICLE_FIELDS.find((x) => x.path === dotted);
  return field ? `${group.title}, ${field.label.charAt(0).toLowerCase()}${field.label.slice(1)}` : group.title;
}
