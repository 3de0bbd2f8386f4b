import { describe, expect, it } from 'vitest';
import { computeBalance } from '../../../shared/balance/api.js';
import { exampleVehicles } from '../../../shared/balance/examples.js';
import { evaluateBalance } from '../../../shared/balance/index.js';
import { solveSteadyCornering } from '../../../shared/balance/steady.js';
import { balanceCore } from '../../../shared/balance/understeer.js';
import { InputError } from '../../../shared/errors.js';
import { axleSummary, exampleCorners, rackForAxleSteer } from '../../../shared/kinematics/index.js';

const fs = { vehicle: exampleVehicles.tur26Ember, frontCorner: exampleCorners.fsFrontWishbone, rearCorner: exampleCorners.fsRearWishbone };

describe('computeBalance: kinematics link', () => {
  const r = computeBalance({ ...fs, sensitivity: false });

  it('takes ε, roll camber, roll-centre height and motion ratios from the corners and says so', () => {
    const kin = axleSummary(exampleCorners.fsRearWishbone, { rackMm: 0 });
    const rear = r.kinematicsLink.rear;
    expect(rear.fromCorner).toBe(true);
    expect(rear.source.rollSteerCoefficient).toBe('kinematics');
    expect(rear.used.rollSteerCoefficient).toBe(kin.rollSteerCoefficient);
    expect(rear.used.rollCamberDegPerDeg).toBe(kin.rollCamberDegPerDeg);
    expect(rear.used.rollCentreHeightMm).toBe(kin.rollCentreHeightMm);
    expect(r.rollCentreHeightMm.rear).toBe(kin.rollCentreHeightMm);
    if (kin.springMotionRatio !== undefined) {
      expect(rear.source.springMotionRatio).toBe('kinematics');
      expect(r.effectiveVehicle.rear.spring!.motionRatio).toBe(kin.springMotionRatio);
    }
    // The bar of this vehicle is a roll rate at the wheels: its motion ratio does not apply, and a note says so.
    expect(rear.source.barTwistRadPerM).toBe('not-applicable');
    expect(rear.notes.join(' ')).toMatch(/bar geometry not used/);
  });

  it('the budget uses the linked ε: matches evaluateBalance of the effective vehicle', () => {
    const direct = evaluateBalance(r.effectiveVehicle, { sensitivity: false });
    expect(r.understeerBudget.rollSteer).toBeCloseTo(direct.understeerBudget.rollSteer, 12);
    expect(r.understeerBudget.rollSteer).not.toBeCloseTo(evaluateBalance(exampleVehicles.tur26Ember, { sensitivity: false }).understeerBudget.rollSteer, 6);
  });

  it('an entered override wins over the kinematics', () => {
    const o = computeBalance({ ...fs, sensitivity: false, overrides: { rear: { rollSteerCoefficient: -0.1, rollCentreHeightMm: 44 } } });
    expect(o.kinematicsLink.rear.source.rollSteerCoefficient).toBe('override');
    expect(o.kinematicsLink.rear.used.rollSteerCoefficient).toBe(-0.1);
    expect(o.rollCentreHeightMm.rear).toBe(44);
    expect(o.kinematicsLink.rear.source.rollCamberDegPerDeg).toBe('kinematics');
  });

  it('without corners the vehicle values are used', () => {
    const o = computeBalance({ vehicle: exampleVehicles.tur26Ember, sensitivity: false });
    expect(o.kinematicsLink.front.fromCorner).toBe(false);
    expect(o.kinematicsLink.front.source.rollSteerCoefficient).toBe('vehicle');
    expect(o.kinematicsLink.rear.used.rollSteerCoefficient).toBe(exampleVehicles.tur26Ember.rear.rollSteerCoefficient);
  });

  it('reads the steered front at the rack position a corner radius needs (the steady steer on that radius at 0.4 g)', () => {
    const o = computeBalance({ ...fs, sensitivity: false, cornerRadiusM: 15 });
    const f = o.kinematicsLink.front;
    // Second route: the Newton solution of the steady force and yaw balance on R = 15 m at 0.4 g (Gillespie, re-derived),
    // not the tangent K(0.4 g)·a_y the link used to add.
    const expectedSteer = solveSteadyCornering(balanceCore(o.effectiveVehicle), 15, 0.4).steerDeg;
    expect(f.axleSteerDeg!).toBeCloseTo(expectedSteer, 3);
    expect(f.rackMm!).toBeCloseTo(rackForAxleSteer(exampleCorners.fsFrontWishbone, f.axleSteerDeg!), 9);
    expect(f.rackMm).not.toBe(0);
    expect(o.kinematicsLink.rear.rackMm).toBe(0);
  });

  it('compares a baseline with a variant side by side', () => {
    const o = computeBalance({ vehicle: exampleVehicles.tur25Cinder, sensitivity: false, variant: { vehicle: exampleVehicles.tur26Ember } });
    const c = o.comparison!;
    expect(c.baselineName).toBe('TUR-25 Cinder');
    expect(c.variantName).toBe('TUR-26 Ember');
    expect(c.rows[0]!.path).toBe('rollGradientDegPerG');
    const k = c.rows.find((x) => x.path === 'understeerBudget.total')!;
    expect(k.baseline).toBeCloseTo(o.understeerBudget.total, 12);
    expect(k.variant).toBeCloseTo(c.variant.understeerBudget.total, 12);
    expect(k.change).toBeCloseTo(k.variant! - k.baseline!, 12);
    expect(c.yawRateHistory.variant.length).toBe(c.variant.stepSteer.history.length);
  });

  it('returns JSON-safe values (no NaN or Infinity)', () => {
    const o = computeBalance({ ...fs, cornerRadiusM: 20 });
    const text = JSON.stringify(o);
    expect(text).not.toMatch(/NaN|Infinity/);
    expect(JSON.parse(text)).toEqual(JSON.parse(JSON.stringify(o)));
    let nulls = 0;
    JSON.stringify(o, (_k, v) => {
      if (typeof v === 'number' && !Number.isFinite(v)) nulls++;
      return v;
    });
    expect(nulls).toBe(0);
  });
});

describe('computeBalance: bad input', () => {
  const issuePath = (input: unknown) => {
    try {
      computeBalance(input);
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      return (e as InputError).issues[0]!.path;
    }
    throw new Error('expected an InputError');
  };

  it('names the vehicle field', () => {
    expect(issuePath({ vehicle: { ...exampleVehicles.tur26Ember, massKg: -3 } })).toBe('vehicle.massKg');
    expect(issuePath({ vehicle: { ...exampleVehicles.tur26Ember, rear: { ...exampleVehicles.tur26Ember.rear, tyre: {} } } })).toBe('vehicle.rear.tyre');
    expect(issuePath({})).toBe('vehicle');
    expect(issuePath({ vehicle: exampleVehicles.tur26Ember, speedKph: 0 })).toBe('speedKph');
    expect(issuePath({ vehicle: exampleVehicles.tur26Ember, unknownKey: 1 })).toBe('(root)');
  });

  it('names the corner field', () => {
    const bad = structuredClone(exampleCorners.fsFrontWishbone) as unknown as Record<string, unknown>;
    delete (bad['points'] as Record<string, unknown>)['tieRodInner'];
    expect(issuePath({ vehicle: exampleVehicles.tur26Ember, frontCorner: bad })).toMatch(/^frontCorner\.points/);
  });

  it('accepts a vehicle document without formatVersion (upgraded to 1)', () => {
    const { formatVersion: _f, ...old } = exampleVehicles.brackenfieldB3;
    expect(computeBalance({ vehicle: old, sensitivity: false }).vehicleName).toBe('Brackenfield B3 hatchback');
  });
});

describe('fixtures and solve errors', () => {
  it('test/fixtures/vehicles hold the example vehicles unchanged', async () => {
    const { readFileSync } = await import('node:fs');
    const files: Record<string, keyof typeof exampleVehicles> = { 'tur26-ember': 'tur26Ember', 'tur25-cinder': 'tur25Cinder', 'brackenfield-b3': 'brackenfieldB3', 'brackenfield-b5': 'brackenfieldB5' };
    for (const [file, name] of Object.entries(files)) {
      expect(JSON.parse(readFileSync(`test/fixtures/vehicles/${file}.json`, 'utf8'))).toEqual(exampleVehicles[name]);
    }
  });

  it('a corner radius tighter than the rack stroke allows is a SolveError naming the steer', async () => {
    const { SolveError } = await import('../../../shared/errors.js');
    try {
      computeBalance({ ...fs, sensitivity: false, cornerRadiusM: 2 });
      throw new Error('expected a SolveError');
    } catch (e) {
      expect(e).toBeInstanceOf(SolveError);
      expect((e as InstanceType<typeof SolveError>).details).toHaveProperty('axleSteerDeg');
    }
  });
});

describe('errors name the request field', () => {
  it('a vehicle whose roll stiffness cannot hold the body: InputError on vehicle.front / vehicle.rear (and the CG height)', () => {
    const v = structuredClone(exampleVehicles.brackenfieldB3);
    v.front.rollStiffnessNmPerDeg = 1;
    v.rear.rollStiffnessNmPerDeg = 1;
    try {
      computeBalance({ vehicle: v, sensitivity: false });
      throw new Error('expected an InputError');
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).issues.map((i) => i.path)).toEqual(['vehicle.front', 'vehicle.rear', 'vehicle.cgHeightMm']);
    }
    try {
      computeBalance({ vehicle: exampleVehicles.brackenfieldB3, sensitivity: false, variant: { vehicle: v } });
      throw new Error('expected an InputError');
    } catch (e) {
      expect((e as InputError).issues[0]!.path).toBe('variant.vehicle.front');
    }
  });

  it('an axle whose compliances cancel its tyres is refused, naming the axle', () => {
    // Rear compliance steer chosen so that it cancels every other rear entry: D_r = 0 (constructed).
    const v = structuredClone(exampleVehicles.brackenfieldB3);
    const b = evaluateBalance(v, { sensitivity: false }).onCentreAxleCompliance.rear;
    const perKN = v.rear.complianceSteerDegPerKN!;
    v.rear.complianceSteerDegPerKN = perKN - (b.total * perKN) / b.complianceSteer;
    try {
      computeBalance({ vehicle: v, sensitivity: false });
      throw new Error('expected an InputError');
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).issues[0]!.path).toBe('vehicle.rear');
    }
  });
});

describe('bar geometry and the link', () => {
  it('a bar entered by geometry takes its twist per wheel travel from the corner, not the vehicle lever', () => {
    const v = exampleVehicles.tur25Cinder; // rear bar by geometry (tube)
    const o = computeBalance({ vehicle: v, rearCorner: exampleCorners.fsRearWishbone, sensitivity: false });
    const kin = axleSummary(exampleCorners.fsRearWishbone, { rackMm: 0 });
    expect(kin.barTwistRadPerM).toBeDefined();
    expect(o.kinematicsLink.rear.source.barTwistRadPerM).toBe('kinematics');
    expect(o.kinematicsLink.rear.used.barTwistRadPerM).toBe(kin.barTwistRadPerM);
    const bar = o.effectiveVehicle.rear.antiRollBar!;
    expect('leverLengthMm' in bar).toBe(false);
    expect('twistRadPerM' in bar && bar.twistRadPerM).toBe(kin.barTwistRadPerM);
    // Kφ,bar = π(D⁴ − d⁴)G/(32 l) · θ_w² · t² (kktse, "Simplified lateral load transfer analysis"; Shigley G = 79.3 GPa), in N·m/deg.
    const kTheta = (Math.PI * (0.014 ** 4 - 0.011 ** 4) * 79.3e9) / (32 * 0.36);
    const expected = kTheta * kin.barTwistRadPerM! ** 2 * 1.19 ** 2 * (Math.PI / 180);
    expect(o.rollStiffnessNmPerDeg.detail.rear.barNmPerDeg).toBeCloseTo(expected, 9);
  });

  it('handwheel gains are road-wheel gains over the steering ratio', () => {
    const o = computeBalance({ vehicle: exampleVehicles.brackenfieldB3, sensitivity: false, speedsKph: [50, 120] });
    for (const row of o.gains.rows) expect(row.handwheel!.yawRateGainPerS).toBeCloseTo(row.yawRateGainPerS! / 15.2, 12);
  });
});
