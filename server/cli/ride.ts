/**
 * `rollwise ride --vehicle FILE --axle front|rear --road-class A..H --speed=KPH
 *  [--corner FILE] [--radius=M] [--bump=HEIGHT_MM:LENGTH_MM] [--landing=DROP_MM] [--travel=DROOP_MM:BUMP_MM] [--summary]`
 * The ride model and bump cost of one axle on an ISO 8608 road (docs/ride.md).
 * Bad input → exit 2 naming the field; a pose out of reach → exit 3.
 */
import { InputError } from '../../shared/errors.js';
import { computeRide } from '../../shared/ride/api.js';
import { convertUnitEntries } from '../../shared/schema/units.js';
import { parseArgs, readJsonFile, requireArg, runCommand, type CliIo } from './args.js';

const KNOWN = ['vehicle', 'axle', 'road-class', 'speed', 'corner', 'radius', 'bump', 'landing', 'travel', 'summary'];

/** Request fields → the flag or file that carries them, for error messages. */
const FLAGS: [string, string][] = [
  ['roadClass', '--road-class'],
  ['speedKph', '--speed'],
  ['axle', '--axle'],
  ['cornerRadiusM', '--radius'],
  ['bump', '--bump'],
  ['landing', '--landing'],
  ['travelRangeMm', '--travel'],
  ['corner', '--corner'],
  ['vehicle', '--vehicle (vehicle)'],
];

function numberArg(args: Map<string, string>, name: string): number | undefined {
  const v = args.get(name);
  if (v === undefined) return undefined;
  const n = Number(v);
  if (v === 'true' || v.trim() === '' || !Number.isFinite(n)) throw new InputError(`--${name} must be a number, got "${v}"`, [{ path: `--${name}`, message: 'expected a number' }]);
  return n;
}

function renamePath(p: string): string {
  for (const [field, flag] of FLAGS) {
    if (p === field || p.startsWith(`${field}.`) || p.startsWith(`${field}[`)) {
      return flag === '--vehicle (vehicle)' ? `--vehicle: vehicle${p.slice(field.length)}` : `${flag}${p.length > field.length ? ` (${p})` : ''}`;
    }
  }
  return p;
}

export async function rideCommand(argv: string[], io: CliIo): Promise<number> {
  return runCommand(io, () => {
    const args = parseArgs(argv);
    for (const k of args.keys()) if (!KNOWN.includes(k)) throw new InputError(`--${k}: unknown option (expected ${KNOWN.map((a) => `--${a}`).join(', ')})`, [{ path: `--${k}`, message: 'unknown option' }]);
    const vehicleDoc = readJsonFile(requireArg(args, 'vehicle'), '--vehicle');
    let vehicle: unknown;
    try {
      vehicle = convertUnitEntries(vehicleDoc);
    } catch (e) {
      if (e instanceof InputError) throw new InputError(`--vehicle: ${e.message}`, e.issues.map((i) => ({ ...i, path: `vehicle.${i.path}` })));
      throw e;
    }
    const input: Record<string, unknown> = {
      vehicle,
      axle: requireArg(args, 'axle'),
      roadClass: requireArg(args, 'road-class').toUpperCase(),
      speedKph: numberArg(args, 'speed') ?? requireArg(args, 'speed'),
    };
    if (args.has('corner')) input['corner'] = readJsonFile(requireArg(args, 'corner'), '--corner');
    const radius = numberArg(args, 'radius');
    if (radius !== undefined) input['cornerRadiusM'] = radius;
    const bump = args.get('bump');
    if (bump !== undefined) {
      const parts = bump.split(':');
      const nums = parts.map((x) => (x.trim() === '' ? Number.NaN : Number(x)));
      if (parts.length !== 2 || nums.some((n) => !Number.isFinite(n))) {
        throw new InputError(`--bump must be HEIGHT_MM:LENGTH_MM with numbers, got "${bump}"`, [{ path: '--bump', message: 'expected HEIGHT_MM:LENGTH_MM' }]);
      }
      input['bump'] = { heightMm: nums[0], lengthMm: nums[1] };
    }
    const travel = args.get('travel');
    if (travel !== undefined) {
      const parts = travel.split(':').map((x) => (x.trim() === '' ? Number.NaN : Number(x)));
      if (parts.length !== 2 || parts.some((n) => !Number.isFinite(n))) {
        throw new InputError(`--travel must be DROOP_MM:BUMP_MM with numbers, got "${travel}"`, [{ path: '--travel', message: 'expected DROOP_MM:BUMP_MM' }]);
      }
      input['travelRangeMm'] = parts;
    }
    const landing = numberArg(args, 'landing');
    if (landing !== undefined) input['landing'] = { dropHeightMm: landing };
    let result: ReturnType<typeof computeRide>;
    try {
      result = computeRide(input);
    } catch (e) {
      if (e instanceof InputError) {
        const issues = e.issues.map((i) => ({ path: renamePath(i.path), message: i.message }));
        throw new InputError(`${issues[0]?.path ?? 'input'}: ${issues[0]?.message ?? e.message}`, issues);
      }
      throw e;
    }
    if (args.get('summary') !== 'true') return result;
    return {
      vehicleName: result.vehicleName,
      axle: result.axle,
      roadInWords: result.roadInWords,
      wheelTravelRmsMm: result.wheelTravelRmsMm,
      bodyAccelerationRmsMS2: result.bodyAccelerationRmsMS2,
      tyreLoadRmsN: result.tyreLoadRmsN,
      toeRmsDeg: result.toeRmsDeg,
      steering: result.steering.map((s) => ({ condition: s.condition, rackMm: s.rackMm, toeRmsDeg: s.toeRmsDeg, uncorrelated: s.uncorrelated })),
      bump: result.bump,
      landing: result.landing,
      caution: result.caution,
    };
  });
}
