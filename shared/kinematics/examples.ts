/**
 * Invented, known-good example corners (LEFT corners, mm, ISO 8855). They are
 * plausible designs of our own for tests, the demo seed and the UI, not
 * copies of any real car. Each parses with `cornerSchema` and solves over its
 * stated travel and rack stroke (checked in test/shared/kinematics).
 */
import type { Corner } from '../schema/corner.js';

/** Formula-Student-class front: unequal-length wishbones, pushrod to a rocker, ±25 mm travel, ~1200 mm track. */
const fsFrontWishbone: Corner = {
  formatVersion: 1,
  name: 'FS front, pushrod wishbone',
  type: 'double-wishbone',
  steered: true,
  wheel: { radius: 255 },
  points: {
    wheelCentre: [0, 600, 255],
    // 50 mm inboard, 0.8727 mm low: −1.0° static camber, zero toe.
    spindle: [0, 550, 254.1273],
    lowerFront: [150, 200, 110],
    lowerRear: [-150, 210, 115],
    lowerOuter: [2, 570, 130],
    upperFront: [130, 250, 290],
    upperRear: [-130, 255, 285],
    upperOuter: [-8, 555, 350],
    tieRodInner: [-55, 210, 141.5],
    tieRodOuter: [-60, 565, 170],
  },
  steering: { kind: 'rack', rackAxis: [0, 1, 0], rackStroke: [-30, 30] },
  spring: {
    kind: 'rocker',
    rockerPivot: [0, 230, 420],
    rockerAxis: [1, 0, 0],
    rodOuter: [0, 530, 145],
    rodOuterOn: 'lowerArm',
    rodRocker: [0, 260, 450],
    springRocker: [0, 220, 470],
    springBody: [0, 20, 440],
  },
  antiRollBar: {
    dropLinkOuter: [-15, 360, 128],
    dropLinkOuterOn: 'lowerArm',
    dropLinkInner: [-20, 350, 220],
    barAxisPoint: [60, 0, 220],
    barAxisDirection: [0, 1, 0],
  },
};

/** Formula-Student-class rear: wishbones, fixed toe link behind the axle, direct spring on the lower arm. */
const fsRearWishbone: Corner = {
  formatVersion: 1,
  name: 'FS rear, wishbone with toe link',
  type: 'double-wishbone',
  steered: false,
  wheel: { radius: 255 },
  points: {
    wheelCentre: [-1530, 590, 255],
    spindle: [-1530, 540, 254.1273],
    lowerFront: [-1380, 200, 110],
    lowerRear: [-1680, 200, 112],
    lowerOuter: [-1530, 565, 128],
    upperFront: [-1400, 240, 280],
    upperRear: [-1660, 240, 285],
    upperOuter: [-1540, 550, 345],
    tieRodInner: [-1640, 230, 161.5],
    tieRodOuter: [-1600, 560, 190],
  },
  spring: { kind: 'direct', springBody: [-1500, 220, 420], springOuter: [-1510, 480, 135], springOuterOn: 'lowerArm' },
  antiRollBar: {
    dropLinkOuter: [-1560, 470, 300],
    dropLinkOuterOn: 'upperArm',
    dropLinkInner: [-1560, 450, 420],
    barAxisPoint: [-1680, 0, 420],
    barAxisDirection: [0, 1, 0],
  },
};

/** Road-car front strut, rack behind the axle, ±80 mm travel, ~1550 mm track. */
const roadFrontStrut: Corner = {
  formatVersion: 1,
  name: 'Road front strut',
  type: 'strut',
  steered: true,
  wheel: { radius: 310 },
  points: {
    wheelCentre: [0, 775, 310],
    // −0.5° static camber.
    spindle: [0, 725, 309.5637],
    lowerFront: [120, 380, 140],
    lowerRear: [-250, 400, 150],
    lowerOuter: [10, 720, 130],
    strutTop: [-30, 620, 720],
    strutLower: [-10, 680, 420],
    tieRodInner: [-150, 330, 225.5],
    tieRodOuter: [-140, 690, 230],
  },
  steering: { kind: 'rack', rackAxis: [0, 1, 0], rackStroke: [-75, 75] },
  spring: { kind: 'direct', springBody: [-30, 618, 700], springOuter: [-14, 672, 450], springOuterOn: 'upright' },
  antiRollBar: {
    dropLinkOuter: [-40, 665, 400],
    dropLinkOuterOn: 'upright',
    dropLinkInner: [-40, 600, 200],
    barAxisPoint: [-240, 0, 190],
    barAxisDirection: [0, 1, 0],
  },
};

/**
 * Road-car rear five-link (link 5 is the toe link), ±80 mm travel, ~1550 mm track, 2650 mm wheelbase.
 * Links 1–2 (upper) point at a virtual upper joint near [-2661, 662, 450] and links 3–4 (lower) at a
 * virtual lower joint near [-2640, 721, 150], so the instantaneous steering axis has KPI ≈ 11°, caster
 * ≈ 4°, scrub ≈ +25 mm and trail ≈ 18 mm at design — inside what road rear multi-links commonly have
 * (KPI roughly 5–15°, scrub within a few tens of mm; from memory, common practice). The toe link behind
 * the axle gives slight toe-in in bump (≈ +4 deg/m, nearly linear), ε ≈ −0.03 (roll understeer).
 */
const roadRearFiveLink: Corner = {
  formatVersion: 1,
  name: 'Road rear five-link',
  type: 'five-link',
  steered: false,
  wheel: { radius: 315 },
  toeLink: 5,
  points: {
    wheelCentre: [-2650, 770, 315],
    spindle: [-2650, 720, 314.1273],
    link1Inner: [-2560, 440, 440],
    link1Outer: [-2650.9, 639.8, 449],
    link2Inner: [-2800, 450, 435],
    link2Outer: [-2677.7, 636.6, 448.2],
    link3Inner: [-2450, 400, 200],
    link3Outer: [-2611.5, 672.8, 157.5],
    link4Inner: [-2700, 330, 190],
    link4Outer: [-2641.8, 709.3, 151.2],
    link5Inner: [-2780, 400, 265],
    link5Outer: [-2780, 710, 245],
  },
  spring: { kind: 'direct', springBody: [-2690, 640, 600], springOuter: [-2680, 690, 250], springOuterOn: 'upright' },
};

export const exampleCorners = { fsFrontWishbone, fsRearWishbone, roadFrontStrut, roadRearFiveLink } as const satisfies Record<string, Corner>;
