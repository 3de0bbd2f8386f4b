/** `rollwise solve --intent FILE`: back-solve tie-rod heights for a handling intent (docs/intent.md). */
import { computeSolve } from '../../shared/intent/api.js';
import { InputError } from '../../shared/errors.js';
import { parseArgs, readJsonFile, requireArg, runCommand, type CliIo } from './args.js';

export async function solveCommand(argv: string[], io: CliIo): Promise<number> {
  return runCommand(io, () => {
    const args = parseArgs(argv);
    for (const k of args.keys()) {
      if (k !== 'intent') throw new InputError(`unknown option --${k} (solve takes --intent FILE)`, [{ path: `--${k}`, message: 'unknown option' }]);
    }
    const file = requireArg(args, 'intent');
    return computeSolve(readJsonFile(file, '--intent'));
  });
}
