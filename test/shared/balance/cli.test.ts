import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../../support/cli.js';
import { evaluateBalance } from '../../../shared/balance/index.js';
import { exampleVehicles } from '../../../shared/balance/examples.js';

// In-process: the program's own runner with collected output (test/support/cli.ts).
const run = (...args: string[]) => runCli('balance', ...args);
const tmp = mkdtempSync(join(tmpdir(), 'rollwise-balance-cli-'));

describe('rollwise balance (CLI)', { timeout: 90_000 }, () => {
  it('prints the issue-4 keys for a vehicle file, the same numbers as the library', async () => {
    const r = await run('--vehicle', 'test/fixtures/vehicles/brackenfield-b3.json', '--speed=90');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    for (const k of ['rollGradientDegPerG', 'rollStiffnessNmPerDeg', 'lateralLoadTransfer', 'understeerBudget', 'gains', 'stepSteer']) expect(out).toHaveProperty(k);
    expect(Object.keys(out.rollStiffnessNmPerDeg)).toEqual(expect.arrayContaining(['front', 'rear']));
    expect(Object.keys(out.lateralLoadTransfer)).toEqual(expect.arrayContaining(['frontNPerG', 'rearNPerG', 'frontShare']));
    expect(Object.keys(out.understeerBudget).sort()).toEqual(['alignTorque', 'complianceSteer', 'loadTransfer', 'rollCamber', 'rollSteer', 'total', 'tyres']);
    expect(Object.keys(out.stepSteer)).toEqual(expect.arrayContaining(['steadyYawRateDegPerS', 'responseTimeS', 'peakTimeS', 'overshootPct', 'settlingTimeS']));
    expect(out).toHaveProperty('characteristicSpeedKph');
    const lib = evaluateBalance(exampleVehicles.brackenfieldB3, { speedKph: 90, sensitivity: false });
    expect(out.understeerBudget.total).toBeCloseTo(lib.understeerBudget.total, 12);
    expect(out.stepSteer.speedKph).toBeCloseTo(90, 9);
    expect(out.caution).toMatch(/rig/);
  });

  it('links corner files and accepts inch/pound entry', async () => {
    const r = await run('--vehicle', 'test/fixtures/vehicles/tur26-ember.json', '--front-corner', 'test/fixtures/corners/fs-front-wishbone.json', '--rear-corner', 'test/fixtures/corners/fs-rear-wishbone.json', '--radius=15');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.kinematicsLink.front.source.rollSteerCoefficient).toBe('kinematics');
    const imp = await run('--vehicle', 'test/fixtures/vehicles/brackenfield-b3-imperial.json', '--summary');
    expect(imp.code).toBe(0);
    const si = evaluateBalance(exampleVehicles.brackenfieldB3, { sensitivity: false });
    // The imperial file rounds the SI values to about 6 significant figures.
    expect(Math.abs(JSON.parse(imp.stdout).rollGradientDegPerG - si.rollGradientDegPerG) / si.rollGradientDegPerG).toBeLessThan(1e-4);
  });

  it('bad input: stderr names the field, exit 2', async () => {
    const bad = join(tmp, 'bad.json');
    writeFileSync(bad, JSON.stringify({ ...exampleVehicles.tur26Ember, front: { ...exampleVehicles.tur26Ember.front, trackMm: 'wide' } }));
    const r = await run('--vehicle', bad);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/front\.trackMm/);
    expect(r.stdout).toBe('');
    const neg = join(tmp, 'neg.json');
    writeFileSync(neg, JSON.stringify({ ...exampleVehicles.tur26Ember, cgHeightMm: -1 }));
    const r2 = await run('--vehicle', neg);
    expect(r2.code).toBe(2);
    expect(r2.stderr).toMatch(/vehicle\.cgHeightMm/);
    const r3 = await run('--vehicle', 'test/fixtures/vehicles/tur26-ember.json', '--speed=fast');
    expect(r3.code).toBe(2);
    expect(r3.stderr).toMatch(/--speed/);
  });
});
