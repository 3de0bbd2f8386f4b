/**
 * The one real-process run of the command line: `node --import tsx
 * server/cli/rollwise.ts …` from the repository root, as `npm run --silent
 * rollwise -- …` starts it. Every other CLI test calls the same runner
 * in-process (test/support/cli.ts); this one checks what only a real process
 * shows: the entry point runs, JSON reaches stdout, messages reach stderr and
 * the exit code reaches the shell. Source: README "Command line" (prints
 * JSON; bad input exits 2 naming the field or flag).
 */
import { describe, expect, it } from 'vitest';
import { spawnCli } from '../support/cli.js';

describe('rollwise as a process', () => {
  it('prints JSON and exits 0 for a good sweep; exits 2 naming the flag for a bad one', async () => {
    const ok = await spawnCli('sweep', '--corner', 'test/fixtures/corners/fs-front-wishbone.json', '--travel=-10:10:5');
    expect(ok.stderr).toBe('');
    expect(ok.code).toBe(0);
    const out = JSON.parse(ok.stdout) as { rows: { travelMm: number }[] };
    expect(out.rows.map((r) => r.travelMm)).toEqual([-10, -5, 0, 5, 10]);

    const bad = await spawnCli('sweep', '--corner', 'test/fixtures/corners/fs-front-wishbone.json', '--travel=-10:10');
    expect(bad.code).toBe(2);
    expect(bad.stdout).toBe('');
    expect(bad.stderr).toMatch(/^rollwise: --travel must be FROM:TO:STEP/);
  }, 120_000);
});
