/**
 * The command line of issue 5: `rollwise solve --intent FILE` prints the
 * result JSON (exit 0, also when infeasible: feasible false with the
 * reason); bad input exits 2 with a message naming the field.
 */
import { describe, expect, it } from 'vitest';
import { runCli } from '../../support/cli.js';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const root = join(import.meta.dirname, '..', '..', '..');
const fixture = (name: string) => join(root, 'test', 'fixtures', 'intents', `${name}.json`);
// In-process: the program's own runner with collected output (test/support/cli.ts).
const run = (...args: string[]) => runCli('solve', ...args);
const tmp = mkdtempSync(join(tmpdir(), 'rollwise-intent-'));

describe('rollwise solve', () => {
  it('prints the result of a feasible intent with the keys of issue 5', async () => {
    const r = await run('--intent', fixture('fs-front-roll-understeer'));
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    for (const k of ['feasible', 'geometry', 'achieved', 'family', 'sensitivity', 'sideEffects', 'workshop', 'cautions']) expect(out).toHaveProperty(k);
    expect(out.feasible).toBe(true);
    expect(Object.keys(out.geometry)).toEqual(expect.arrayContaining(['tieRodInner', 'tieRodOuter']));
    for (const k of ['rollSteerCoefficient', 'bumpSteerDegPerM', 'curvatureDegPerM2', 'worstToeDeg']) expect(typeof out.achieved[k]).toBe('number');
    expect(Math.abs(out.achieved.rollSteerCoefficient - 0.02)).toBeLessThan(0.002);
  }, 60_000);

  it('an infeasible target exits 0 with feasible false and the reason', async () => {
    const r = await run('--intent=' + fixture('fs-front-infeasible'));
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.feasible).toBe(false);
    expect(out.reason).toMatch(/cannot be met/);
    expect(out.limitingBound.coordinate).toMatch(/^tieRod(Inner|Outer)\.z$/);
  }, 60_000);

  it('bad input exits 2 and names the field', async () => {
    const bad = JSON.parse(readFileSync(fixture('fs-front-roll-understeer'), 'utf8'));
    delete bad.bounds['tieRodOuter.z'];
    const file = join(tmp, 'bad.json');
    writeFileSync(file, JSON.stringify(bad));
    const r = await run('--intent', file);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('bounds.tieRodOuter.z');
    expect(r.stdout).toBe('');
  }, 60_000);

  it('a missing file, malformed JSON or a missing flag exit 2', async () => {
    const notJson = join(tmp, 'broken.json');
    writeFileSync(notJson, '{ "axle": ');
    for (const args of [['--intent', join(tmp, 'nope.json')], ['--intent', notJson], []]) {
      const r = await run(...args);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/--intent/);
    }
  }, 60_000);
});
