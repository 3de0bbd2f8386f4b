/**
 * The command line's help: `rollwise --help` (or `help`, `-h`) lists every
 * command on stdout and exits 0; an unknown command lists them on stderr and
 * exits 2. Source: common practice for command-line tools (POSIX utility
 * conventions: help on request is not an error; usage errors exit non-zero).
 */
import { describe, expect, it } from 'vitest';
import { runCli } from '../support/cli.js';

describe('rollwise help', { timeout: 60_000 }, () => {
  it('--help, help and -h list the commands on stdout and exit 0', async () => {
    for (const flag of ['--help', 'help', '-h']) {
      const r = await runCli(flag);
      expect(r.code, flag).toBe(0);
      expect(r.stderr).toBe('');
      for (const c of ['sweep', 'roll', 'compliance', 'balance', 'ride', 'solve', 'study']) expect(r.stdout).toContain(`  ${c} `);
    }
  });

  it('an unknown command lists the commands on stderr and exits 2', async () => {
    const r = await runCli('sweeep');
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain('unknown command "sweeep"');
    expect(r.stderr).toContain('  sweep ');
  });
});
