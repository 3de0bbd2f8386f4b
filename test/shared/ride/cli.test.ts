import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../../support/cli.js';
import { computeRide } from '../../../shared/ride/api.js';

// In-process: the program's own runner with collected output (test/support/cli.ts).
const run = (...args: string[]) => runCli('ride', ...args);
const tmp = mkdtempSync(join(tmpdir(), 'rollwise-ride-cli-'));
const VEHICLE = 'test/fixtures/vehicles/tur26-ember.json';
const CORNER = 'test/fixtures/corners/fs-front-wishbone.json';

describe('rollwise ride (CLI)', { timeout: 90_000 }, () => {
  it('prints the ride outputs, toe with a corner and the bump peaks, the same numbers as the library', async () => {
    const r = await run('--vehicle', VEHICLE, '--axle', 'front', '--road-class', 'C', '--speed=60', '--corner', CORNER, '--bump=20:400');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    const lib = computeRide({
      vehicle: JSON.parse(readFileSync(VEHICLE, 'utf8')),
      corner: JSON.parse(readFileSync(CORNER, 'utf8')),
      axle: 'front',
      roadClass: 'C',
      speedKph: 60,
      bump: { heightMm: 20, lengthMm: 400 },
    });
    for (const k of ['wheelTravelRmsMm', 'bodyAccelerationRmsMS2', 'tyreLoadRmsN', 'toeRmsDeg'] as const) {
      expect(out[k]).toBeGreaterThan(0);
      expect(out[k]).toBeCloseTo(lib[k]!, 12);
    }
    expect(out.bump.peakWheelTravelMm).toBeGreaterThan(0);
    expect(out.bump.peakWheelTravelMm).toBeCloseTo(lib.bump!.peakWheelTravelMm, 12);
    expect(out.bump.peakToeChangeDeg).toBeGreaterThan(0);
    expect(out.roadInWords).toBe('average road (ISO 8608 class C) at 60 km/h');
    expect(out.method.randomRoad).toMatch(/frequency domain/);
    expect(out.method.events).toMatch(/time domain/);
    expect(out.caution).toMatch(/rig/);
  });

  it('leaves toe out without a corner, and the bump without --bump', async () => {
    const r = await run('--vehicle', VEHICLE, '--axle', 'rear', '--road-class', 'a', '--speed', '120');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.roadClass).toBe('A');
    expect(out.toeRmsDeg).toBeNull();
    expect(out.bump).toBeNull();
  });

  it.each([
    [['--axle', 'middle', '--road-class', 'B', '--speed=60'], /--axle/],
    [['--axle', 'front', '--road-class', 'J', '--speed=60'], /--road-class/],
    [['--axle', 'front', '--road-class', 'B', '--speed=fast'], /--speed/],
    [['--axle', 'front', '--road-class', 'B', '--speed=60', '--bump=20'], /--bump/],
    [['--axle', 'front', '--road-class', 'B', '--speed=60', '--wheel=1'], /--wheel/],
    [['--axle', 'front', '--road-class', 'B', '--speed=60', '--travel=80'], /--travel/],
  ])('exits 2 naming the field for %j', async (args, field) => {
    const r = await run('--vehicle', VEHICLE, ...args);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(field);
    expect(r.stdout).toBe('');
  });

  it('refuses out-of-range requests in the library with the field named (what the CLI maps to its flags)', async () => {
    const vehicle = JSON.parse(readFileSync(VEHICLE, 'utf8'));
    const base = { vehicle, axle: 'front', roadClass: 'B', speedKph: 60 };
    expect(() => computeRide({ ...base, speedKph: 0 })).toThrow(/speedKph/);
    expect(() => computeRide({ ...base, speedKph: undefined })).toThrow(/speedKph/);
    expect(() => computeRide({ ...base, bump: { heightMm: -5, lengthMm: 300 } })).toThrow(/bump\.heightMm/);
    expect(() => computeRide({ ...base, landing: { dropHeightMm: 0 } })).toThrow(/landing\.dropHeightMm/);
  });

  it('exits 2 naming the vehicle field the ride model needs', async () => {
    const doc = JSON.parse(readFileSync(VEHICLE, 'utf8'));
    delete doc.front.tyre.verticalRateNPerMm;
    const file = join(tmp, 'no-tyre-rate.json');
    writeFileSync(file, JSON.stringify(doc));
    const r = await run('--vehicle', file, '--axle', 'front', '--road-class', 'B', '--speed=60');
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/front\.tyre\.verticalRateNPerMm/);
    const bad = join(tmp, 'bad-damper.json');
    doc.front.tyre.verticalRateNPerMm = 105;
    doc.front.damper = { wheelRateNsPerMm: -1 };
    writeFileSync(bad, JSON.stringify(doc));
    const b = await run('--vehicle', bad, '--axle', 'front', '--road-class', 'B', '--speed=60');
    expect(b.code).toBe(2);
    expect(b.stderr).toMatch(/front\.damper\.wheelRateNsPerMm/);
  });
});
