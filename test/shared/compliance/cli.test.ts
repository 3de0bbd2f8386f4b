/** `rollwise compliance`, run in-process through the program's runner. Source: issue 17, "Interfaces" (JSON keys, exit 2 naming the field, rigid corner says so). */
import { describe, expect, it } from 'vitest';
import { runCli } from '../../support/cli.js';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cornerCompliance } from '../../../shared/compliance/index.js';

const root = join(import.meta.dirname, '..', '..', '..');
const fixture = (n: string) => join(root, 'test', 'fixtures', 'corners', n);

// In-process: the program's own runner with collected output (test/support/cli.ts).
const run = runCli;

describe('rollwise compliance', { timeout: 60_000 }, () => {
  it('prints the headline figures and per-load link forces as JSON, the same as the library', async () => {
    const r = await run('compliance', '--corner', fixture('road-front-strut-bushings.json'), '--travel=15', '--rack=10');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    const lib = cornerCompliance(JSON.parse(readFileSync(fixture('road-front-strut-bushings.json'), 'utf8')), { travelMm: 15, rackMm: 10 });
    for (const k of ['lateralForceToeDegPerKN', 'lateralForceCamberDegPerKN', 'aligningMomentToeDegPerKNm', 'brakingForceToeDegPerKN', 'tractionForceToeDegPerKN', 'lateralStiffnessNPerMm'] as const) {
      expect(typeof out[k]).toBe('number');
      expect(out[k]).toBe(lib[k]);
    }
    expect(out.travelMm).toBe(15);
    expect(out.rackMm).toBe(10);
    expect(out.rigid).toBe(false);
    expect(Object.keys(out.linkForcesN).sort()).toEqual(['aligningMoment', 'brakingForce', 'lateralForce', 'tractionForce', 'verticalForce']);
    expect(Object.keys(out.linkForcesN.lateralForce).sort()).toEqual(['lowerArmFrontLeg', 'lowerArmRearLeg', 'tieRod']);
    expect(out.engineVersion).toMatch(/^\d+\.\d+\.\d+$/);
    expect(out.caution).toMatch(/Verify on a/);
  });

  it('a corner without bushings is rigid and says so', async () => {
    const r = await run('compliance', '--corner', fixture('road-rear-five-link.json'));
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.rigid).toBe(true);
    expect(out.lateralForceToeDegPerKN).toBe(0);
    expect(out.lateralStiffnessNPerMm).toBeNull();
    expect(r.stderr).toMatch(/rigid \(zero compliance\)/);
  });

  it('bad input exits 2 naming the field or flag', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'rollwise-compliance-'));
    const bad = join(dir, 'bad.json');
    const c = JSON.parse(readFileSync(fixture('road-front-strut.json'), 'utf8'));
    writeFileSync(bad, JSON.stringify({ ...c, bushings: { strutTp: { radialNPerMm: 2000, axialNPerMm: 600 } } }));
    const r1 = await run('compliance', '--corner', bad);
    expect(r1.code).toBe(2);
    expect(r1.stderr).toMatch(/bushings\.strutTp \(did you mean (corner\.)?bushings\.strutTop\?\)/);
    writeFileSync(bad, JSON.stringify({ ...c, bushings: { strutTop: { radialNPerMm: -1, axialNPerMm: 600 } } }));
    const r2 = await run('compliance', '--corner', bad);
    expect(r2.code).toBe(2);
    expect(r2.stderr).toMatch(/bushings\.strutTop\.radialNPerMm/);
    const r3 = await run('compliance', '--corner', fixture('road-front-strut.json'), '--rack=500');
    expect(r3.code).toBe(2);
    expect(r3.stderr).toMatch(/--rack: rack 500 mm is outside the steering stroke/);
    const r4 = await run('compliance', '--corner', fixture('road-front-strut.json'), '--travl=5');
    expect(r4.code).toBe(2);
    expect(r4.stderr).toMatch(/--travl: unknown option/);
  });
});
