/**
 * Found by the compute fuzzing (issue 8): a roll centre far above the CG makes
 * an axle's lateral load transfer negative, the model's wheel-lift limit ≤ 0,
 * and the steer curve's speeds √(a_y·g·R) NaN (null in JSON). The balance
 * model now refuses such a vehicle with a SolveError naming the axle.
 * Lateral load transfer per axle (elastic share + geometric part through the
 * roll centre) follows Milliken & Milliken, Race Car Vehicle Dynamics, ch. 18
 * (from memory): with the roll centre above the CG the roll moment reverses.
 */
import { describe, expect, it } from 'vitest';
import { computeBalance } from '../../../shared/balance/api.js';
import { exampleVehicles } from '../../../shared/balance/examples.js';
import { evaluateBalance } from '../../../shared/balance/index.js';
import { SolveError } from '../../../shared/errors.js';
import { exampleCorners } from '../../../shared/kinematics/examples.js';

function walkFinite(v: unknown, path: string, out: string[]): string[] {
  if (typeof v === 'number' && !Number.isFinite(v)) out.push(path);
  else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) walkFinite(x, `${path}.${k}`, out);
  return out;
}

describe('a vehicle with no valid lateral-acceleration range', () => {
  it('a roll centre 3 m up is a SolveError naming the axle and the roll-centre field, not NaN speeds', () => {
    const v = structuredClone(exampleVehicles.brackenfieldB5);
    v.front.rollCentreHeightMm = 3000;
    let err: unknown;
    try {
      evaluateBalance(v);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(SolveError);
    const e = err as SolveError;
    expect(e.code).toBe('singular_geometry');
    expect(e.message).toMatch(/^(front|rear): lateral load transfer -?\d+ N\/g/);
    expect(e.message).toMatch(/rollCentreHeightMm/);
    expect(e.details['limitG']).toBeLessThanOrEqual(0);
    expect(['front', 'rear']).toContain(e.details['axle']);
  });

  it('a corner with its lower front pivot on the spindle point is well posed but puts the roll centre 3 m up: a SolveError naming the roll centres, not NaN', () => {
    const front = structuredClone(exampleCorners.fsFrontWishbone);
    if (front.type !== 'double-wishbone') throw new Error('example changed');
    front.points.lowerFront = [...front.points.spindle];
    // Issue 13 §1.7: the corner schema refuses only singular geometry; this pose Jacobian is regular
    // (test/shared/kinematics/jacobian.test.ts), so the corner is accepted and its kinematics are read.
    let err: unknown;
    try {
      computeBalance({ vehicle: exampleVehicles.brackenfieldB5, frontCorner: front, rearCorner: exampleCorners.fsRearWishbone });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(SolveError);
    const e = err as SolveError;
    expect(e.code).toBe('singular_geometry');
    expect(e.message).toMatch(/rollCentreHeightMm/);
    expect(e.message).toMatch(/front \d{4} mm/);
  });

  it('plausible roll-centre heights still evaluate, every number finite', () => {
    for (const h of [-50, 60, 400, 1000]) {
      const v = structuredClone(exampleVehicles.brackenfieldB5);
      v.front.rollCentreHeightMm = h;
      const r = evaluateBalance(v);
      expect(r.steerCurve.rows.length).toBeGreaterThan(1);
      expect(walkFinite(r, 'result', [])).toEqual([]);
    }
  });
});

describe('a step-steer speed close to zero', () => {
  // Also found by fuzzing: 1e-170 km/h passed `positive()` and the transient model failed with "singular matrix".
  it('is refused at the door, naming speedKph', () => {
    for (const speedKph of [1e-170, 0.01, 0.5]) {
      expect(() => computeBalance({ vehicle: exampleVehicles.tur26Ember, speedKph })).toThrow(/^Invalid balance request: speedKph: speedKph must be at least 1 km\/h/);
    }
    expect(computeBalance({ vehicle: exampleVehicles.tur26Ember, speedKph: 1 }).stepSteer.speedKph).toBe(1);
  });
});

describe('a body with no stable roll angle', () => {
  // Found by fuzzing: relayed without a prefix (the intent solver passes it on), the old message named no field.
  it('the message itself names the axles and cgHeightMm', async () => {
    const { InputError } = await import('../../../shared/errors.js');
    const v = structuredClone(exampleVehicles.tur26Ember);
    v.cgHeightMm = 9e15;
    let err: unknown;
    try {
      evaluateBalance(v);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    expect((err as Error).message).toMatch(/^front and rear roll stiffness, [\d.]+ N·m\/deg in total, does not exceed/);
    expect((err as InstanceType<typeof InputError>).issues.map((i) => i.path)).toEqual(['front', 'rear', 'cgHeightMm']);
  });
});

describe('inputs many orders of magnitude off', () => {
  // Found by fuzzing: a roll damping of 9e300 N·m·s/deg gave NaN eigenvalues of the roll model (null in JSON, status 200).
  // Since issue 12 every vehicle number has a plausible range (shared/schema/ranges.ts): such a value is refused at the
  // door naming the field, before the model can overflow.
  it('are refused at the door naming the field, never a NaN in the result', () => {
    const v = structuredClone(exampleVehicles.tur26Ember);
    v.rollDampingNmsPerDeg = 9e300;
    expect(() => computeBalance({ vehicle: v })).toThrow(/^Invalid balance request: vehicle\.rollDampingNmsPerDeg: .*not a possible roll damping/);
    expect(() => computeBalance({ vehicle: exampleVehicles.tur26Ember, variant: { vehicle: v } })).toThrow(/^Invalid balance request: variant\.vehicle\.rollDampingNmsPerDeg: /);
  });
});
