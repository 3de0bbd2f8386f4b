/**
 * `rollwise compliance`: a corner's compliance from its bushings at one pose
 * (docs/compliance.md). Bad input → exit 2 naming the field or flag; an
 * unreachable pose → exit 3 with the travel and rack in the message.
 */
import { ENGINE_VERSION } from '../../shared/version.js';
import { computeCornerCompliance } from '../../shared/compliance/api.js';
import { parseArgs, readJsonFile, requireArg, runCommand, type CliIo } from './args.js';
import { optionalNumber, rejectUnknown, withFlags } from './kinematics.js';

/** `compliance --corner FILE [--travel=MM] [--rack=MM]` */
export function complianceCommand(argv: string[], io: CliIo): Promise<number> {
  return runCommand(io, () => {
    const args = parseArgs(argv);
    rejectUnknown(args, ['corner', 'travel', 'rack']);
    const cornerPath = requireArg(args, 'corner');
    const corner = readJsonFile(cornerPath, '--corner');
    const request = { corner, travelMm: optionalNumber(args, 'travel'), rackMm: optionalNumber(args, 'rack') };
    const result = withFlags(() => computeCornerCompliance(request), { corner: `--corner ${cornerPath}:`, travelMm: '--travel', rackMm: '--rack' });
    if (result.rigid) io.stderr('rollwise: the corner gives no bushings, link or steering rates: it is rigid (zero compliance)\n');
    return { engineVersion: ENGINE_VERSION, ...result };
  });
}
