import { SI_FIGURES } from '../../../shared/cautions/cautions';
import { cautionFigures } from './caution-figures';
import { figureUnits } from './intent-client';

describe('cautionFigures', () => {
  it('writes SI figures as the shared rules do by default', () => {
    const si = cautionFigures(figureUnits('si'));
    expect(si.length(12.345, 1)).toBe(SI_FIGURES.length(12.345, 1));
    expect(si.drift(0.123, 1)).toBe(SI_FIGURES.drift(0.123, 1));
    expect(si.bumpSteer(-8.25, 1)).toBe(SI_FIGURES.bumpSteer(-8.25, 1));
  });

  it('writes inch/pound figures with the exact factors (1 in = 25.4 mm, 1 ft = 0.3048 m, 1 mi = 1.609344 km, 1 lbf = 4.4482216152605 N)', () => {
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
