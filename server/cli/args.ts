/** Small argument helpers shared by the rollwise command line's subcommands. */
import { readFileSync } from 'node:fs';
import { InputError, SolveError } from '../../shared/errors.js';

/** Parses `--key=value`, `--key value` and bare `--flag` into a map. */
export function parseArgs(argv: string[]): Map<string, string> {
  const out = new Map<string, string>();
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    if (!a.startsWith('--')) throw new InputError(`Unexpected argument "${a}"`, [{ path: a, message: 'unexpected argument' }]);
    const eq = a.indexOf('=');
    if (eq > 0) out.set(a.slice(2, eq), a.slice(eq + 1));
    else if (i + 1 < argv.length && !argv[i + 1]!.startsWith('--')) out.set(a.slice(2), argv[++i]!);
    else out.set(a.slice(2), 'true');
  }
  return out;
}

export function requireArg(args: Map<string, string>, name: string): string {
  const v = args.get(name);
  if (v === undefined || v === 'true') throw new InputError(`--${name} is required`, [{ path: `--${name}`, message: 'required' }]);
  return v;
}

/** Reads and parses a JSON file; a missing or malformed file is an InputError naming it. */
export function readJsonFile(path: string, field: string): unknown {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch {
    throw new InputError(`${field}: cannot read file "${path}"`, [{ path: field, message: `cannot read file ${path}` }]);
  }
  try {
    return JSON.parse(text);
  } catch (e) {
    throw new InputError(`${field}: "${path}" is not valid JSON (${(e as Error).message})`, [{ path: field, message: 'not valid JSON' }]);
  }
}

/** `FROM:TO:STEP` → numbers; names the flag on failure. */
export function parseRange(value: string, flag: string): { from: number; to: number; step: number } {
  const parts = value.split(':').map(Number);
  if (parts.length !== 3 || parts.some((n) => !Number.isFinite(n))) {
    throw new InputError(`--${flag} must be FROM:TO:STEP with numbers, got "${value}"`, [{ path: `--${flag}`, message: 'expected FROM:TO:STEP' }]);
  }
  return { from: parts[0]!, to: parts[1]!, step: parts[2]! };
}

/** `a,b,c` → numbers. */
export function parseList(value: string, flag: string): number[] {
  const parts = value.split(',').map((s) => Number(s.trim()));
  if (parts.length === 0 || parts.some((n) => !Number.isFinite(n))) {
    throw new InputError(`--${flag} must be a comma-separated list of numbers, got "${value}"`, [{ path: `--${flag}`, message: 'expected numbers' }]);
  }
  return parts;
}

/**
 * Where a command writes: the process's own streams when run as a program,
 * strings collected by a test when run in-process (test/support/cli.ts).
 */
export interface CliIo {
  stdout(text: string): void;
  stderr(text: string): void;
}

export const processIo: CliIo = {
  stdout: (text) => void process.stdout.write(text),
  stderr: (text) => void process.stderr.write(text),
};

/** Runs a subcommand body, mapping typed errors to exit codes: 2 bad input, 3 unsolvable pose. */
export async function runCommand(io: CliIo, body: () => Promise<unknown> | unknown): Promise<number> {
  try {
    const result = await body();
    io.stdout(JSON.stringify(result, null, 2) + '\n');
    return 0;
  } catch (e) {
    if (e instanceof InputError) {
      io.stderr(`rollwise: ${e.message}\n`);
      for (const i of e.issues.slice(1, 10)) io.stderr(`  ${i.path}: ${i.message}\n`);
      return 2;
    }
    if (e instanceof SolveError) {
      io.stderr(`rollwise: ${e.message}\n`);
      return 3;
    }
    io.stderr(`rollwise: internal error: ${(e as Error).stack ?? e}\n`);
    return 1;
  }
}
