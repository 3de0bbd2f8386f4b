/**
 * Unknown keys in a corner document are errors, not silently dropped: a
 * misspelt point or field would otherwise vanish and the corner would be
 * solved without it (or with a default). Each message names the key with its
 * full path (issue 3: "Validation with clear messages … Each message names
 * the point").
 */
import { describe, expect, it } from 'vitest';
import { cornerSchema, cornerDocumentSchema, unknownKeysMessage } from '../../../shared/schema/corner.js';
import { exampleCorners, compileCorner } from '../../../shared/kinematics/index.js';
import { computeAxleRoll, computeCornerSweep } from '../../../shared/kinematics/api.js';
import { InputError } from '../../../shared/errors.js';

const dw = () => structuredClone(exampleCorners.fsFrontWishbone) as any;

function unknownIssue(doc: unknown, path: string) {
  const r = cornerSchema.safeParse(doc);
  expect(r.success, 'the document must be refused').toBe(false);
  const issue = r.error!.issues.find((i) => i.code === 'unrecognized_keys' && i.path.join('.') === path);
  expect(issue, `no unknown-key issue at ${path || '(root)'}: ${JSON.stringify(r.error!.issues)}`).toBeDefined();
  return issue!;
}

describe('corner documents refuse unknown keys', () => {
  it('a misspelt point: the message names the key with its path and suggests the point meant', () => {
    const c = dw();
    c.points.wheelCenter = c.points.wheelCentre;
    delete c.points.wheelCentre;
    const issue = unknownIssue(c, 'points');
    expect(issue.message).toContain('points.wheelCenter');
    expect(issue.message).toContain('did you mean points.wheelCentre?');
    // The missing point is reported too, in the same pass.
    expect(cornerSchema.safeParse(c).error!.issues.some((i) => i.path.join('.') === 'points.wheelCentre')).toBe(true);
  });

  it('an extra point that belongs to another corner type (strutTop on a double wishbone)', () => {
    const c = dw();
    c.points.strutTop = [0, 600, 700];
    expect(unknownIssue(c, 'points').message).toContain('points.strutTop');
  });

  it('unknown keys at the top level and inside steering, spring, wheel and the anti-roll bar', () => {
    const c = dw();
    c.colour = 'red';
    c.steering.rackStrok = [-30, 30];
    c.spring.rockerAxs = [1, 0, 0];
    c.wheel.radiusMm = 255;
    c.antiRollBar.stiffness = 3;
    expect(unknownIssue(c, '').message).toContain('unknown key colour');
    expect(unknownIssue(c, 'steering').message).toContain('steering.rackStrok (did you mean steering.rackStroke?)');
    expect(unknownIssue(c, 'spring').message).toContain('spring.rockerAxs (did you mean spring.rockerAxis?)');
    expect(unknownIssue(c, 'wheel').message).toContain('wheel.radiusMm');
    expect(unknownIssue(c, 'antiRollBar').message).toContain('antiRollBar.stiffness');
  });

  it('several unknown keys in one object are all named', () => {
    const c = dw();
    c.points.a = [0, 0, 0];
    c.points.b = [0, 0, 0];
    const m = unknownIssue(c, 'points').message;
    expect(m).toContain('points.a');
    expect(m).toContain('points.b');
  });

  it('the engine (compileCorner) throws an InputError naming the key', () => {
    const c = { ...exampleCorners.roadFrontStrut, toeLink: 5 };
    expect(() => compileCorner(c)).toThrow(InputError);
    expect(() => compileCorner(c)).toThrow(/unknown key toeLink/);
  });

  it('inside a request the path starts at corner', () => {
    const c = dw();
    c.points.tieRodInnr = c.points.tieRodInner;
    let caught: unknown;
    try {
      computeCornerSweep({ corner: c, travel: { from: -10, to: 10, step: 5 } });
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(InputError);
    const issue = (caught as InputError).issues.find((i) => i.path === 'corner.points');
    expect(issue?.message).toContain('corner.points.tieRodInnr (did you mean corner.points.tieRodInner?)');
  });

  it('the sweep and roll requests refuse a misspelt option instead of ignoring it', () => {
    const issuesOf = (f: () => unknown): { path: string; message: string }[] => {
      try {
        f();
      } catch (e) {
        expect(e).toBeInstanceOf(InputError);
        return (e as InputError).issues;
      }
      throw new Error('expected an InputError');
    };
    const corner = exampleCorners.fsFrontWishbone;
    const travel = { from: -10, to: 10, step: 5 };
    // `fitrange` would otherwise be dropped and the fit silently run over the whole travel.
    expect(issuesOf(() => computeCornerSweep({ corner, travel, fitrange: { fromMm: -5, toMm: 5 } })).map((i) => i.message).join(' ')).toContain('fitrange');
    expect(issuesOf(() => computeCornerSweep({ corner, travel: { ...travel, stepMm: 1 } })).map((i) => i.path)).toContain('travel');
    expect(issuesOf(() => computeAxleRoll({ corner, roll: { from: -2, to: 2, step: 1 }, wheelBase: 1550 })).map((i) => i.message).join(' ')).toContain('wheelBase');
  });

  it('a stored document read through cornerDocumentSchema is refused the same way, and the examples still pass', () => {
    const { formatVersion: _v, ...unversioned } = { ...exampleCorners.fsRearWishbone, note: 'x' };
    const r = cornerDocumentSchema.safeParse(unversioned);
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]!.message).toContain('unknown key note');
    for (const ex of Object.values(exampleCorners)) expect(cornerDocumentSchema.safeParse(ex).success).toBe(true);
  });

  it('no suggestion for a key unlike any known one', () => {
    expect(unknownKeysMessage(['zzzzzzzz'], ['points'], ['wheelCentre', 'spindle'])).not.toContain('did you mean');
    expect(unknownKeysMessage(['spindel'], ['points'], ['wheelCentre', 'spindle'])).toContain('did you mean points.spindle?');
  });
});
