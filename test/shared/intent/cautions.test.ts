/**
 * Every caution rule just below and just above its default threshold, and a
 * per-vehicle override. Thresholds are product defaults (docs/cautions.md,
 * basis "common practice"); the tests check the rule logic against them.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { CAUTION_RULES, evaluateCautions, thresholdsFor, type CautionInputs, type ThresholdCautionCode } from '../../../shared/intent/cautions.js';
import { resolveTrackProfile, trackProfiles } from '../../../shared/intent/profiles.js';

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
    ['bump-toe-change', (v) => ({ bumpToeChangeDeg: v, corneringCoefficientPerDeg: 0 }), {}],
    ['bump-lateral-force', (v) => ({ bumpToeChangeDeg: v / 0.2 }), { profile: resolveTrackProfile({ id: 'smooth-circuit' }) }],
    ['bump-lateral-scrub', (v) => ({ bumpScrubMm: v }), {}],
    ['front-roll-steer-feel', (v) => ({ rollSteerCoefficient: v }), { axle: 'front' }],
    ['long-travel-roll-steer', (v) => ({ rollSteerCoefficient: -v }), { profile: resolveTrackProfile('off-road') }],
    ['rear-roll-oversteer', (v) => ({ rollSteerCoefficient: v }), { axle: 'rear' }],
    ['roll-steer-curvature', (v) => ({ rollSteerCurvatureChange: -v }), {}],
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
    const i = quiet({ bumpToeChangeDeg: 0.12, corneringCoefficientPerDeg: 0 });
    expect(codes(i)).not.toContain('bump-toe-change:warning');
    expect(codes({ ...i, thresholds: { 'bump-toe-change': { warning: 0.1 } } })).toContain('bump-toe-change:warning');
  });

  it('bump thresholds tighten from smooth circuit to off-road (profiles carry their own defaults)', () => {
    const w = (id: keyof typeof trackProfiles) => thresholdsFor('bump-toe-change', id).warning!;
    expect(w('off-road')).toBeLessThan(w('bumpy-circuit'));
    expect(w('bumpy-circuit')).toBeLessThan(w('smooth-circuit'));
  });

  it('the profile overrides of travel and bump height apply', () => {
    const p = resolveTrackProfile({ id: 'bumpy-circuit', travelMm: [-20, 30], bumpHeightMm: 12 });
    expect(p.travelMm).toEqual([-20, 30]);
    expect(p.bumpHeightMm).toBe(12);
    expect(resolveTrackProfile('bumpy-circuit').bumpHeightMm).toBe(trackProfiles['bumpy-circuit'].bumpHeightMm);
  });
});

describe('docs/cautions.md', () => {
  it('documents every caution code and every default threshold', async () => {
    const { readFileSync } = await import('node:fs');
    const { join } = await import('node:path');
    const doc = readFileSync(join(import.meta.dirname, '..', '..', '..', 'docs', 'cautions.md'), 'utf8');
    const { CAUTION_CODES } = await import('../../../shared/intent/cautions.js');
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
