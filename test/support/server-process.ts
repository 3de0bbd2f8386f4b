/** The real server (server/main.ts) in its own process, for the load script and the benches. */
import { spawn, type ChildProcess } from 'node:child_process';
import { join, resolve } from 'node:path';

const here = resolve(import.meta.dirname);

export /** Runs `node --import tsx server/main.ts` with the given environment; resolves with its URL once it listens. */
function startServerProcess(env: Record<string, string>): Promise<{ url: string; pid: number; close(): Promise<void> }> {
  const main = join(here, '..', '..', 'server', 'main.ts');
  const child: ChildProcess = spawn(process.execPath, ['--import', 'tsx', main], {
    env: { ...process.env, NODE_ENV: 'development', ...env },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  const close = () =>
    new Promise<void>((resolve) => {
      if (child.exitCode !== null) return resolve();
      child.once('exit', () => resolve());
      child.kill('SIGTERM');
    });
  return new Promise((resolve, reject) => {
    let out = '';
    const timer = setTimeout(() => {
      void close();
      reject(new Error(`the server did not start within 60 s:\n${out}`));
    }, 60_000);
    child.stdout!.on('data', (d: Buffer) => {
      out += d.toString();
      const m = /Rollwise is running at (\S+)/.exec(out);
      if (m) {
        clearTimeout(timer);
        resolve({ url: m[1]!, pid: child.pid!, close });
      }
    });
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`the server exited (${code}) before it listened:\n${out}`));
    });
  });
}


/** The server on a throwaway database, seeded with the demo (a low bcrypt cost keeps start-up short; sign-in cost is not what is measured), API only. */
export function startSeededServer(databaseUrl: string, env: Record<string, string> = {}): Promise<{ url: string; pid: number; close(): Promise<void> }> {
  return startServerProcess({
    DATABASE_URL: databaseUrl,
    HOST: '127.0.0.1',
    PORT: '0',
    ROLLWISE_SEED_DEMO: 'true',
    LOG_LEVEL: 'warn',
    ROLLWISE_STATIC_DIR: join(here, 'no-static-dir'),
    BCRYPT_ROUNDS: '4',
    ...env,
  });
}
