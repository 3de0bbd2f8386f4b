import { describe, expect, it } from 'vitest';
import { vehicleSchema, upgradeVehicleDocument, VEHICLE_FORMAT_VERSION } from '../../../shared/schema/vehicle.js';
import { exampleVehicles } from '../../../shared/balance/examples.js';

describe('vehicleSchema', () => {
  it('accepts every example vehicle unchanged', () => {
    for (const [name, v] of Object.entries(exampleVehicles)) {
      const r = vehicleSchema.safeParse(v);
      expect(r.success, name).toBe(true);
      if (r.success) expect(r.data).toEqual(v);
    }
  });

  it('defaults options.rollGravityTerm to true', () => {
    const { options: _o, ...rest } = exampleVehicles.brackenfieldB3;
    const r = vehicleSchema.parse(rest);
    expect(r.options.rollGravityTerm).toBe(true);
  });

  it('names the offending field', () => {
    const bad = structuredClone(exampleVehicles.tur26Ember) as Record<string, unknown>;
    (bad['front'] as Record<string, unknown>)['trackMm'] = -5;
    const r = vehicleSchema.safeParse(bad);
    expect(r.success).toBe(false);
    if (!r.success) expect(r.error.issues[0]!.path).toEqual(['front', 'trackMm']);
  });

  it('rejects unknown keys, a CG behind the rear axle, and an axle without springs or roll stiffness', () => {
    const v = exampleVehicles.tur26Ember;
    expect(vehicleSchema.safeParse({ ...v, massKG: 3 }).success).toBe(false);
    expect(vehicleSchema.safeParse({ ...v, cgToFrontAxleMm: v.wheelbaseMm + 1 }).success).toBe(false);
    const { spring: _s, ...frontNoSpring } = v.front;
    const r = vehicleSchema.safeParse({ ...v, front: frontNoSpring });
    expect(r.success).toBe(false);
    if (!r.success) expect(r.error.issues[0]!.path).toEqual(['front', 'spring']);
    expect(vehicleSchema.safeParse({ ...v, front: { ...frontNoSpring, rollStiffnessNmPerDeg: 800 } }).success).toBe(true);
  });

  it('requires an unsprung CG height with an unsprung mass', () => {
    const v = exampleVehicles.tur26Ember;
    const { unsprungCgHeightMm: _h, ...front } = v.front;
    const r = vehicleSchema.safeParse({ ...v, front });
    expect(r.success).toBe(false);
    if (!r.success) expect(r.error.issues[0]!.path).toEqual(['front', 'unsprungCgHeightMm']);
  });

  it('upgradeVehicleDocument adds the format version to an unversioned document and leaves others alone', () => {
    const { formatVersion: _f, ...old } = exampleVehicles.tur25Cinder;
    const up = upgradeVehicleDocument(old) as Record<string, unknown>;
    expect(up['formatVersion']).toBe(VEHICLE_FORMAT_VERSION);
    expect(vehicleSchema.safeParse(up).success).toBe(true);
    expect(upgradeVehicleDocument({ formatVersion: 99 })).toEqual({ formatVersion: 99 });
    expect(upgradeVehicleDocument(null)).toBe(null);
  });
});
