/**
 * Bad intents are refused with an InputError that names the field
 * (issue 5: CLI exit 2 naming the field; HTTP 400 with the field list).
 */
import { describe, expect, it } from 'vitest';
import { exampleCorners } from '../../../shared/kinematics/index.js';
import { exampleVehicles } from '../../../shared/balance/index.js';
import { computeSolve } from '../../../shared/intent/api.js';
import { InputError } from '../../../shared/errors.js';
import { intentSchema } from '../../../shared/schema/intent.js';

const good = () => ({
  corner: exampleCorners.fsFrontWishbone,
  axle: 'front',
  target: { rollSteerCoefficient: 0.02 },
  movable: ['tieRodInner.z', 'tieRodOuter.z'],
  bounds: { 'tieRodInner.z': [125, 160], 'tieRodOuter.z': [150, 190] },
  trackProfile: 'smooth-circuit',
});

function issuesOf(input: unknown): { path: string; message: string }[] {
  try {
    computeSolve(input);
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as InputError).issues;
  }
  throw new Error('expected an InputError');
}

describe('intent validation names the field', () => {
  it('accepts the good intent and fills the option defaults', () => {
    const i = intentSchema.parse(good());
    expect(i.options.familySize).toBe(21);
    expect(i.options.shimThicknessMm).toBe(1);
    expect(i.options.adjuster).toBe('single-thread');
  });

  const cases: Array<[string, (i: Record<string, unknown>) => void, string | RegExp]> = [
    ['a movable coordinate without bounds', (i) => delete (i['bounds'] as Record<string, unknown>)['tieRodOuter.z'], 'bounds.tieRodOuter.z'],
    ['bounds with min ≥ max', (i) => ((i['bounds'] as Record<string, unknown>)['tieRodInner.z'] = [160, 125]), 'bounds.tieRodInner.z'],
    ['bounds for a coordinate that may not move', (i) => ((i['bounds'] as Record<string, unknown>)['tieRodOuter.x'] = [-70, -50]), 'bounds.tieRodOuter.x'],
    ['an unknown coordinate', (i) => (i['movable'] = ['tieRodMiddle.z']), 'movable[0]'],
    ['a coordinate listed twice', (i) => (i['movable'] = ['tieRodInner.z', 'tieRodInner.z']), 'movable[1]'],
    ['rack.z together with tieRodInner.z', (i) => {
      i['movable'] = ['tieRodInner.z', 'rack.z'];
      (i['bounds'] as Record<string, unknown>)['rack.z'] = [-5, 5];
      delete (i['bounds'] as Record<string, unknown>)['tieRodOuter.z'];
    }, 'movable'],
    ['a toe-link name on a double wishbone', (i) => (i['movable'] = ['link5Inner.z']), 'movable[0]'],
    ['an unknown axle', (i) => (i['axle'] = 'middle'), 'axle'],
    ['an unknown track profile', (i) => (i['trackProfile'] = 'moon'), 'trackProfile'],
    ['an understeer target without a vehicle', (i) => (i['target'] = { understeerChangeDegPerG: 0.1 }), 'vehicle'],
    ['a target of two kinds', (i) => (i['target'] = { rollSteerCoefficient: 0.1, zeroBumpSteer: true }), 'target'],
    ['a travel range without droop', (i) => (i['trackProfile'] = { id: 'bumpy-circuit', travelMm: [0, 30] }), 'trackProfile.travelMm'],
    // Found by the compute fuzz (issue 8): ±1e-80 mm solved with a NaN curvature (null in JSON).
    ['a travel range of micrometres', (i) => (i['trackProfile'] = { id: 'smooth-circuit', travelMm: [-1e-80, 1e-80] }), 'trackProfile.travelMm'],
    ['a rack position outside the stroke', (i) => (i['options'] = { rackPositionsMm: [45] }), 'options.rackPositionsMm[0]'],
    ['a bad corner point', (i) => (i['corner'] = { ...exampleCorners.fsFrontWishbone, points: { ...exampleCorners.fsFrontWishbone.points, tieRodOuter: [-55, 210, 141.5] } }), /corner\.points\.tieRodOuter/],
    ['a travel step too coarse for a fit', (i) => (i['options'] = { travelStepMm: 20 }), 'options.travelStepMm'],
    ['a travel step so fine the solve would run away', (i) => (i['options'] = { travelStepMm: 0.1 }), 'options.travelStepMm'],
    ['a negative shim', (i) => (i['options'] = { shimThicknessMm: -1 }), 'options.shimThicknessMm'],
    // The rig cautions follow the team's rig tolerance, the notices have no threshold (docs/cautions.md).
    ['a threshold for a rig tolerance caution', (i) => (i['cautionThresholds'] = { 'rig-toe-disagreement': { warning: 0.1 } }), /cautionThresholds/],
    ['a threshold for the safety notice', (i) => (i['cautionThresholds'] = { 'safety-notice': { warning: 0.1 } }), /cautionThresholds/],
  ];
  for (const [what, mutate, path] of cases) {
    it(`refuses ${what}`, () => {
      const i = structuredClone(good()) as unknown as Record<string, unknown>;
      mutate(i);
      const issues = issuesOf(i);
      const paths = issues.map((x) => x.path);
      if (typeof path === 'string') expect(paths).toContain(path);
      else expect(paths.some((p) => path.test(p))).toBe(true);
    });
  }

  it('five-link: tie-rod names point the user to the toe link', () => {
    const i = { ...good(), corner: exampleCorners.roadRearFiveLink, axle: 'rear', bounds: { 'tieRodInner.z': [200, 260], 'tieRodOuter.z': [200, 260] } };
    const issues = issuesOf(i);
    expect(issues.find((x) => x.path === 'movable[0]')?.message).toMatch(/link5Inner\.z/);
  });

  it('five-link: only the toe link may move', () => {
    const i = { ...good(), corner: exampleCorners.roadRearFiveLink, axle: 'rear', movable: ['link2Inner.z'], bounds: { 'link2Inner.z': [400, 500] } };
    expect(issuesOf(i).find((x) => x.path === 'movable[0]')?.message).toMatch(/toe link/);
  });

  it('a valid vehicle is accepted with an understeer target', () => {
    const i = intentSchema.parse({ ...good(), target: { understeerChangeDegPerG: 0.1 }, vehicle: exampleVehicles.tur26Ember });
    expect(i.vehicle?.massKg).toBe(exampleVehicles.tur26Ember.massKg);
  });
});

describe('computeSolve', () => {
  it('returns JSON-safe output and reports progress from 0 to 1', () => {
    const seen: number[] = [];
    const r = computeSolve(good(), (f) => seen.push(f));
    expect(JSON.parse(JSON.stringify(r))).toEqual(r);
    expect(seen[0]).toBeGreaterThanOrEqual(0);
    expect(seen.at(-1)).toBe(1);
    for (let k = 1; k < seen.length; k++) expect(seen[k]!).toBeGreaterThanOrEqual(seen[k - 1]! - 1e-12);
  });
});
