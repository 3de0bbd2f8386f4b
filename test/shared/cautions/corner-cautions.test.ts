/**
 * Cautions for any corner (`cautionsForCorner`): the same list the solver
 * gives its verified proposal (one measurement, one set of rules), and each
 * measured rule just below and just above its threshold (issue 5: "each rule
 * has a test just below and just above its threshold"). Thresholds here are
 * set around the measured value, so the check is of the comparison and the
 * reported figures, not of a tuned number.
 */
import { describe, expect, it } from 'vitest';
import { exampleCorners } from '../../../shared/kinematics/index.js';
import { exampleVehicles } from '../../../shared/balance/index.js';
import { intentSchema } from '../../../shared/schema/intent.js';
import type { Corner, Vec3 } from '../../../shared/schema/corner.js';
import { SolveError } from '../../../shared/errors.js';
import { solveIntent } from '../../../shared/intent/index.js';
import { CAUTION_RULES, type CautionThresholds } from '../../../shared/cautions/cautions.js';
import { cautionsForCorner } from '../../../shared/cautions/corner-cautions.js';
import { DEFAULT_TRACK_PROFILE } from '../../../shared/tracks/profiles.js';
import type { AxleName } from '../../../shared/schema/axle.js';

function heights(corner: Corner, range: number): Record<string, [number, number]> {
  const p = corner.points as Record<string, Vec3>;
  return {
    'tieRodInner.z': [p['tieRodInner']![2] - range, p['tieRodInner']![2] + range],
    'tieRodOuter.z': [p['tieRodOuter']![2] - range, p['tieRodOuter']![2] + range],
  };
}

describe('cautionsForCorner gives the solver’s cautions for the solver’s geometry', () => {
  it('rear toe link with a vehicle and team thresholds', () => {
    const corner = exampleCorners.fsRearWishbone;
    const vehicle = exampleVehicles.tur26Ember;
    const cautionThresholds = { 'bump-toe-change': { warning: 0.01, critical: 0.5 } };
    const r = solveIntent(
      intentSchema.parse({ corner, axle: 'rear', target: { understeerChangeDegPerG: 0.03 }, movable: ['tieRodInner.z', 'tieRodOuter.z'], bounds: heights(corner, 25), trackProfile: 'bumpy-circuit', vehicle, cautionThresholds }),
    );
    const list = cautionsForCorner(r.corner, { axle: 'rear', trackProfile: 'bumpy-circuit', vehicle, thresholds: cautionThresholds });
    expect(list).toEqual(r.cautions);
    expect(list.some((c) => c.code === 'bump-toe-change')).toBe(true);
  });

  it('steered front wishbone, no vehicle, a profile with its travel overridden', () => {
    const corner = exampleCorners.fsFrontWishbone;
    const trackProfile = { id: 'rough-road' as const, travelMm: [-25, 25] as [number, number], bumpHeightMm: 20 };
    const r = solveIntent(intentSchema.parse({ corner, axle: 'front', target: { rollSteerCoefficient: 0.04 }, movable: ['tieRodInner.z', 'tieRodOuter.z'], bounds: heights(corner, 20), trackProfile }));
    expect(cautionsForCorner(r.corner, { axle: 'front', trackProfile })).toEqual(r.cautions);
  });
});

describe('each measured rule just below and just above its threshold (any corner, not a solved one)', () => {
  const cases: Array<{ corner: Corner; axle: AxleName; codes: (keyof typeof CAUTION_RULES)[] }> = [
    {
      corner: exampleCorners.fsFrontWishbone,
      axle: 'front',
      codes: ['bump-toe-change', 'bump-lateral-force', 'bump-lateral-scrub', 'front-roll-steer-feel', 'roll-steer-curvature', 'lock-bump-steer-spread'],
    },
    { corner: exampleCorners.fsRearWishbone, axle: 'rear', codes: ['bump-toe-change', 'bump-lateral-scrub', 'roll-steer-curvature'] },
  ];
  for (const c of cases) {
    for (const code of c.codes) {
      it(`${c.axle} ${c.corner.type}: ${code}`, () => {
        const run = (t: CautionThresholds) => cautionsForCorner(c.corner, { axle: c.axle, trackProfile: DEFAULT_TRACK_PROFILE[c.axle], thresholds: t }).find((x) => x.code === code);
        const off = { info: undefined, warning: undefined, critical: undefined };
        const probe = run({ [code]: { ...off, info: 0 } });
        expect(probe).toBeDefined();
        const v = probe!.value!;
        expect(v).toBeGreaterThan(0);
        expect(run({ [code]: { ...off, warning: v * (1 + 1e-6) } })).toBeUndefined();
        const above = run({ [code]: { ...off, warning: v * (1 - 1e-6) } });
        expect(above).toMatchObject({ level: 'warning', code, value: v, threshold: v * (1 - 1e-6), unit: CAUTION_RULES[code].unit, basis: CAUTION_RULES[code].basis });
        expect(above!.message.length).toBeGreaterThan(20);
        // Reaching the critical threshold raises the level.
        expect(run({ [code]: { ...off, warning: v / 2, critical: v } })?.level).toBe('critical');
      });
    }
  }
});

describe('profiles and rack positions', () => {
  it('a profile travel beyond the corner’s reach is a SolveError naming trackProfile.travelMm', () => {
    let err: unknown;
    try {
      cautionsForCorner(exampleCorners.fsFrontWishbone, { axle: 'front', trackProfile: 'off-road' });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(SolveError);
    expect((err as SolveError).details['field']).toBe('trackProfile.travelMm');
  });

  it('the bump height of the profile sets the bump toe change (a bigger bump toes more)', () => {
    const at = (bumpHeightMm: number) =>
      cautionsForCorner(exampleCorners.fsFrontWishbone, { axle: 'front', trackProfile: { id: 'smooth-circuit', bumpHeightMm }, thresholds: { 'bump-toe-change': { info: 0 } } }).find((x) => x.code === 'bump-toe-change')!.value!;
    expect(at(20)).toBeGreaterThan(at(10));
  });

  it('the safety notice always comes last', () => {
    const list = cautionsForCorner(exampleCorners.roadRearFiveLink, { axle: 'rear', trackProfile: 'rough-road', vehicle: exampleVehicles.brackenfieldB5 });
    expect(list.at(-1)!.code).toBe('safety-notice');
  });
});
