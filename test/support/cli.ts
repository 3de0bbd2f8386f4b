/**
 * The rollwise command line for tests. `runCli` calls the program in this
 * process (`runRollwise` with writers that collect stdout and stderr): the
 * same argument parsing, commands, exit codes and messages as a user's run,
 * without starting node + tsx for each case (1–3 s each on a busy 2-core
 * machine). `spawnCli` runs it as a user does, in its own process, for the
 * one smoke test that checks the entry point, real streams and exit status.
 * Relative paths in arguments resolve against the working directory, as in a
 * shell: vitest runs from the repository root.
 */
import { spawn } from 'node:child_process';
import { join, resolve } from 'node:path';
import { runRollwise } from '../../server/cli/rollwise.js';

export interface CliRun {
  code: number | null;
  stdout: string;
  stderr: string;
}

const root = resolve(import.meta.dirname, '..', '..');

export async function runCli(...argv: string[]): Promise<CliRun> {
  let stdout = '';
  let stderr = '';
  const code = await runRollwise(argv, { stdout: (t) => void (stdout += t), stderr: (t) => void (stderr += t) });
  return { code, stdout, stderr };
}

/** `node --import tsx server/cli/rollwise.ts …` from the repository root, as `npm run --silent rollwise -- …` runs it. */
export function spawnCli(...argv: string[]): Promise<CliRun> {
  return new Promise((done, fail) => {
    const child = spawn(process.execPath, ['--import', 'tsx', join(root, 'server', 'cli', 'rollwise.ts'), ...argv], { cwd: root, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    child.on('error', fail);
    child.on('close', (code) => done({ code, stdout, stderr }));
  });
}
