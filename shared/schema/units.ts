/**
 * Unit entry for vehicle documents: a numeric field may be written as a
 * quantity with its unit ("48 in", "650 lb", "180 lbf/in") and is converted
 * through mathjs to the SI-based unit the document stores (the unit in the
 * field's name). Also converts stored values for display in inch/pound
 * units. mathjs is large: the app loads this module lazily (dynamic import),
 * and only `unit` is imported from it.
 */
import { createUnit, unit } from 'mathjs';
import { InputError, type FieldIssue } from '../errors.js';

/** Stored unit of every numeric vehicle field, by key (docs/balance.md lists them). */
export const VEHICLE_FIELD_UNITS: Readonly<Record<string, string>> = {
  massKg: 'kg',
  unsprungMassKg: 'kg',
  wheelbaseMm: 'mm',
  cgToFrontAxleMm: 'mm',
  cgHeightMm: 'mm',
  trackMm: 'mm',
  rollCentreHeightMm: 'mm',
  unsprungCgHeightMm: 'mm',
  pneumaticTrailMm: 'mm',
  relaxationLengthMm: 'mm',
  outerDiameterMm: 'mm',
  innerDiameterMm: 'mm',
  activeLengthMm: 'mm',
  leverLengthMm: 'mm',
  yawInertiaKgM2: 'kg m^2',
  rollInertiaKgM2: 'kg m^2',
  rollDampingNmsPerDeg: 'N m s / deg',
  corneringStiffnessNPerDeg: 'N / deg',
  camberStiffnessNPerDeg: 'N / deg',
  verticalRateNPerMm: 'N / mm',
  rateNPerMm: 'N / mm',
  wheelRateNsPerMm: 'N s / mm',
  rollRateNmPerDeg: 'N m / deg',
  rollStiffnessNmPerDeg: 'N m / deg',
  steeringStiffnessNmPerDeg: 'N m / deg',
  complianceSteerDegPerKN: 'deg / kN',
  complianceCamberDegPerKN: 'deg / kN',
  axleComplianceDegPerG: 'deg',
  shearModulusGPa: 'GPa',
};

/**
 * The kilopound-force (1000 lbf), which mathjs lacks (lbf takes no prefix): compliance per force reads
 * in deg/klbf on every screen, as in deg/kN in SI. Defined once per mathjs instance.
 */
try {
  createUnit('klbf', '1000 lbf');
} catch {
  // Already defined: this module was evaluated again against the same mathjs (a test runner's reload).
}

/** Inch/pound display units for the stored ones (fields with no such unit keep theirs). */
export const IMPERIAL_UNITS: Readonly<Record<string, string>> = {
  kg: 'lb',
  mm: 'in',
  'kg m^2': 'lb ft^2',
  'N m s / deg': 'lbf ft s / deg',
  'N / deg': 'lbf / deg',
  'N / mm': 'lbf / in',
  'N s / mm': 'lbf s / in',
  'N m / deg': 'lbf ft / deg',
  'deg / kN': 'deg / klbf',
  GPa: 'psi',
  /** Tyre load sensitivity b, 1/(deg·N): mathjs reads a unit's inverse as a negative power. */
  'deg^-1 N^-1': 'deg^-1 lbf^-1',
};

/** Parses "48 in" into the number of `storedUnit` units; a bare number is taken as already stored. */
export function parseQuantity(text: string | number, storedUnit: string, field: string): number {
  if (typeof text === 'number') return text;
  const trimmed = text.trim();
  if (trimmed !== '' && Number.isFinite(Number(trimmed))) return Number(trimmed);
  let value: number;
  try {
    value = unit(trimmed).toNumber(storedUnit);
  } catch (e) {
    throw new InputError(`${field}: cannot read "${text}" as a quantity in ${storedUnit} units (${(e as Error).message})`, [
      { path: field, message: `expected a number or a quantity convertible to ${storedUnit}` },
    ]);
  }
  if (!Number.isFinite(value)) throw new InputError(`${field}: "${text}" is not a finite quantity`, [{ path: field, message: 'not finite' }]);
  return value;
}

/**
 * Returns a copy of a vehicle document with every quantity string at a known
 * numeric field converted to the stored unit. Every unreadable field is
 * reported at once (InputError naming each path); the input is not changed.
 */
export function convertUnitEntries(doc: unknown): unknown {
  const issues: FieldIssue[] = [];
  const walk = (v: unknown, path: string, key: string | null): unknown => {
    if (Array.isArray(v)) return v.map((x, i) => walk(x, `${path}[${i}]`, null));
    if (v !== null && typeof v === 'object') {
      const out: Record<string, unknown> = {};
      for (const [k, x] of Object.entries(v as Record<string, unknown>)) out[k] = walk(x, path ? `${path}.${k}` : k, k);
      return out;
    }
    const stored = key !== null ? VEHICLE_FIELD_UNITS[key] : undefined;
    if (typeof v === 'string' && stored !== undefined) {
      try {
        return parseQuantity(v, stored, path);
      } catch (e) {
        if (e instanceof InputError) {
          issues.push(...e.issues);
          return v;
        }
        throw e;
      }
    }
    return v;
  };
  const out = walk(doc, '', null);
  if (issues.length) throw new InputError(`Invalid unit entry: ${issues[0]!.path}: ${issues[0]!.message}`, issues);
  return out;
}

/** Converts a stored value to another unit of the same dimension, e.g. (1500, 'mm', 'in'). */
export function convertValue(value: number, fromUnit: string, toUnit: string): number {
  return unit(value, fromUnit).toNumber(toUnit);
}

/** Display of a stored field in inch/pound units: the value and its unit (unchanged where none applies). */
export function toImperial(field: string, value: number): { value: number; unit: string } {
  const stored = VEHICLE_FIELD_UNITS[field];
  const target = stored !== undefined ? IMPERIAL_UNITS[stored] : undefined;
  if (stored === undefined || target === undefined) return { value, unit: stored ?? '' };
  return { value: convertValue(value, stored, target), unit: target };
}
