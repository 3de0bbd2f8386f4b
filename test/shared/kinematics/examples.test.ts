/**
 * The road five-link example is a plausible rear multi-link: its virtual
 * (instantaneous) steering axis sits near the wheel, not far outboard.
 * Ranges are typical values for road-car rear multi-links, from memory
 * (common practice), not a published standard: kingpin inclination about
 * 5–15°, scrub radius within ±50 mm, caster 0–8°, and slight toe-in in bump.
 */
import { describe, expect, it } from 'vitest';
import { exampleCorners, solvePose, sweepCorner, rollSteerCoefficient } from '../../../shared/kinematics/index.js';

describe('roadRearFiveLink example geometry', () => {
  const c = exampleCorners.roadRearFiveLink;

  it('virtual kingpin at design: KPI, scrub, caster and trail in the usual ranges', () => {
    const p = solvePose(c, { travelMm: 0 });
    expect(p.kingpinInclinationDeg).toBeGreaterThan(5);
    expect(p.kingpinInclinationDeg).toBeLessThan(15);
    expect(Math.abs(p.scrubRadiusMm)).toBeLessThan(50);
    expect(p.casterDeg).toBeGreaterThan(0);
    expect(p.casterDeg).toBeLessThan(8);
    expect(Math.abs(p.mechanicalTrailMm)).toBeLessThan(50);
  });

  it('stays plausible over its ±80 mm travel, with slight toe-in in bump and roll understeer', () => {
    for (const travelMm of [-80, 80]) {
      const p = solvePose(c, { travelMm });
      expect(p.kingpinInclinationDeg).toBeGreaterThan(0);
      expect(p.kingpinInclinationDeg).toBeLessThan(20);
      expect(Math.abs(p.scrubRadiusMm)).toBeLessThan(60);
    }
    const sw = sweepCorner(c, { travel: { from: -80, to: 80, step: 5 } });
    expect(sw.fit.bumpSteerDegPerM).toBeGreaterThan(0);
    expect(sw.fit.bumpSteerDegPerM).toBeLessThan(10);
    expect(rollSteerCoefficient(c)).toBeLessThan(0);
  });
});
