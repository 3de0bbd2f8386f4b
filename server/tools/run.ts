/** Child-process helpers for the start and test orchestration. */
import { spawn } from 'node:child_process';

export interface RunResult {
  code: number;
  output: string;
}

/** Runs a command, streaming its output through while keeping a copy. */
export function run(cmd: string, args: string[], env: NodeJS.ProcessEnv = process.env): Promise<RunResult> {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { env, stdio: ['ignore', 'pipe', 'pipe'] });
    let output = '';
    const tee = (chunk: Buffer, to: NodeJS.WriteStream) => {
      output += chunk.toString();
      to.write(chunk);
    };
    child.stdout.on('data', (c: Buffer) => tee(c, process.stdout));
    child.stderr.on('data', (c: Buffer) => tee(c, process.stderr));
    child.on('close', (code, signal) => resolve({ code: code ?? (signal ? 128 : 1), output }));
    child.on('error', (err) => resolve({ code: 127, output: String(err) }));
  });
}

export const bin = (name: string) => `node_modules/.bin/${name}`;
