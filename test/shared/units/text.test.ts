/**
 * Sentences with SI figures, worded for an inch/pound reader. Factors are the
 * exact definitions of NIST SP 811, Appendix B (1 in = 25.4 mm, 1 mi =
 * 1.609344 km, 1 lbf = 4.4482216152605 N).
 */
import { describe, expect, it } from 'vitest';
import { figuresInUnits } from '../../../shared/units/text.js';
import { describeTyreLoadLaw } from '../../../shared/balance/tyre.js';

describe('figuresInUnits', () => {
  it('rewrites each figure in a stored unit, ranges and explicit signs included', () => {
    expect(figuresInUnits("the corner's track (1209 mm) differs", 'imperial')).toBe("the corner's track (47.6 in) differs");
    // A range keeps both ends and an explicit plus: −10 to +4 deg/m is −0.254 to +0.102 deg/in (3 significant figures, as bump steer is shown).
    expect(figuresInUnits('bump steer spans about −10 to +4 deg/m (common practice)', 'imperial')).toBe('bump steer spans about -0.254 to +0.102 deg/in (common practice)');
    expect(figuresInUnits('class A at 100 km/h', 'imperial')).toBe('class A at 62.14 mph');
    // N/deg is a unit of its own, not newtons followed by "/deg".
    expect(figuresInUnits('stiffness (560.0 N/deg at 721 N)', 'imperial')).toBe('stiffness (125.9 lbf/deg at 162.1 lbf)');
    // The tyre law's b per newton is per pound-force ×4.4482216152605 (0.00022 → 0.0009786); a in 1/deg is the same in both.
    const law = describeTyreLoadLaw({ kind: 'quadratic', a: 1, b: 0.00022 });
    expect(figuresInUnits(law, 'imperial')).toContain('(a = 1 1/deg, b = 0.0009786 1/(deg·lbf))');
    expect(figuresInUnits(law, 'si')).toContain('(a = 1 1/deg, b = 0.00022 1/(deg·N))');
  });

  it('leaves words, angles and SI text alone, and rounds unrounded figures', () => {
    expect(figuresInUnits('link1 at 3.5 deg', 'imperial')).toBe('link1 at 3.5 deg');
    expect(figuresInUnits('the track (1209 mm)', 'si')).toBe('the track (1209 mm)');
    expect(figuresInUnits('residual 2.381452155 mm', 'si')).toBe('residual 2.381 mm');
  });
});
