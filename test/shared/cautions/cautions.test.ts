/**
 * Every caution rule just below and just above its default threshold, and a
 * per-vehicle override. Thresholds are product defaults (docs/cautions.md,
 * basis "common practice"); the tests check the rule logic against them.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { CAUTION_RULES, evaluateCautions, thresholdsFor, type CautionInputs, type ThresholdCautionCode } from '../../../shared/cautions/cautions.js';
import { resolveTrackProfile, trackProfiles } from '../../../shared/tracks/profiles.js';
import type { BumpCost } from '../../../shared/ride/cost.js';

/** A bump cost with everything quiet; the ride model's own tests check how the figures are made. */
const cost = (over: Partial<BumpCost> = {}): BumpCost => ({
  roadInWords: 'very good road (ISO 8608 class A) at 100 km/h',
  roadClass: 'A',
  speedKph: 100,
  cornerRadiusM: 60,
  judgedAt: 'on-centre',
  wheelTravelRmsMm: 3,
  toeRmsDeg: 0,
  yawRateRmsDegPerS: 0,
  steadyYawRateDegPerS: 26.5,
  yawDisturbancePct: 0,
  bumpHeightMm: 10,
  bumpLengthMm: 300,
  headingChangeDeg: 0,
  driftM: 0,
  peakToeChangeDeg: 0,
  landingDropMm: null,
  landingSideForceFraction: null,
  fullLockBumpSteerDegPerM: null,
  summary: '',
  ...over,
});

const quiet = (over: Partial<CautionInputs> = {}): CautionInputs => ({
  axle: 'rear',
  steered: true,
  profile: resolveTrackProfile('smooth-circuit'),
  rollSteerCoefficient: 0,
  bumpToeChangeDeg: 0,
  bumpToeRackMm: 0,
  corneringCoefficientPerDeg: 0.2,
  corneringCoefficientSource: 'test',
  landingLoadN: null,
  bumpScrubMm: 0,
  rollSteerCurvatureChange: 0,
  referenceRollDeg: 2,
  lockBumpSteerSpreadDegPerM: 0,
  lockBumpSteerRackMm: 0,
  complianceRatio: null,
  ...over,
});

const codes = (i: CautionInputs) => evaluateCautions(i).map((c) => `${c.code}:${c.level}`);
const eps = 1e-6;

describe('caution rules', () => {
  it('a quiet corner gets only the safety notice, last', () => {
    const list = evaluateCautions(quiet());
    expect(list.map((c) => c.code)).toEqual(['safety-notice']);
    expect(list[0]!.message).toMatch(/kinematics rig/);
    // DEVELOPERS.md fixes the wording: the notice must carry it verbatim.
    const dev = readFileSync(join(import.meta.dirname, '..', '..', '..', 'DEVELOPERS.md'), 'utf8');
    const quoted = dev.split('## The safety caution')[1]!.split('\n').filter((l) => l.startsWith('> ')).map((l) => l.slice(2)).join(' ');
    expect(list[0]!.message).toBe(quoted);
  });

  // [code, inputs producing value v, profile]
  const cases: Array<[ThresholdCautionCode, (v: number) => Partial<CautionInputs>, Partial<CautionInputs>]> = [
    ['bump-yaw-disturbance', (v) => ({ bumpCost: cost({ yawDisturbancePct: v }) }), {}],
    ['bump-heading-change', (v) => ({ bumpCost: cost({ driftM: -v, headingChangeDeg: -0.1 }) }), {}],
    ['landing-side-force', (v) => ({ bumpCost: cost({ landingSideForceFraction: v, landingDropMm: 500 }) }), { profile: resolveTrackProfile('off-road') }],
    ['bump-lateral-scrub', (v) => ({ bumpScrubMm: v }), {}],
    ['front-roll-steer-feel', (v) => ({ rollSteerCoefficient: v }), { axle: 'front' }],
    ['long-travel-roll-steer', (v) => ({ rollSteerCoefficient: -v }), { profile: resolveTrackProfile('off-road') }],
    ['rear-roll-oversteer', (v) => ({ rollSteerCoefficient: v }), { axle: 'rear' }],
    // Rear axle: a positive change of ε is toward roll oversteer (domain.md), the direction judged on the thresholds.
    ['roll-steer-curvature', (v) => ({ rollSteerCurvatureChange: v }), {}],
    ['lock-bump-steer-spread', (v) => ({ lockBumpSteerSpreadDegPerM: v, lockBumpSteerRackMm: 30 }), {}],
    ['compliance-steer-rivals', (v) => ({ complianceRatio: v }), {}],
  ];

  for (const [code, make, ctx] of cases) {
    it(`${code}: silent just below, fires just above each level's threshold`, () => {
      const base = quiet(ctx);
      const t = thresholdsFor(code, base.profile.id);
      const levels = (['info', 'warning', 'critical'] as const).filter((l) => t[l] !== undefined);
      expect(levels.length).toBeGreaterThan(0);
      const lowest = t[levels[0]!]!;
      expect(codes({ ...base, ...make(lowest * (1 - eps)) }).some((c) => c.startsWith(code))).toBe(false);
      for (const l of levels) {
        const th = t[l]!;
        const got = evaluateCautions({ ...base, ...make(th * (1 + eps)) }).find((c) => c.code === code)!;
        expect(got.level).toBe(l);
        expect(got.threshold).toBe(th);
        expect(got.value).toBeCloseTo(th * (1 + eps), 9);
        expect(got.basis).toBe(CAUTION_RULES[code].basis);
      }
    });
  }

  it('front roll steer is not flagged on the rear axle, nor rear roll oversteer on the front', () => {
    expect(codes(quiet({ axle: 'rear', rollSteerCoefficient: 0.05 }))).not.toContain('front-roll-steer-feel:warning');
    expect(codes(quiet({ axle: 'front', rollSteerCoefficient: 0.02 }))).not.toContain('rear-roll-oversteer:warning');
    // rear roll understeer (ε < 0) is not oversteer
    expect(codes(quiet({ axle: 'rear', rollSteerCoefficient: -0.05 })).some((c) => c.startsWith('rear-roll-oversteer'))).toBe(false);
  });

  it('a long travel range turns any profile into a long-travel one', () => {
    const long = resolveTrackProfile({ id: 'rough-road', travelMm: [-150, 160] });
    expect(long.longTravel).toBe(true);
    expect(codes(quiet({ profile: long, rollSteerCoefficient: 0.01 }))).toContain('long-travel-roll-steer:warning');
    expect(codes(quiet({ profile: resolveTrackProfile('rough-road'), rollSteerCoefficient: 0.01 })).some((c) => c.startsWith('long-travel'))).toBe(false);
  });

  it('a toe line curving toward understeer as the body rolls is noted, never warned of', () => {
    // Sign convention (domain.md): positive ε is roll understeer at the front, roll oversteer at the rear.
    // A progressive rear toe-in in bump (common practice on road cars' rear axles) curves the rear toward understeer.
    expect(codes(quiet({ axle: 'rear', rollSteerCurvatureChange: -0.04 }))).toContain('roll-steer-curvature:info');
    expect(codes(quiet({ axle: 'rear', rollSteerCurvatureChange: 0.04 }))).toContain('roll-steer-curvature:critical');
    expect(codes(quiet({ axle: 'front', rollSteerCurvatureChange: 0.04 }))).toContain('roll-steer-curvature:info');
    expect(codes(quiet({ axle: 'front', rollSteerCurvatureChange: -0.04 }))).toContain('roll-steer-curvature:critical');
    // Below the lowest threshold nothing is said, whichever the direction.
    expect(codes(quiet({ axle: 'rear', rollSteerCurvatureChange: -0.005 })).some((c) => c.startsWith('roll-steer-curvature'))).toBe(false);
  });

  it('compliance steer on the published road car is noted, never warned of or critical', () => {
    // Bundorf analysis table (Wikipedia, "Bundorf analysis", after Bundorf & Leffert, SAE 760713), deg/g:
    // front roll steer 0.6, compliance steer 0.3 (lateral force) + 0.7 (aligning torque);
    // rear roll steer −0.4, compliance steer −0.1 + 0.6. An ordinary production car must not read as a hazard.
    const front = Math.abs(0.3 + 0.7) / Math.abs(0.6);
    const rear = Math.abs(-0.1 + 0.6) / Math.abs(-0.4);
    expect(codes(quiet({ axle: 'front', complianceRatio: front }))).toContain('compliance-steer-rivals:info');
    expect(codes(quiet({ axle: 'rear', complianceRatio: rear }))).toContain('compliance-steer-rivals:info');
    // However large the ratio, elastic steer is a statement of what steers the axle, not a danger.
    expect(codes(quiet({ complianceRatio: 50 }))).toContain('compliance-steer-rivals:warning');
    expect(thresholdsFor('compliance-steer-rivals', 'smooth-circuit').critical).toBeUndefined();
  });

  it('road profiles without compliance data get the unmodelled-compliance notice', () => {
    expect(codes(quiet({ profile: resolveTrackProfile('rough-road') }))).toContain('compliance-steer-unmodelled:info');
    expect(codes(quiet({ profile: resolveTrackProfile('rough-road'), complianceKnown: true }))).not.toContain('compliance-steer-unmodelled:info');
    expect(codes(quiet())).not.toContain('compliance-steer-unmodelled:info');
  });

  it('a rack position the proposal cannot reach is a warning naming the rack and travel', () => {
    const u = { rackMm: 30, travelMm: 25, message: 'Pose unreachable at travel 25 mm, rack 30 mm: the tie rod cannot close' };
    const c = evaluateCautions(quiet({ unreachableRacks: [u] })).find((x) => x.code === 'rack-pose-unreachable');
    expect(c?.level).toBe('warning');
    expect(c?.message).toMatch(/rack 30\.0 mm.*travel 25\.0 mm/);
    expect(codes(quiet({ unreachableRacks: [] })).some((x) => x.startsWith('rack-pose-unreachable'))).toBe(false);
  });

  it('per-vehicle thresholds override the defaults', () => {
    const i = quiet({ bumpCost: cost({ yawDisturbancePct: 1.5 }) });
    expect(codes(i)).not.toContain('bump-yaw-disturbance:warning');
    expect(codes({ ...i, thresholds: { 'bump-yaw-disturbance': { warning: 1 } } })).toContain('bump-yaw-disturbance:warning');
  });

  it('judges the toe change itself only on a team’s own thresholds: an alignment tolerance is no basis for a dynamic limit', () => {
    // domain.md / issue 13: thresholds are stated in consequences (yaw rate, heading), never in alignment tolerance.
    for (const code of ['bump-toe-change', 'bump-lateral-force'] as const) {
      for (const id of Object.keys(trackProfiles) as (keyof typeof trackProfiles)[]) expect(thresholdsFor(code, id)).toEqual({});
      expect(CAUTION_RULES[code].basis).not.toMatch(/alignment spec/);
    }
    const big = quiet({ bumpToeChangeDeg: 2, landingLoadN: 3000 });
    expect(codes(big).some((c) => c.startsWith('bump-toe-change') || c.startsWith('bump-lateral-force'))).toBe(false);
    expect(codes({ ...big, thresholds: { 'bump-toe-change': { warning: 0.5 } } })).toContain('bump-toe-change:warning');
  });

  it('says why there is no bump cost when the ride model cannot run', () => {
    const c = evaluateCautions(quiet({ bumpCostUnavailable: 'vehicle.front.tyre.verticalRateNPerMm: required by the ride model' })).find((x) => x.code === 'bump-cost-unavailable');
    expect(c?.level).toBe('info');
    expect(c?.message).toMatch(/verticalRateNPerMm/);
  });

  it('states the heading rule in drift at the profile speed and the yaw rule against the steady yaw rate', () => {
    const c = evaluateCautions(quiet({ bumpCost: cost({ headingChangeDeg: 0.6, driftM: (100 / 3.6) * Math.tan((0.6 * Math.PI) / 180) }) })).find((x) => x.code === 'bump-heading-change')!;
    expect(c.level).toBe('critical');
    expect(c.message).toMatch(/29\.1 cm of sideways drift/);
    const y = evaluateCautions(quiet({ bumpCost: cost({ yawRateRmsDegPerS: 0.8, yawDisturbancePct: 3.02 }) })).find((x) => x.code === 'bump-yaw-disturbance')!;
    expect(y.level).toBe('warning');
    expect(y.message).toMatch(/26\.5 deg\/s of a 60 m corner/);
  });

  it('the profile overrides of travel, bump, road, speed and corner apply', () => {
    const p = resolveTrackProfile({ id: 'bumpy-circuit', travelMm: [-20, 30], bumpHeightMm: 12, roadClass: 'D', speedKph: 55, cornerRadiusM: 25, bumpLengthMm: 800 });
    expect(p.travelMm).toEqual([-20, 30]);
    expect(p.bumpHeightMm).toBe(12);
    expect([p.roadClass, p.speedKph, p.cornerRadiusM, p.bumpLengthMm]).toEqual(['D', 55, 25, 800]);
    expect(resolveTrackProfile('off-road').landingDropMm).toBeGreaterThan(0);
    expect(resolveTrackProfile('smooth-circuit').landingDropMm).toBeNull();
    expect(resolveTrackProfile('bumpy-circuit').bumpHeightMm).toBe(trackProfiles['bumpy-circuit'].bumpHeightMm);
  });
});

describe('docs/cautions.md', () => {
  it('documents every caution code and every default threshold', async () => {
    const { readFileSync } = await import('node:fs');
    const { join } = await import('node:path');
    const doc = readFileSync(join(import.meta.dirname, '..', '..', '..', 'docs', 'cautions.md'), 'utf8');
    const { CAUTION_CODES } = await import('../../../shared/cautions/cautions.js');
    for (const code of CAUTION_CODES) expect(doc).toContain(`\`${code}\``);
    for (const [code, rule] of Object.entries(CAUTION_RULES)) {
      const row = doc.split('\n').find((l) => l.startsWith(`| \`${code}\``))!;
      expect(row).toContain(rule.basis);
      for (const id of Object.keys(trackProfiles) as (keyof typeof trackProfiles)[]) {
        const t = thresholdsFor(code as keyof typeof CAUTION_RULES, id);
        for (const v of [t.info, t.warning, t.critical]) if (v !== undefined) expect(row).toContain(String(v));
      }
    }
  });
});
