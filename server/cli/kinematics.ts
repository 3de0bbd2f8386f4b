/**
 * `rollwise sweep` and `rollwise roll`: the corner and axle kinematics from
 * the command line. Bad input → exit 2 naming the field; an unreachable pose
 * → exit 3 with the travel and rack in the message (see docs/kinematics.md).
 */
import { InputError } from '../../shared/errors.js';
import { ENGINE_VERSION } from '../../shared/version.js';
import { computeAxleRoll, computeCornerSweep } from '../../shared/kinematics/api.js';
import { parseArgs, parseList, parseRange, readJsonFile, requireArg, runCommand, type CliIo } from './args.js';

export function rejectUnknown(args: Map<string, string>, allowed: string[]): void {
  for (const k of args.keys()) {
    if (!allowed.includes(k)) throw new InputError(`--${k}: unknown option (expected ${allowed.map((a) => `--${a}`).join(', ')})`, [{ path: `--${k}`, message: 'unknown option' }]);
  }
}

export function optionalNumber(args: Map<string, string>, name: string): number | undefined {
  const v = args.get(name);
  if (v === undefined) return undefined;
  const n = Number(v);
  if (v === 'true' || !Number.isFinite(n)) throw new InputError(`--${name} must be a number, got "${v}"`, [{ path: `--${name}`, message: 'expected a number' }]);
  return n;
}

/** Maps request-field paths in an InputError to the CLI's flags and files. */
export function withFlags<T>(body: () => T, map: Record<string, string>): T {
  try {
    return body();
  } catch (e) {
    if (e instanceof InputError) {
      const rename = (p: string) => {
        for (const [k, v] of Object.entries(map)) {
          if (p === k || p.startsWith(`${k}.`) || p.startsWith(`${k}[`)) {
            const rest = p.slice(k.length);
            return v.endsWith(':') ? `${v} ${rest.replace(/^\./, '')}`.trimEnd() : v + rest;
          }
        }
        return p;
      };
      const issues = e.issues.map((i) => ({ path: rename(i.path), message: i.message }));
      const orig = e.issues[0]?.path;
      // Keep the engine's full sentence; only its leading field path becomes the flag or file.
      const at = orig ? e.message.indexOf(`${orig}: `) : -1;
      const message = orig && at >= 0 ? `${rename(orig)}: ${e.message.slice(at + orig.length + 2)}` : e.message;
      throw new InputError(message, issues);
    }
    throw e;
  }
}

/** `sweep --corner FILE --travel=FROM:TO:STEP [--rack=R1,R2,…] [--fit=FROM:TO]` */
export function sweepCommand(argv: string[], io: CliIo): Promise<number> {
  return runCommand(io, () => {
    const args = parseArgs(argv);
    rejectUnknown(args, ['corner', 'travel', 'rack', 'fit']);
    const cornerPath = requireArg(args, 'corner');
    const corner = readJsonFile(cornerPath, '--corner');
    const travel = parseRange(requireArg(args, 'travel'), 'travel');
    const rack = args.get('rack');
    const fit = args.get('fit');
    let fitRange: { fromMm: number; toMm: number } | undefined;
    if (fit !== undefined) {
      const parts = fit.split(':').map(Number);
      if (parts.length !== 2 || parts.some((n) => !Number.isFinite(n))) throw new InputError(`--fit must be FROM:TO in mm, got "${fit}"`, [{ path: '--fit', message: 'expected FROM:TO' }]);
      fitRange = { fromMm: parts[0]!, toMm: parts[1]! };
    }
    const request = { corner, travel, rackMm: rack === undefined ? undefined : parseList(rack, 'rack'), fitRange };
    const result = withFlags(() => computeCornerSweep(request), { corner: `--corner ${cornerPath}:`, travel: '--travel', rackMm: '--rack', fitRange: '--fit' });
    return { engineVersion: ENGINE_VERSION, ...result };
  });
}

/** `roll --corner FILE --roll=FROM:TO:STEP [--rack=…] [--wheelbase=MM] [--right-corner FILE] [--axle=front|rear --cg-height=MM [--brake-front=F] [--drive-front=F]] [--rack-per-rev=MM]` */
export function rollCommand(argv: string[], io: CliIo): Promise<number> {
  return runCommand(io, () => {
    const args = parseArgs(argv);
    rejectUnknown(args, ['corner', 'roll', 'rack', 'wheelbase', 'right-corner', 'axle', 'cg-height', 'brake-front', 'drive-front', 'rack-per-rev']);
    const cornerPath = requireArg(args, 'corner');
    const corner = readJsonFile(cornerPath, '--corner');
    const rightPath = args.get('right-corner');
    const rightCorner = rightPath === undefined ? undefined : readJsonFile(rightPath, '--right-corner');
    const roll = parseRange(requireArg(args, 'roll'), 'roll');
    const rack = args.get('rack');
    const wheelbaseMm = optionalNumber(args, 'wheelbase');
    const cgHeightMm = optionalNumber(args, 'cg-height');
    const axle = args.get('axle');
    let anti: Record<string, unknown> | undefined;
    if (axle !== undefined || cgHeightMm !== undefined) {
      if (axle !== 'front' && axle !== 'rear') throw new InputError(`--axle must be front or rear, got "${axle ?? ''}"`, [{ path: '--axle', message: 'expected front or rear' }]);
      if (cgHeightMm === undefined || wheelbaseMm === undefined) {
        throw new InputError('--cg-height and --wheelbase are needed for anti-dive / anti-squat', [{ path: cgHeightMm === undefined ? '--cg-height' : '--wheelbase', message: 'required with --axle' }]);
      }
      anti = { axle, cgHeightMm, wheelbaseMm, brakeFrontFraction: optionalNumber(args, 'brake-front'), driveFrontFraction: optionalNumber(args, 'drive-front') };
    }
    const request = {
      corner,
      rightCorner,
      roll,
      rackMm: rack === undefined ? undefined : parseList(rack, 'rack'),
      wheelbaseMm,
      anti,
      rackMmPerHandwheelRev: optionalNumber(args, 'rack-per-rev'),
    };
    const result = withFlags(() => computeAxleRoll(request), {
      corner: `--corner ${cornerPath}:`,
      rightCorner: `--right-corner ${rightPath ?? ''}:`,
      roll: '--roll',
      rackMm: '--rack',
      wheelbaseMm: '--wheelbase',
      'anti.cgHeightMm': '--cg-height',
      'anti.brakeFrontFraction': '--brake-front',
      'anti.driveFrontFraction': '--drive-front',
      rackMmPerHandwheelRev: '--rack-per-rev',
    });
    return { engineVersion: ENGINE_VERSION, ...result };
  });
}
