/**
 * Any member of the solution family worked out for the workshop (issue 15 §3):
 * its verified ε, the curves beside the current ones, the as-built ε after
 * whole shims, the per-mm sensitivities, the moved link named as the trade
 * names it, and "a new link or bracket is needed" where the adjusters cannot reach.
 */
import { describe, expect, it } from 'vitest';
import { axleSummary, exampleCorners, rollSteerCoefficient } from '../../../shared/kinematics/index.js';
import { intentSchema, type IntentInput } from '../../../shared/schema/intent.js';
import type { Corner, Vec3 } from '../../../shared/schema/corner.js';
import { asBuiltCorner, linkName, proposalDetails, solveIntent, workshopNumbers } from '../../../shared/intent/index.js';
import { DEG_PER_RAD } from '../../../shared/angles.js';
import { exampleVehicles } from '../../../shared/balance/index.js';
import { SI_FIGURES, type CautionFigures } from '../../../shared/cautions/cautions.js';

const front = exampleCorners.fsFrontWishbone;
const p = front.points as Record<string, Vec3>;
const intent = (extra: Partial<IntentInput> = {}) =>
  intentSchema.parse({
    corner: front,
    axle: 'front',
    target: { rollSteerCoefficient: 0.02 },
    movable: ['tieRodInner.z', 'tieRodOuter.z'],
    bounds: { 'tieRodInner.z': [p['tieRodInner']![2] - 20, p['tieRodInner']![2] + 20], 'tieRodOuter.z': [p['tieRodOuter']![2] - 20, p['tieRodOuter']![2] + 20] },
    trackProfile: 'smooth-circuit',
    ...extra,
  });

describe('a chosen family member', () => {
  const i = intent();
  const solved = solveIntent(i);
  const other = solved.family.find((m) => !m.chosen)!;

  it('the solver’s own pick gives back the solver’s verified ε, and another member its own', () => {
    const chosen = solved.family.find((m) => m.chosen)!;
    // Same geometry, same engine: equal to rounding of the coordinates (1e-9 deg/deg).
    expect(proposalDetails(i, chosen.coordinates).rollSteerCoefficient).toBeCloseTo(solved.achieved.rollSteerCoefficient, 9);
    const d = proposalDetails(i, other.coordinates);
    expect(d.rollSteerCoefficient).toBeCloseTo(other.rollSteerCoefficient, 12);
    // Every member meets the target (issue 5: within 0.002 deg/deg).
    expect(Math.abs(d.rollSteerCoefficient - 0.02)).toBeLessThan(0.002);
    expect(d.coordinates.map((c) => c.proposedMm)).toEqual(i.movable.map((n) => other.coordinates[n]));
  });

  it('holds values to their bounds', () => {
    const d = proposalDetails(i, { 'tieRodInner.z': 1e6, 'tieRodOuter.z': -1e6 });
    expect(d.coordinates[0]!.proposedMm).toBe(i.bounds['tieRodInner.z']![1]);
    expect(d.coordinates[1]!.proposedMm).toBe(i.bounds['tieRodOuter.z']![0]);
    expect(d.coordinates[0]!.atBound).toBe('max');
  });

  it('its roll-steer curve has slope −ε at zero roll (ε = −dδ̄/dφ, domain primer)', () => {
    const d = proposalDetails(i, other.coordinates);
    const at = (phi: number) => d.rollCurve.find((r) => r.rollDeg === phi)!;
    const slopeNew = (at(0.5).proposedDeg - at(-0.5).proposedDeg) / 1;
    const slopeNow = (at(0.5).currentDeg - at(-0.5).currentDeg) / 1;
    // Central difference over ±0.5°: its error is the curve's third-order term, well under 1 % of ε here.
    expect(slopeNew).toBeCloseTo(-d.rollSteerCoefficient, 4);
    expect(slopeNow).toBeCloseTo(-d.currentRollSteerCoefficient, 4);
    expect(at(0).proposedDeg).toBe(0);
  });

  it('its toe curve gives ε = −g·(t/2)·π/180 (domain primer worked check; Gillespie, Fundamentals of Vehicle Dynamics, roll steer)', () => {
    const d = proposalDetails(i, other.coordinates);
    const near = d.toeCurve.filter((r) => Math.abs(r.travelMm) <= 2.5 + 1e-9);
    const lo = near[0]!;
    const hi = near.at(-1)!;
    const gDegPerMm = (hi.proposedDeg - lo.proposedDeg) / (hi.travelMm - lo.travelMm);
    const t = axleSummary(d.corner).trackMm;
    const eps = -gDegPerMm * (t / 2) / DEG_PER_RAD;
    // Toe gradient from a ±2.5 mm central difference of the swept curve: 2 % covers its curvature term.
    expect(eps).toBeCloseTo(d.rollSteerCoefficient, 3);
    expect(Math.abs(eps - d.rollSteerCoefficient)).toBeLessThan(0.02 * Math.abs(d.rollSteerCoefficient));
    expect(d.toeCurve.find((r) => r.travelMm === 0)!.currentDeg).toBe(0);
  });

  it('as built with whole shims: its ε is the engine’s ε of the shimmed geometry, and the sensitivities predict it to first order (Taylor, from memory)', () => {
    const coarse = intent({ options: { shimThicknessMm: 2 } });
    const d = proposalDetails(coarse, other.coordinates);
    const built = asBuiltCorner(front, d.corner, 2);
    expect(d.asBuilt.rollSteerCoefficient).toBeCloseTo(rollSteerCoefficient(built), 12);
    expect(d.asBuilt.shimRoundingEffect).toBeCloseTo(d.asBuilt.rollSteerCoefficient - d.rollSteerCoefficient, 12);
    const bp = built.points as Record<string, Vec3>;
    const dp = d.corner.points as Record<string, Vec3>;
    const predicted =
      d.sensitivity['tieRodInner.z']! * (bp['tieRodInner']![2] - dp['tieRodInner']![2]) + d.sensitivity['tieRodOuter.z']! * (bp['tieRodOuter']![2] - dp['tieRodOuter']![2]);
    // ε is very nearly linear in mm-sized height changes (docs/intent.md): the first-order prediction holds to 10 %.
    expect(Math.abs(predicted - d.asBuilt.shimRoundingEffect)).toBeLessThanOrEqual(0.1 * Math.abs(d.asBuilt.shimRoundingEffect) + 1e-5);
    // Raising the outer end alone against the inner: opposite signs of authority (a tie rod's tilt sets bump steer; common practice).
    expect(Math.sign(d.sensitivity['tieRodInner.z']!)).toBe(-Math.sign(d.sensitivity['tieRodOuter.z']!));
  });

  it('names the static toe re-set with its direction', () => {
    const d = proposalDetails(i, other.coordinates);
    const r = d.staticToe;
    expect(r.resetDeg).toBeCloseTo(r.designToeDeg - r.toeAfterShimmingDeg, 12);
    expect(r.direction).toBe(Math.abs(r.resetDeg) < 5e-4 ? 'none' : r.resetDeg > 0 ? 'toe-in' : 'toe-out');
  });
});

describe('a chosen member’s own cautions, bump cost and verification (issue 15 §3: not the solver’s pick’s)', () => {
  // The FS rear toe link with the vehicle, so the ride model prices the bump steer; every bump-toe-change and
  // scrub reading is reported (a team's zero thresholds), so each member's caution carries its own measured value.
  const rear = exampleCorners.fsRearWishbone;
  const rp = rear.points as Record<string, Vec3>;
  const i = intentSchema.parse({
    corner: rear,
    axle: 'rear',
    target: { rollSteerCoefficient: -0.03 },
    movable: ['tieRodInner.z', 'tieRodOuter.z'],
    bounds: { 'tieRodInner.z': [rp['tieRodInner']![2] - 25, rp['tieRodInner']![2] + 25], 'tieRodOuter.z': [rp['tieRodOuter']![2] - 25, rp['tieRodOuter']![2] + 25] },
    trackProfile: 'bumpy-circuit',
    vehicle: exampleVehicles.tur26Ember,
    cautionThresholds: { 'bump-toe-change': { info: 0 }, 'bump-lateral-scrub': { info: 0 } },
  });
  const solved = solveIntent(i);
  const pick = solved.family.find((m) => m.chosen)!;
  // The member farthest from the pick along the family: a different geometry with its own bump toe.
  const far = solved.family.reduce((a, m) => (Math.abs(m.bumpToeChangeDeg! - pick.bumpToeChangeDeg!) > Math.abs(a.bumpToeChangeDeg! - pick.bumpToeChangeDeg!) ? m : a), pick);
  const value = (cs: { code: string; value: number | null }[], code: string) => cs.find((c) => c.code === code)?.value ?? null;

  it('the solver’s pick worked out as a member has the solver’s own cautions, bump cost and verified figures', () => {
    const d = proposalDetails(i, pick.coordinates);
    expect(d.cautions.map((c) => [c.code, c.level])).toEqual(solved.cautions.map((c) => [c.code, c.level]));
    for (const c of solved.cautions) if (c.value !== null) expect(value(d.cautions, c.code)).toBeCloseTo(c.value, 6);
    expect(d.bumpCost).not.toBeNull();
    expect(d.bumpCost!.yawRateRmsDegPerS).toBeCloseTo(solved.bumpCost!.yawRateRmsDegPerS!, 6);
    expect(d.verified.bumpSteerDegPerM).toBeCloseTo(solved.achieved.bumpSteerDegPerM, 6);
    expect(d.verified.worstToeDeg).toBeCloseTo(solved.achieved.worstToeDeg, 6);
  });

  it('another member carries its own: its bump toe and yaw-rate disturbance are the family table’s figures for it', () => {
    expect(far).not.toBe(pick);
    const d = proposalDetails(i, far.coordinates);
    // The rear is unsteered: the caution's largest bump toe is the one at rack 0, the family's own figure.
    expect(value(d.cautions, 'bump-toe-change')).toBeCloseTo(Math.abs(far.bumpToeChangeDeg!), 9);
    expect(value(d.cautions, 'bump-toe-change')).not.toBeCloseTo(value(solved.cautions, 'bump-toe-change')!, 4);
    expect(d.bumpCost!.yawRateRmsDegPerS).toBeCloseTo(far.bumpCost!.yawRateRmsDegPerS, 9);
    expect(d.cautions.at(-1)!.code).toBe('safety-notice');
  });

  it('writes the cautions’ figures with the formatter it is given (1 in = 25.4 mm exactly, international yard of 1959)', () => {
    const inches: CautionFigures = { ...SI_FIGURES, length: (mm) => `${(mm / 25.4).toFixed(3)} in` };
    const si = proposalDetails(i, far.coordinates);
    const us = proposalDetails(i, far.coordinates, inches);
    const scrubSi = si.cautions.find((c) => c.code === 'bump-lateral-scrub')!;
    const scrubUs = us.cautions.find((c) => c.code === 'bump-lateral-scrub')!;
    expect(scrubSi.message).toMatch(/ mm sideways/);
    expect(scrubUs.message).not.toMatch(/\bmm\b/);
    expect(scrubUs.message).toContain(`${(scrubSi.value! / 25.4).toFixed(3)} in sideways`);
  });
});

describe('workshop numbers', () => {
  const raised = (c: Corner, dz: number): Corner => {
    const pts = c.points as Record<string, Vec3>;
    const o = pts['tieRodOuter']!;
    return { ...c, points: { ...c.points, tieRodOuter: [o[0], o[1], o[2] + dz] } } as Corner;
  };
  const opts = { shimThicknessMm: 0.5, threadPitchMm: 1.25, adjuster: 'single-thread' as const, adjusterReachMm: 5, shimStackMaxMm: 10 };

  it('name the link the solver moves, as the trade names it', () => {
    expect(linkName(exampleCorners.fsFrontWishbone)).toBe('tie rod');
    expect(linkName(exampleCorners.fsRearWishbone)).toBe('toe link');
    expect(linkName(exampleCorners.roadRearFiveLink)).toBe(`link ${(exampleCorners.roadRearFiveLink as { toeLink: number }).toeLink} (toe link)`);
    expect(workshopNumbers(exampleCorners.fsRearWishbone, exampleCorners.fsRearWishbone, opts).link).toBe('toe link');
  });

  it('one turn of a single thread changes the length by one pitch, a turnbuckle by two (common practice)', () => {
    const w = workshopNumbers(front, raised(front, 3), opts);
    expect(w.adjuster.turns * 1.25).toBeCloseTo(w.tieRod.asBuiltLengthMm - w.tieRod.lengthBeforeMm, 12);
    expect(workshopNumbers(front, raised(front, 3), { ...opts, adjuster: 'turnbuckle' }).adjuster.turns).toBeCloseTo(w.adjuster.turns / 2, 12);
    expect(w.adjuster.withinReach).toBe(true);
    expect(w.newParts).toEqual([]);
  });

  it('say a new link or bracket is needed when the adjuster or the shims cannot reach, instead of turns', () => {
    // A 40 mm rise: the rod's length changes by far more than a 0.2 mm reach, and the stack exceeds 10 mm.
    const w = workshopNumbers(front, raised(front, 40), { ...opts, adjusterReachMm: 0.2 });
    expect(w.adjuster.withinReach).toBe(false);
    expect(w.newParts.some((m) => m.startsWith('A new link or bracket is needed: the tie rod must'))).toBe(true);
    expect(w.newParts.some((m) => m.includes('A new bracket is needed at the tie rod\'s outer end'))).toBe(true);
  });

  it('a fore-aft move is never shim work', () => {
    const pts = front.points as Record<string, Vec3>;
    const o = pts['tieRodOuter']!;
    const moved = { ...front, points: { ...front.points, tieRodOuter: [o[0] + 4, o[1], o[2]] } } as Corner;
    const w = workshopNumbers(front, moved, opts);
    expect(w.newParts.some((m) => m.includes('fore-aft by 4 mm'))).toBe(true);
  });
});
