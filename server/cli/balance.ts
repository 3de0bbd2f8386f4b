/**
 * `rollwise balance --vehicle FILE [--front-corner FILE --rear-corner FILE]
 *  [--speed=KPH] [--radius=M] [--ay=G] [--variant FILE] [--summary]`
 * Prints the balance result as JSON (docs/balance.md). Vehicle files may use
 * unit strings ("48 in", "650 lb"); they are converted to the stored units.
 */
import { computeBalance } from '../../shared/balance/api.js';
import { InputError } from '../../shared/errors.js';
import { convertUnitEntries } from '../../shared/schema/units.js';
import { parseArgs, readJsonFile, requireArg, runCommand, type CliIo } from './args.js';

const KNOWN = new Set(['vehicle', 'front-corner', 'rear-corner', 'speed', 'radius', 'ay', 'variant', 'summary']);

function numberArg(args: Map<string, string>, name: string): number | undefined {
  const v = args.get(name);
  if (v === undefined) return undefined;
  const n = Number(v);
  if (v === 'true' || !Number.isFinite(n)) throw new InputError(`--${name} must be a number, got "${v}"`, [{ path: `--${name}`, message: 'expected a number' }]);
  return n;
}

/** Reads a vehicle file, converting unit entries; errors name the file's flag and the field. */
function readVehicle(path: string, flag: string): unknown {
  const doc = readJsonFile(path, flag);
  try {
    return convertUnitEntries(doc);
  } catch (e) {
    if (e instanceof InputError) throw new InputError(`${flag}: ${e.message}`, e.issues.map((i) => ({ ...i, path: `vehicle.${i.path}` })));
    throw e;
  }
}

export async function balanceCommand(argv: string[], io: CliIo): Promise<number> {
  return runCommand(io, () => {
    const args = parseArgs(argv);
    for (const k of args.keys()) if (!KNOWN.has(k)) throw new InputError(`unknown option --${k}`, [{ path: `--${k}`, message: 'unknown option' }]);
    const input: Record<string, unknown> = { vehicle: readVehicle(requireArg(args, 'vehicle'), '--vehicle') };
    if (args.has('front-corner')) input['frontCorner'] = readJsonFile(requireArg(args, 'front-corner'), '--front-corner');
    if (args.has('rear-corner')) input['rearCorner'] = readJsonFile(requireArg(args, 'rear-corner'), '--rear-corner');
    const speed = numberArg(args, 'speed');
    if (speed !== undefined) input['speedKph'] = speed;
    const radius = numberArg(args, 'radius');
    if (radius !== undefined) input['cornerRadiusM'] = radius;
    const ay = numberArg(args, 'ay');
    if (ay !== undefined) input['lateralAccelerationG'] = ay;
    if (args.has('variant')) input['variant'] = { vehicle: readVehicle(requireArg(args, 'variant'), '--variant') };
    const result = computeBalance(input);
    if (args.get('summary') !== 'true') return result;
    return {
      vehicleName: result.vehicleName,
      rollGravityTerm: result.rollGravityTerm,
      rollGradientDegPerG: result.rollGradientDegPerG,
      rollStiffnessNmPerDeg: { front: result.rollStiffnessNmPerDeg.front, rear: result.rollStiffnessNmPerDeg.rear },
      lateralLoadTransfer: { frontNPerG: result.lateralLoadTransfer.frontNPerG, rearNPerG: result.lateralLoadTransfer.rearNPerG, frontShare: result.lateralLoadTransfer.frontShare },
      understeerBudget: result.understeerBudget,
      budgetTermLateralAccelerationG: result.budgetTermLateralAccelerationG,
      onCentreUndersteerGradientDegPerG: result.onCentreUndersteerGradientDegPerG,
      tyreLoadLaw: result.tyreLoadLaw,
      characteristicSpeedKph: result.characteristicSpeedKph,
      criticalSpeedKph: result.criticalSpeedKph,
      gains: result.gains,
      stepSteer: {
        steadyYawRateDegPerS: result.stepSteer.steadyYawRateDegPerS,
        responseTimeS: result.stepSteer.responseTimeS,
        peakTimeS: result.stepSteer.peakTimeS,
        overshootPct: result.stepSteer.overshootPct,
        settlingTimeS: result.stepSteer.settlingTimeS,
      },
      caution: result.caution,
    };
  });
}
