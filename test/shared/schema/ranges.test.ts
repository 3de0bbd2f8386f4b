/**
 * Plausible ranges (issue 12 §6): physically impossible values are refused
 * by the schemas with the field named; unusual ones pass and are described
 * for the screens. The bounds themselves are common practice, from memory
 * (shared/schema/ranges.ts says so beside them); these checks are about the
 * door, not about the exact figures.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { cornerSchema } from '../../../shared/schema/corner.js';
import { cornerUnusualValues } from '../../../shared/schema/corner-ranges.js';
import { intentSchema } from '../../../shared/schema/intent.js';
import { CORNER_RANGES, INTENT_RANGES, VEHICLE_RANGES, formatRangeValue, unusualValue, vehicleRangeFor } from '../../../shared/schema/ranges.js';
import { VEHICLE_FIELD_UNITS } from '../../../shared/schema/units.js';
import { vehicleSchema } from '../../../shared/schema/vehicle.js';
import { exampleVehicles } from '../../../shared/balance/examples.js';
import { exampleCorners } from '../../../shared/kinematics/examples.js';

const issuesOf = (r: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }) =>
  (r.error?.issues ?? []).map((i) => ({ path: i.path.map(String).join('.'), message: i.message }));

describe('every range is coherent', () => {
  it('min < max, and the typical band lies inside the possible one', () => {
    for (const [key, range] of Object.entries({ ...VEHICLE_RANGES, ...CORNER_RANGES, ...INTENT_RANGES })) {
      expect(range.min, key).toBeLessThan(range.max);
      expect(range.typical[0], key).toBeLessThanOrEqual(range.typical[1]);
      expect(range.typical[0], key).toBeGreaterThanOrEqual(range.min);
      expect(range.typical[1], key).toBeLessThanOrEqual(range.max);
    }
  });

  it('docs/inputs.md lists every range with its accepted bounds', () => {
    const doc = readFileSync(new URL('../../../docs/inputs.md', import.meta.url), 'utf8');
    for (const [key, range] of Object.entries({ ...VEHICLE_RANGES, ...CORNER_RANGES, ...INTENT_RANGES })) {
      const accepted = `${range.minExclusive ? '> ' : ''}${formatRangeValue(range.min)} … ${formatRangeValue(range.max)}`;
      expect(doc, key).toContain(`| \`${key}\` | ${range.label} | ${range.unit || '–'} | ${accepted} |`);
    }
  });

  it('every numeric vehicle key (the unit table lists them) has its own range', () => {
    const keys = Object.keys(VEHICLE_FIELD_UNITS);
    const ranged = new Set(Object.keys(VEHICLE_RANGES).map((k) => k.split('.').pop()));
    expect(keys.filter((k) => !ranged.has(k))).toEqual([]);
  });

  it('the example vehicles and corners are inside the possible ranges', () => {
    for (const [name, v] of Object.entries(exampleVehicles)) expect(issuesOf(vehicleSchema.safeParse(v)), name).toEqual([]);
    for (const [name, c] of Object.entries(exampleCorners)) expect(issuesOf(cornerSchema.safeParse(c)), name).toEqual([]);
  });
});

describe('impossible values are refused, naming the field', () => {
  it('a 1e308 kg vehicle', () => {
    const r = vehicleSchema.safeParse({ ...exampleVehicles.tur26Ember, massKg: 1e308 });
    expect(issuesOf(r)).toEqual([{ path: 'massKg', message: expect.stringMatching(/^massKg: 1e\+308 kg is not a possible vehicle mass: give at least 20 kg and at most 50000 kg$/) }]);
  });

  it('a nested vehicle key (a spring rate of 1e12 N/mm) and an axle key (a 40 m track)', () => {
    const v = structuredClone(exampleVehicles.tur26Ember) as Record<string, unknown> & { front: Record<string, unknown>; rear: Record<string, unknown> };
    v.front = { ...v.front, trackMm: 40_000 };
    v.rear = { ...v.rear, spring: { rateNPerMm: 1e12, motionRatio: 1 }, rollStiffnessNmPerDeg: undefined };
    const paths = issuesOf(vehicleSchema.safeParse(v)).map((i) => i.path);
    expect(paths).toContain('front.trackMm');
    expect(paths).toContain('rear.spring.rateNPerMm');
  });

  it('a 1e29 mm coordinate', () => {
    const c = structuredClone(exampleCorners.fsFrontWishbone) as { points: Record<string, number[]> };
    c.points['tieRodInner']![2] = 1e29;
    const issues = issuesOf(cornerSchema.safeParse(c));
    expect(issues).toContainEqual({ path: 'points.tieRodInner.2', message: expect.stringMatching(/^1e\+29 mm is not a possible hardpoint coordinate/) });
  });

  it('a 4.9 m kingpin (every coordinate possible on its own) is refused at the upper ball joint', () => {
    const c = structuredClone(exampleCorners.fsFrontWishbone);
    if (c.type !== 'double-wishbone') throw new Error('example changed');
    const lo = c.points.lowerOuter;
    c.points.upperOuter = [lo[0], lo[1] - 20, lo[2] + 4900];
    const issues = issuesOf(cornerSchema.safeParse(c));
    expect(issues.find((i) => i.path === 'points.upperOuter' && /kingpin/.test(i.message))?.message).toMatch(/4900 mm is not a possible kingpin length/);
  });

  it('a wheel radius of 5 m and a rack stroke of a metre', () => {
    const c = structuredClone(exampleCorners.fsFrontWishbone);
    c.wheel.radius = 5000;
    c.steering = { kind: 'rack', rackAxis: [0, 1, 0], rackStroke: [-1000, 30] };
    const paths = issuesOf(cornerSchema.safeParse(c)).map((i) => i.path);
    expect(paths).toContain('wheel.radius');
    expect(paths).toContain('steering.rackStroke.0');
  });

  it('intent settings: a travel of 5 m, a 1e300 mm thread pitch, packaging bounds of 1e20 mm', () => {
    const intent = {
      corner: exampleCorners.fsFrontWishbone,
      axle: 'front',
      target: { zeroBumpSteer: true },
      movable: ['tieRodInner.z'],
      bounds: { 'tieRodInner.z': [-1e20, 200] },
      trackProfile: { id: 'smooth-circuit', travelMm: [-5000, 50] },
      options: { threadPitchMm: 1e300 },
    };
    const paths = issuesOf(intentSchema.safeParse(intent)).map((i) => i.path);
    expect(paths).toEqual(expect.arrayContaining(['bounds.tieRodInner.z.0', 'options.threadPitchMm']));
    // The track profile is a name or an object (a union): its issue is reported at trackProfile.
    expect(paths.some((p) => p.startsWith('trackProfile'))).toBe(true);
    const ok = { ...intent, bounds: { 'tieRodInner.z': [-200, 200] }, trackProfile: { id: 'smooth-circuit', travelMm: [-50, 50] }, options: {} };
    expect(issuesOf(intentSchema.safeParse(ok))).toEqual([]);
  });
});

describe('unusual values pass, with a warning in the user\'s words', () => {
  it('a 1200 mm wheel radius', () => {
    const c = structuredClone(exampleCorners.fsFrontWishbone);
    c.wheel.radius = 1200;
    expect(cornerSchema.safeParse(c).success).toBe(true);
    expect(cornerUnusualValues(c)).toContainEqual({ path: 'wheel.radius', message: '1200 mm is unusual for a wheel radius (typical 200 to 450 mm)' });
    expect(cornerUnusualValues(exampleCorners.fsFrontWishbone)).toEqual([]);
  });

  it('a 5000 kg vehicle is accepted and described; the form field finds its range by path', () => {
    expect(vehicleSchema.safeParse({ ...exampleVehicles.tur26Ember, massKg: 5000 }).success).toBe(true);
    expect(unusualValue(vehicleRangeFor('massKg')!, 5000)).toBe('5000 kg is unusual for a vehicle mass (typical 150 to 3500 kg)');
    expect(vehicleRangeFor('rear.tyre.verticalRateNPerMm')).toBe(VEHICLE_RANGES['verticalRateNPerMm']);
    expect(vehicleRangeFor('front.spring.motionRatio')).toBe(VEHICLE_RANGES['spring.motionRatio']);
    expect(unusualValue(vehicleRangeFor('massKg')!, 280)).toBeNull();
  });

  it('numbers in messages are short', () => {
    expect(formatRangeValue(1e308)).toBe('1e+308');
    expect(formatRangeValue(0.00012)).toBe('1.2e-4');
    expect(formatRangeValue(1234.5678)).toBe('1235');
  });
});
