/** One test per corner validation rule: the message names the point (issue 3, "Bad input"). */
import { describe, expect, it } from 'vitest';
import { cornerSchema, upgradeCornerDocument, type Corner } from '../../../shared/schema/corner.js';
import { exampleCorners } from '../../../shared/kinematics/index.js';
import { InputError } from '../../../shared/errors.js';

type Mut = (c: any) => void;
const dw = () => structuredClone(exampleCorners.fsFrontWishbone) as any;
const strut = () => structuredClone(exampleCorners.roadFrontStrut) as any;
const five = () => structuredClone(exampleCorners.roadRearFiveLink) as any;
const armSteer = () => {
  const c = dw();
  c.steering = { kind: 'arm', armAxisPoint: [-55, 150, 141.5], armAxisDirection: [0, 0, 1], angularStrokeDeg: [-30, 30] };
  return c;
};

const cases: Array<[string, () => any, Mut, string, string]> = [
  ['non-positive wheel radius', dw, (c) => (c.wheel.radius = 0), 'wheel.radius', 'wheel.radius'],
  ['tie rod of zero length', dw, (c) => (c.points.tieRodOuter = [...c.points.tieRodInner]), 'points.tieRodOuter', 'points.tieRodInner'],
  ['coincident lower pivots', dw, (c) => (c.points.lowerRear = [...c.points.lowerFront]), 'points.lowerRear', 'points.lowerFront'],
  ['lower ball joint on the lower pivot axis', dw, (c) => (c.points.lowerOuter = [0, 205, 112.5]), 'points.lowerOuter', 'pivot axis'],
  ['upper ball joint on the upper pivot axis', dw, (c) => (c.points.upperOuter = [0, 252.5, 287.5]), 'points.upperOuter', 'upper arm'],
  ['kingpin of zero length', dw, (c) => (c.points.upperOuter = [...c.points.lowerOuter]), 'points.upperOuter', 'points.lowerOuter'],
  ['tie-rod outer point on the steering axis (collinear with both ball joints)', dw, (c) => (c.points.tieRodOuter = [-18, 540, 570]), 'points.tieRodOuter', 'steering axis'],
  ['spindle on the wheel centre', dw, (c) => (c.points.spindle = [...c.points.wheelCentre]), 'points.spindle', 'points.wheelCentre'],
  ['spindle outboard of the wheel centre', dw, (c) => (c.points.spindle = [0, 650, 255]), 'points.spindle', 'inboard'],
  ['wheel centre on the right (a right corner entered as the left)', dw, (c) => (c.points.wheelCentre = [0, -600, 255]), 'points.wheelCentre', 'LEFT corner'],
  ['rack stroke without zero', dw, (c) => (c.steering.rackStroke = [5, 30]), 'steering.rackStroke', 'does not contain 0'],
  ['rack stroke reversed', dw, (c) => (c.steering.rackStroke = [30, -30]), 'steering.rackStroke', 'min < max'],
  ['rack axis of zero length', dw, (c) => (c.steering.rackAxis = [0, 0, 0]), 'steering.rackAxis', 'zero length'],
  ['steered corner without steering', dw, (c) => delete c.steering, 'steering', 'steered'],
  ['strut axis of zero length', strut, (c) => (c.points.strutLower = [...c.points.strutTop]), 'points.strutTop', 'points.strutLower'],
  ['strut: tie-rod outer point on the steering axis (lower ball joint to top mount)', strut, (c) => (c.points.tieRodOuter = [2, 700, 248]), 'points.tieRodOuter', 'steering axis'],
  ['five-link link of zero length', five, (c) => (c.points.link3Outer = [...c.points.link3Inner]), 'points.link3Outer', 'link 3'],
  ['five-link duplicate links', five, (c) => ((c.points.link2Inner = [...c.points.link1Inner]), (c.points.link2Outer = [...c.points.link1Outer])), 'points.link2Outer', 'link 1'],
  ['steering arm stroke without zero', armSteer, (c) => (c.steering.angularStrokeDeg = [2, 30]), 'steering.angularStrokeDeg', 'does not contain 0'],
  ['tie-rod inner point on the steering arm axis', armSteer, (c) => (c.steering.armAxisPoint = [-55, 210, 0]), 'points.tieRodInner', "steering arm's pivot axis"],
  ['steering arm axis of zero length', armSteer, (c) => (c.steering.armAxisDirection = [0, 0, 0]), 'steering.armAxisDirection', 'zero length'],
  ['spring on an upper arm a strut lacks', strut, (c) => (c.spring.springOuterOn = 'upperArm'), 'spring.springOuterOn', 'no upper arm'],
  ['spring on a lower arm a five-link lacks', five, (c) => (c.spring.springOuterOn = 'lowerArm'), 'spring.springOuterOn', 'no arm'],
  ['spring of zero length', strut, (c) => (c.spring.springOuter = [...c.spring.springBody]), 'spring.springOuter', 'spring.springBody'],
  ['rocker axis of zero length', dw, (c) => (c.spring.rockerAxis = [0, 0, 0]), 'spring.rockerAxis', 'zero length'],
  ['pushrod end on the rocker axis', dw, (c) => (c.spring.rodRocker = [50, 230, 420]), 'spring.rodRocker', 'rocker axis'],
  ['spring end on the rocker axis', dw, (c) => (c.spring.springRocker = [-40, 230, 420]), 'spring.springRocker', 'rocker axis'],
  ['pushrod of zero length', dw, (c) => (c.spring.rodOuter = [...c.spring.rodRocker]), 'spring.rodOuter', 'spring.rodRocker'],
  ['rocker spring of zero length', dw, (c) => (c.spring.springBody = [...c.spring.springRocker]), 'spring.springBody', 'spring.springRocker'],
  ['drop link of zero length', dw, (c) => (c.antiRollBar.dropLinkOuter = [...c.antiRollBar.dropLinkInner]), 'antiRollBar.dropLinkOuter', 'antiRollBar.dropLinkInner'],
  ['bar axis of zero length', dw, (c) => (c.antiRollBar.barAxisDirection = [0, 0, 0]), 'antiRollBar.barAxisDirection', 'zero length'],
  ['drop link on the bar axis', dw, (c) => (c.antiRollBar.dropLinkInner = [60, 350, 220]), 'antiRollBar.dropLinkInner', 'bar axis'],
  ['drop link on an upper arm a strut lacks', strut, (c) => (c.antiRollBar.dropLinkOuterOn = 'upperArm'), 'antiRollBar.dropLinkOuterOn', 'no upper arm'],
];

describe('corner validation names the point', () => {
  it('the example corners are valid', () => {
    for (const c of Object.values(exampleCorners)) expect(cornerSchema.safeParse(c).success).toBe(true);
    expect(cornerSchema.safeParse(armSteer()).success).toBe(true);
  });

  for (const [title, make, mutate, path, mention] of cases) {
    it(title, () => {
      const c = make();
      mutate(c);
      const r = cornerSchema.safeParse(c);
      expect(r.success).toBe(false);
      const issue = r.error!.issues.find((i) => i.path.join('.') === path);
      // Source: issue 3 "Each message names the point."
      expect(issue, `no issue at ${path}: ${JSON.stringify(r.error!.issues)}`).toBeDefined();
      expect(issue!.message).toContain(path.split('.').slice(-1)[0]);
      expect(issue!.message).toContain(mention);
    });
  }

  it('a newer formatVersion is refused by the upgrade, naming formatVersion', () => {
    const doc = { ...exampleCorners.fsFrontWishbone, formatVersion: 2 };
    expect(() => upgradeCornerDocument(doc)).toThrow(InputError);
    try {
      upgradeCornerDocument(doc);
    } catch (e) {
      expect((e as InputError).issues[0]!.path).toBe('formatVersion');
    }
    const same: Corner = exampleCorners.fsRearWishbone;
    expect(upgradeCornerDocument(same)).toBe(same);
    const { formatVersion: _v, ...unversioned } = same;
    expect(cornerSchema.safeParse(upgradeCornerDocument(unversioned)).success).toBe(true);
  });

  it('an unknown type and a missing point are shape errors with their path', () => {
    const bad = { ...dw(), type: 'trailing-arm' };
    expect(cornerSchema.safeParse(bad).success).toBe(false);
    const missing = dw();
    delete missing.points.upperRear;
    const r = cornerSchema.safeParse(missing);
    expect(r.error!.issues[0]!.path.join('.')).toBe('points.upperRear');
  });
});
