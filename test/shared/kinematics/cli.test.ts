/** The rollwise sweep / roll commands, run in-process through the program's runner. Source: issue 3, "Interfaces: Command line" (JSON shape, exit 2 naming the field, exit 3 with the travel). */
import { describe, expect, it } from 'vitest';
import { runCli } from '../../support/cli.js';
import { mkdtempSync, writeFileSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const root = join(import.meta.dirname, '..', '..', '..');
const fixture = (n: string) => join(root, 'test', 'fixtures', 'corners', n);

// In-process: the program's own runner with collected output (test/support/cli.ts).
const run = runCli;

describe("rollwise sweep / roll", { timeout: 60_000 }, () => {
  it('sweep prints rows and fits as JSON', async () => {
    const r = await run('sweep', '--corner', fixture('fs-front-wishbone.json'), '--travel=-25:25:5', '--rack=-10,0,10');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.rows).toHaveLength(33);
    for (const k of ['travelMm', 'rackMm', 'toeDeg', 'camberDeg', 'steerDeg', 'halfTrackChangeMm', 'kingpinInclinationDeg', 'motionRatio']) expect(out.rows[0]).toHaveProperty(k);
    expect(out.rows[0].travelMm).toBe(-25);
    expect(out.fit.byRack).toHaveLength(3);
    expect(typeof out.fit.bumpSteerDegPerM).toBe('number');
    expect(out.engineVersion).toMatch(/^\d+\.\d+\.\d+$/);
  });

  it('roll prints the roll rows, ε and roll camber', async () => {
    const r = await run('roll', '--corner', fixture('road-front-strut.json'), '--roll=-3:3:0.5', '--rack=0,20', '--wheelbase=2650');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.rows).toHaveLength(26);
    expect(out.rows[0]).toHaveProperty('axleSteerDeg');
    expect(out.rows[0].rollDeg).toBe(-3);
    expect(typeof out.rollSteerCoefficient).toBe('number');
    expect(typeof out.rollCamberDegPerDeg).toBe('number');
    expect(out.byRack).toHaveLength(2);
  });

  it('bad input exits 2 naming the field', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'rollwise-cli-'));
    const bad = JSON.parse(readFileSync(fixture('fs-rear-wishbone.json'), 'utf8'));
    bad.points.lowerRear = [...bad.points.lowerFront];
    const file = join(dir, 'bad.json');
    writeFileSync(file, JSON.stringify(bad));
    const a = await run('sweep', '--corner', file, '--travel=-10:10:5');
    expect(a.code).toBe(2);
    expect(a.stderr).toContain('points.lowerRear');
    const b = await run('sweep', '--corner', fixture('fs-front-wishbone.json'), '--travel=-10:10');
    expect(b.code).toBe(2);
    expect(b.stderr).toContain('--travel');
    const c = await run('roll', '--corner', fixture('fs-front-wishbone.json'), '--roll=-1:1:1', '--rack=45');
    expect(c.code).toBe(2);
    expect(c.stderr).toContain('--rack');
    const d = await run('roll', '--corner', join(dir, 'missing.json'), '--roll=-1:1:1');
    expect(d.code).toBe(2);
    expect(d.stderr).toContain('--corner');
  });

  it('an unreachable pose exits 3 with the travel in the message', async () => {
    const r = await run('sweep', '--corner', fixture('road-rear-five-link.json'), '--travel=0:600:50');
    expect(r.code).toBe(3);
    expect(r.stderr).toMatch(/travel \d+ mm/);
    expect(r.stdout).toBe('');
  });
});
