/**
 * Issue 13 §1.3: Ackermann is measured from the straight-ahead pose (static
 * toe removed), with t_s the distance between the steering axes' ground
 * points. Checked against a hand calculation on a corner whose steering is a
 * plane four-bar (the planar-equivalent double wishbone of check-values.md,
 * "Kinematics: analytic cases", with 0.1° of static toe-in per wheel).
 */
import { describe, expect, it } from 'vitest';
import { ackermannPercent, axleKinematics, rollSweep } from '../../../shared/kinematics/index.js';
import type { Corner, DoubleWishboneCorner } from '../../../shared/schema/corner.js';
import { planarWishbone } from './helpers.js';

const TOE = (0.1 * Math.PI) / 180;
// The planar-equivalent double wishbone (./helpers.ts): vertical kingpin at x = 0, y = 600 mm (ball joints straight
// above each other); steering-arm point 100 mm behind it at z = 200, tie rod 300 mm along y to the rack; its spin axis
// turned by 0.1° so that the left wheel points inward at the front (toe-in: δ_L = −0.1°, domain.md).
const base = planarWishbone({ tieRodInner: [-100, 300, 200] }) as DoubleWishboneCorner;
const wc = base.points.wheelCentre;
const corner: Corner = { ...base, name: 'planar four-bar steering, 0.1° toe-in', points: { ...base.points, spindle: [wc[0] - 50 * Math.sin(TOE), wc[1] - 50 * Math.cos(TOE), wc[2]] } };
const L = 2600;

/**
 * Hand calculation (derived): at design height the upright can only turn about the vertical kingpin, so each
 * wheel's steer from straight ahead is the rotation ψ of the steering-arm point about the kingpin in plan view,
 * P = K + 0.1·(−cos ψ, −sin ψ) m, with the tie rod's inner end I = (−0.1, ±0.3 + rack) and |P − I| = 0.3 m.
 * Solved by bisection on ψ ∈ (−0.6, 0.6) rad.
 */
function psi(side: 1 | -1, rackM: number): number {
  const f = (p: number) => Math.hypot(-0.1 * Math.cos(p) + 0.1, side * 0.6 - 0.1 * Math.sin(p) - (side * 0.3 + rackM)) - 0.3;
  let lo = -0.6;
  let hi = 0.6;
  // f is monotonic on this interval for both sides (the arm point crosses the tie rod's reach once).
  const flo = f(lo);
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (Math.sign(f(mid)) === Math.sign(flo)) lo = mid;
    else hi = mid;
  }
  return ((lo + hi) / 2) * (180 / Math.PI);
}

describe('Ackermann from the straight-ahead pose (issue 13 §1.3)', () => {
  const ak = axleKinematics(corner, { wheelbaseMm: L, steeringPoints: 81 });
  const st = ak.steering!;

  it('the straight-ahead pose is rack 0 with the static toe on each wheel, and t_s = 1200 mm (kingpins at y = ±600)', () => {
    expect(st.straightAhead.rackMm).toBe(0);
    expect(st.straightAhead.leftSteerDeg).toBeCloseTo(-0.1, 9);
    expect(st.straightAhead.rightSteerDeg).toBeCloseTo(0.1, 9);
    expect(st.straightAhead.steeringAxisTrackMm).toBeCloseTo(1200, 6);
    expect(st.ackermannDefinition).toMatch(/straight-ahead/);
  });

  it('at about 3° of mean steer the percentage is the hand value from ψ_in, ψ_out and cot ψ_o − cot ψ_i,ideal = t_s/L', () => {
    const row = st.rows.find((r) => Math.abs(r.rackMm + 5) < 1e-9)!;
    expect(row.axleSteerDeg).toBeGreaterThan(2.5);
    expect(row.axleSteerDeg).toBeLessThan(3.5);
    // Turning left: the left wheel is the inner one.
    const inner = psi(1, -0.005);
    const outer = psi(-1, -0.005);
    // The solver's wheel angles are the four-bar's rotations plus the static toe (1e-9 deg: the kinematics engine's accuracy).
    expect(row.leftSteerDeg).toBeCloseTo(inner - 0.1, 8);
    expect(row.rightSteerDeg).toBeCloseTo(outer + 0.1, 8);
    const d = Math.PI / 180;
    const idealInner = Math.atan(1 / (1 / Math.tan(outer * d) - 1200 / L)) / d;
    const hand = ((inner - outer) / (idealInner - outer)) * 100;
    expect(row.ackermannPercent!).toBeCloseTo(hand, 6);
    // With the static toe left in and the contact-patch track (the old reading) the figure is far off.
    const withToe = ackermannPercent(row.leftSteerDeg, row.rightSteerDeg, ak.trackMm, L)!;
    expect(Math.abs(withToe - hand)).toBeGreaterThan(20);
  });

  it('the definition: 100 % for the ideal pair, 0 % for parallel steer', () => {
    // cot δo − cot δi = t/L (common practice)
    const dout = 20;
    const dinIdeal = (Math.atan(1 / (1 / Math.tan((dout * Math.PI) / 180) - 1200 / L)) * 180) / Math.PI;
    expect(ackermannPercent(dinIdeal, dout, 1200, L)).toBeCloseTo(100, 9);
    expect(ackermannPercent(-dout, -dinIdeal, 1200, L)).toBeCloseTo(100, 9);
    expect(ackermannPercent(dout, dout, 1200, L)).toBeCloseTo(0, 9);
  });

  it('in the roll sweep the same rack reads the same percentage at zero roll', () => {
    const r = rollSweep(corner, { roll: { from: -1, to: 1, step: 1 }, rackMm: [-5], wheelbaseMm: L });
    const at0 = r.rows.find((x) => x.rollDeg === 0)!;
    const row = st.rows.find((x) => Math.abs(x.rackMm + 5) < 1e-9)!;
    expect(at0.ackermannPercent!).toBeCloseTo(row.ackermannPercent!, 9);
  });
});
