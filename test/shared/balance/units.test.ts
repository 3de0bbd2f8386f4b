import { describe, expect, it } from 'vitest';
import { InputError } from '../../../shared/errors.js';
import { convertUnitEntries, convertValue, parseQuantity, toImperial } from '../../../shared/schema/units.js';
import { vehicleSchema } from '../../../shared/schema/vehicle.js';
import { exampleVehicles } from '../../../shared/balance/examples.js';

describe('unit entry (mathjs)', () => {
  it('converts inch/pound quantities to the stored units (1 in = 25.4 mm, 1 lb = 0.45359237 kg, 1 lbf = 4.4482216152605 N: exact definitions)', () => {
    expect(parseQuantity('48 in', 'mm', 'trackMm')).toBeCloseTo(48 * 25.4, 9);
    expect(parseQuantity('650 lb', 'kg', 'massKg')).toBeCloseTo(650 * 0.45359237, 9);
    expect(parseQuantity('100 lbf/in', 'N / mm', 'rateNPerMm')).toBeCloseTo((100 * 4.4482216152605) / 25.4, 9);
    expect(parseQuantity('1 lbf ft/deg', 'N m / deg', 'rollRateNmPerDeg')).toBeCloseTo(4.4482216152605 * 0.3048, 9);
    expect(parseQuantity('1.5 m', 'mm', 'trackMm')).toBeCloseTo(1500, 9);
    expect(parseQuantity('  1200 ', 'mm', 'trackMm')).toBe(1200);
    expect(parseQuantity(7, 'mm', 'trackMm')).toBe(7);
  });

  it('names the field for an incompatible or unreadable unit', () => {
    expect(() => parseQuantity('3 kg', 'mm', 'front.trackMm')).toThrow(InputError);
    try {
      parseQuantity('three feet', 'mm', 'front.trackMm');
    } catch (e) {
      expect((e as InputError).issues[0]!.path).toBe('front.trackMm');
    }
  });

  it('converts a whole document, leaving numbers and other strings alone, and reports every bad field', () => {
    const doc = { ...exampleVehicles.brackenfieldB3, massKg: '2888 lb', front: { ...exampleVehicles.brackenfieldB3.front, trackMm: '60 in' } };
    const out = convertUnitEntries(doc) as typeof exampleVehicles.brackenfieldB3;
    expect(out.massKg).toBeCloseTo(2888 * 0.45359237, 9);
    expect(out.front.trackMm).toBeCloseTo(1524, 9);
    expect(out.name).toBe('Brackenfield B3 hatchback');
    expect(vehicleSchema.safeParse(out).success).toBe(true);
    expect(doc.massKg).toBe('2888 lb'); // input untouched
    try {
      convertUnitEntries({ massKg: '3 mm', front: { trackMm: '2 kg' } });
      throw new Error('expected InputError');
    } catch (e) {
      expect((e as InputError).issues.map((i) => i.path)).toEqual(['massKg', 'front.trackMm']);
    }
  });

  it('displays stored values in inch/pound units', () => {
    expect(toImperial('trackMm', 25.4)).toEqual({ value: 1, unit: 'in' });
    // Compliance per kilopound-force, as the other screens write it (1 klbf = 1000 lbf = 4.4482216152605 kN, NIST SP 811).
    const steer = toImperial('complianceSteerDegPerKN', 0.2);
    expect(steer.unit).toBe('deg / klbf');
    expect(steer.value).toBeCloseTo(0.2 * 4.4482216152605, 12);
    expect(parseQuantity('1 deg/klbf', 'deg / kN', 'front.complianceSteerDegPerKN')).toBeCloseTo(1 / 4.4482216152605, 12);
    expect(toImperial('massKg', 0.45359237).value).toBeCloseTo(1, 12);
    expect(toImperial('rollSteerCoefficient', 0.05)).toEqual({ value: 0.05, unit: '' });
    expect(convertValue(1, 'N / mm', 'lbf / in')).toBeCloseTo(25.4 / 4.4482216152605, 9);
  });
});
