/**
 * The cautions of a configuration worded in the reader's unit system (issue
 * 15 §2), as the server's review record prints them: the same shared rules,
 * their figures written through `cautionFigures(figureUnits(units))`.
 * Conversion check: 1 in = 25.4 mm exactly (NIST SP 811, Appendix B).
 */
import { describe, expect, it } from 'vitest';
import { exampleCorners } from '../../../shared/kinematics/index.js';
import { exampleVehicles } from '../../../shared/balance/index.js';
import { computeConfigurationCautions } from '../../../shared/cautions/configuration-cautions.js';
import { cautionFigures, figureUnits } from '../../../shared/cautions/figures.js';
import { SI_FIGURES } from '../../../shared/cautions/cautions.js';
import { bumpCostWords } from '../../../shared/ride/cost.js';

/** NIST SP 811, Appendix B: the inch is 25.4 mm exactly. */
const MM_PER_IN = 25.4;

const inputs = { vehicle: exampleVehicles.tur26Ember, frontCorner: exampleCorners.fsFrontWishbone, rearCorner: exampleCorners.fsRearWishbone, trackProfile: 'smooth-circuit' as const };

function messages(units: 'si' | 'imperial'): Map<string, string> {
  const out = new Map<string, string>();
  for (const l of computeConfigurationCautions({ ...inputs, units })) if (l.ok) for (const c of l.cautions) out.set(`${l.axle}:${c.code}`, c.message);
  return out;
}

describe('configuration cautions in the reader\'s units', () => {
  it('SI is the rules\' own wording; figures in SI stay as the rules write them', () => {
    expect(cautionFigures(figureUnits('si'))).toBe(SI_FIGURES);
    expect(messages('si')).toEqual(messages(undefined as never));
  });

  it('inch-pound: the rack position of the bump-steer spread in inches and its gradient in deg/in, at 25.4 mm per inch', () => {
    const si = messages('si').get('front:lock-bump-steer-spread');
    const us = messages('imperial').get('front:lock-bump-steer-spread');
    expect(si).toBeDefined();
    const rackMm = Number(/at rack (−?-?[\d.]+) mm/.exec(si!)![1]!.replace('−', '-'));
    const rackIn = Number(/at rack (−?-?[\d.]+) in\b/.exec(us!)![1]!.replace('−', '-'));
    // 1 decimal in mm is 2 in inches: the inch figure is within half its last digit of the exact conversion.
    expect(Math.abs(rackIn - rackMm / MM_PER_IN)).toBeLessThanOrEqual(0.005 + 0.05 / MM_PER_IN);
    const gradientPerM = Number(/by ([\d.]+) deg\/m\b/.exec(si!)![1]);
    const gradientPerIn = Number(/by ([\d.]+) deg\/in\b/.exec(us!)![1]);
    // deg/m × 0.0254 m per inch; each written to its resolution (SI to 0.1 deg/m, inch-pound to 0.001 deg/in), so within both half-digits.
    expect(Math.abs(gradientPerIn - gradientPerM * (MM_PER_IN / 1000))).toBeLessThanOrEqual(0.0005 + 0.05 * (MM_PER_IN / 1000));
    for (const m of messages('imperial').values()) expect(m).not.toMatch(/\d\s?(mm|cm|km\/h)\b|\d deg\/m\b/);
  });

  it('the bump cost sentence: SI as stored, inch-pound with the profile speed in mph, the corner in ft and the bump in inches', () => {
    const [front] = computeConfigurationCautions({ ...inputs, units: 'imperial' });
    if (!front?.ok || !front.bumpCost) throw new Error('the front bump cost is measured on the smooth circuit');
    const c = front.bumpCost;
    expect(bumpCostWords(c, 'front')).toBe(c.summary);
    const us = bumpCostWords(c, 'front', cautionFigures(figureUnits('imperial')));
    // 1 mi = 1.609344 km and 1 ft = 0.3048 m exactly (NIST SP 811, Appendix B); the smooth circuit is 100 km/h on a 60 m corner with a 10 mm bump.
    expect(us).toContain(`at ${(c.speedKph / 1.609344).toFixed(0)} mph`);
    expect(us).toContain(`on a ${(c.cornerRadiusM / 0.3048).toFixed(0)} ft corner`);
    expect(us).toContain(`a ${(c.bumpHeightMm / MM_PER_IN).toFixed(1)} in single-wheel bump`);
    expect(us).not.toMatch(/km\/h|\d m corner|\d mm|\d cm/);
  });
});

describe('cautionFigures, figure by figure', () => {
  it('writes inch/pound figures with the exact factors (NIST SP 811, Appendix B: 1 in = 25.4 mm, 1 ft = 0.3048 m, 1 mi = 1.609344 km, 1 lbf = 4.4482216152605 N) at the same resolution', () => {
    const us = cautionFigures(figureUnits('imperial'));
    // 1 decimal in mm is 2 in inches (the same resolution, log10 25.4 ≈ 1.4).
    expect(us.length(50.8, 1)).toBe('2.00 in');
    expect(us.distance(30.48)).toBe('100 ft');
    expect(us.speed(160.9344)).toBe('100 mph');
    expect(us.force(444.82216152605)).toBe('100.0 lbf');
    expect(us.drift(0.254, 1)).toBe('10.0 in');
    expect(us.bumpSteer(10, 1)).toBe('0.254 deg/in');
    for (const s of [us.length(3, 1), us.drift(0.1, 0), us.distance(50), us.speed(80), us.force(1000)]) expect(s).not.toMatch(/\b(mm|cm|m|km\/h|N)\b/);
  });
});
