/**
 * The quantity table's two directions agree: a value shown in inch/pound
 * units and typed back is the stored value again. The factors are the exact
 * definitions of NIST SP 811, Appendix B (1 in = 25.4 mm, 1 lb = 0.45359237 kg,
 * 1 lbf = 4.4482216152605 N, 1 ft = 0.3048 m, 1 mi = 1.609344 km).
 */
import { describe, expect, it } from 'vitest';
import { fromDisplayUnits, inDisplayUnits, QUANTITIES, type QuantityKind } from '../../../shared/units/quantities.js';

describe('fromDisplayUnits', () => {
  it('is the inverse of inDisplayUnits for every kind (to rounding: 1e-14 relative)', () => {
    for (const kind of Object.keys(QUANTITIES) as QuantityKind[]) {
      for (const v of [-1234.5, -0.1, 0.1, 2, 77.7]) {
        expect(fromDisplayUnits(inDisplayUnits(v, kind, 'imperial'), kind, 'imperial') / v, kind).toBeCloseTo(1, 14);
      }
      expect(fromDisplayUnits(3.3, kind, 'si')).toBe(3.3);
    }
  });

  it('takes typed inch/pound values to the stored unit by the exact definitions (NIST SP 811, Appendix B)', () => {
    expect(fromDisplayUnits(0.1, 'length', 'imperial')).toBe(2.54);
    expect(fromDisplayUnits(1, 'length', 'imperial')).toBe(25.4);
    expect(fromDisplayUnits(1, 'mass', 'imperial')).toBe(0.45359237);
    expect(fromDisplayUnits(1, 'force', 'imperial')).toBe(4.4482216152605);
    expect(fromDisplayUnits(100, 'speed', 'imperial')).toBeCloseTo(160.9344, 10);
    expect(fromDisplayUnits(100, 'distance', 'imperial')).toBeCloseTo(30.48, 10);
    // 1 lbf/in = 4.4482216152605 N / 25.4 mm.
    expect(fromDisplayUnits(1, 'linearRate', 'imperial')).toBeCloseTo(4.4482216152605 / 25.4, 14);
    // 1 deg/in = 1 deg / 0.0254 m.
    expect(fromDisplayUnits(1, 'bumpSteer', 'imperial')).toBeCloseTo(1 / 0.0254, 10);
    // Tyre load sensitivity b: 1 per (deg·lbf) = 1 per (deg · 4.4482216152605 N).
    expect(fromDisplayUnits(1, 'loadSensitivityB', 'imperial')).toBeCloseTo(1 / 4.4482216152605, 14);
    // 1 lbf·s/in = 4.4482216152605 N·s / 25.4 mm; 1 lbf·ft·s/deg = 4.4482216152605 × 0.3048 N·m·s/deg.
    expect(fromDisplayUnits(1, 'dampingRate', 'imperial')).toBeCloseTo(4.4482216152605 / 25.4, 14);
    expect(fromDisplayUnits(1, 'rollDamping', 'imperial')).toBeCloseTo(4.4482216152605 * 0.3048, 14);
    // 1 psi = 6894.757293168361 Pa = 6.894757293168361e-6 GPa (NIST SP 811, Appendix B.8: 6.894 757 E+03 Pa).
    expect(fromDisplayUnits(1, 'shearModulus', 'imperial') / 6.894757293168361e-6).toBeCloseTo(1, 12);
  });
});
