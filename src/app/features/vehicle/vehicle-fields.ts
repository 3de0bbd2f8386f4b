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
}

export interface VehicleFieldGroup {
  readonly id: string;
  readonly title: string;
  readonly fields: readonly VehicleField[];
}

function f(path: string, label: string, storedUnit: string | null, plainUnit: string, required = false): VehicleField {
  return { path, label, storedUnit, plainUnit, required };
}

function axleFields(axle: 'front' | 'rear'): VehicleField[] {
  const p = (k: string) => `${axle}.${k}`;
  return [
    f(p('trackMm'), 'Track', 'mm', 'mm', true),
    f(p('rollCentreHeightMm'), 'Roll-centre height', 'mm', 'mm', true),
    f(p('unsprungMassKg'), 'Unsprung mass (axle)', 'kg', 'kg'),
    f(p('unsprungCgHeightMm'), 'Unsprung CG height', 'mm', 'mm'),
    f(p('tyre.corneringStiffnessNPerDeg'), 'Cornering stiffness per tyre', 'N / deg', 'N/deg'),
    f(p('tyre.camberStiffnessNPerDeg'), 'Camber stiffness per tyre', 'N / deg', 'N/deg'),
    f(p('tyre.verticalRateNPerMm'), 'Tyre vertical rate', 'N / mm', 'N/mm'),
    f(p('tyre.pneumaticTrailMm'), 'Pneumatic trail', 'mm', 'mm'),
    f(p('spring.rateNPerMm'), 'Spring rate', 'N / mm', 'N/mm'),
    f(p('spring.motionRatio'), 'Spring motion ratio (spring per wheel travel)', null, 'ratio'),
    f(p('antiRollBar.rollRateNmPerDeg'), 'Anti-roll bar roll rate', 'N m / deg', 'N·m/deg'),
    f(p('rollStiffnessNmPerDeg'), 'Roll stiffness entered directly (replaces spring and bar)', 'N m / deg', 'N·m/deg'),
    f(p('rollSteerCoefficient'), 'Roll steer coefficient ε (+ out of the turn)', null, 'deg/deg'),
    f(p('rollCamberDegPerDeg'), 'Roll camber coefficient', null, 'deg/deg'),
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
