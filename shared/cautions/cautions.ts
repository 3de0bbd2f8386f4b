/**
 * Bump-sensitivity and handling cautions shown beside every solve result.
 *
 * Each rule has a stable code of ours, a measured value, default thresholds
 * per level (a team may override them per vehicle through the intent's
 * `cautionThresholds`) and the basis of those defaults. A rule fires at the
 * highest level whose threshold the value reaches (value ≥ threshold).
 * docs/cautions.md documents every code, default and basis.
 */
import type { TrackProfile, TrackProfileId } from '../tracks/profiles.js';
import type { BumpCost } from '../ride/cost.js';
import type { AxleName } from '../schema/axle.js';

export type CautionLevel = 'info' | 'warning' | 'critical';

export interface Caution {
  level: CautionLevel;
  code: CautionCode;
  message: string;
  /** The measured value (unit in `unit`), or null for a notice without a measure. */
  value: number | null;
  /** The threshold the value reached, or null for a notice without a measure. */
  threshold: number | null;
  unit: string;
  /** "common practice" or a named source, with the reason for the default. */
  basis: string;
}

export const CAUTION_CODES = [
  'bump-yaw-disturbance',
  'bump-heading-change',
  'landing-side-force',
  'bump-cost-unavailable',
  'bump-toe-change',
  'bump-lateral-force',
  'bump-lateral-scrub',
  'front-roll-steer-feel',
  'long-travel-roll-steer',
  'rear-roll-oversteer',
  'roll-steer-curvature',
  'lock-bump-steer-spread',
  'compliance-steer-rivals',
  'compliance-steer-unmodelled',
  'rack-pose-unreachable',
  'rig-toe-disagreement',
  'rig-camber-disagreement',
  'safety-notice',
] as const;
export type CautionCode = (typeof CAUTION_CODES)[number];

/** Thresholds per level; a level left out never fires. */
export interface LevelThresholds {
  info?: number | undefined;
  warning?: number | undefined;
  critical?: number | undefined;
}
export type CautionThresholds = Partial<Record<CautionCode, LevelThresholds>>;

/** Safety wording carried by every report and result screen (DEVELOPERS.md: keep the wording). */
export const SAFETY_CAUTION =
  'Design estimates from an idealised rigid-link model. Verify on a kinematics rig and in controlled testing, ' +
  "and follow your series' technical regulations and the engineering codes and licensed practice that apply.";

interface RuleDefinition {
  unit: string;
  basis: string;
  /** Defaults for every profile, or per profile. */
  defaults: LevelThresholds | Record<TrackProfileId, LevelThresholds>;
}

/** Rig-measurement codes compare with the team's rig tolerance (shared/rig/compare.ts), not with per-profile thresholds. */
export type RigCautionCode = 'rig-toe-disagreement' | 'rig-camber-disagreement';

export const CAUTION_RULES: Readonly<Record<Exclude<CautionCode, 'compliance-steer-unmodelled' | 'rack-pose-unreachable' | 'safety-notice' | 'bump-cost-unavailable' | RigCautionCode>, RuleDefinition>> = {
  'bump-yaw-disturbance': {
    unit: '% of the steady yaw rate',
    basis:
      'product default, stated in consequences: RMS yaw-rate disturbance from bump steer on the profile’s ISO 8608 road (ride model, independent left and right tracks) ' +
      'against the steady yaw rate V/R of the profile’s corner; Gaussian peaks reach about three times the RMS, so at 2 % the path curvature wanders by about ±6 % ' +
      '(felt as nervousness) and at 5 % by about ±15 % (the driver corrects all the time)',
    defaults: { warning: 2, critical: 5 },
  },
  'bump-heading-change': {
    unit: 'm of drift in 1 s',
    basis:
      'product default, stated in consequences: the heading change after the profile’s single-wheel bump (ride model, time domain) turned into the sideways drift ' +
      'it makes within one second at the profile’s speed; 0.1 m asks for a steering correction, 0.25 m (about a tyre’s width) uses the margin to a kerb or lane edge',
    defaults: { warning: 0.1, critical: 0.25 },
  },
  'landing-side-force': {
    unit: 'fraction of the wheel load',
    basis:
      'product default, stated in consequences: the side force a landing wheel’s toe change asks of its tyre (cornering stiffness at the instantaneous load), ' +
      'as a fraction of that load; the wheels seldom land together, so a tenth of the load darts the car and a quarter takes a large share of the grip ' +
      '(tyre friction about 1, from memory); common practice: off-road and on landings the aim is zero bump steer',
    defaults: { warning: 0.1, critical: 0.25 },
  },
  'bump-toe-change': {
    unit: 'deg',
    basis:
      'information: the toe change of the geometry over the profile’s single-wheel bump; its consequences are judged in yaw rate, heading and landing side force ' +
      '(a static alignment tolerance is no basis for a dynamic limit, so there is no default: it fires only on thresholds a team sets)',
    defaults: {},
  },
  'bump-lateral-force': {
    unit: 'fraction of landing load',
    basis:
      'kept for teams that set their own thresholds (no default): the quasi-static side force of the bump’s toe change at the profile’s landing load; ' +
      'the ride-based landing-side-force rule replaces it',
    defaults: {},
  },
  'bump-lateral-scrub': {
    unit: 'mm',
    basis: 'common practice (product default): contact-patch scrub over a single-wheel bump disturbs straight-line stability and wears tyres',
    defaults: {
      'smooth-circuit': { warning: 3, critical: 6 },
      'bumpy-circuit': { warning: 5, critical: 10 },
      'rough-road': { warning: 8, critical: 15 },
      'off-road': { warning: 20, critical: 40 },
    },
  },
  'front-roll-steer-feel': {
    unit: 'deg/deg',
    basis:
      'information, common practice: front roll steer reaches the driver through the steering, the rear has no such path; production cars carry ' +
      'front roll understeer of 0.05–0.1 deg/deg (front bump steer −2 to −10 deg/m), so the level alone is no fault: its bump consequences are judged in yaw rate and heading',
    defaults: { info: 0.03 },
  },
  'long-travel-roll-steer': {
    unit: 'deg/deg',
    basis: 'common practice: off-road and on landings the aim is zero bump steer; a loaded wheel that toes on landing makes the car dart',
    defaults: { warning: 0.005, critical: 0.03 },
  },
  'rear-roll-oversteer': {
    unit: 'deg/deg',
    basis: 'common practice: rear roll steer toward the outside of the turn (roll oversteer) lowers stability as lateral acceleration grows',
    defaults: { warning: 0.01, critical: 0.03 },
  },
  'roll-steer-curvature': {
    unit: 'deg/deg',
    basis:
      'common practice (product default): the loaded outside wheel sets most of the axle side force, so a curved toe line changes the effective roll steer between turn-in and mid-corner; ' +
      'a change toward oversteer as the roll builds takes stability away once the driver is committed and is judged on these thresholds, while a change toward understeer ' +
      '(the progressive toe-in of an ordinary road car’s rear axle) makes the car steadier and is only noted',
    defaults: { warning: 0.01, critical: 0.025 },
  },
  'lock-bump-steer-spread': {
    unit: 'deg/m',
    basis:
      'information (steered axles are judged on-centre and at the operating steer; full lock is information): production bump steer spans about −10 to +4 deg/m ' +
      '(common practice), so a spread of 5 deg/m across the stroke is worth knowing',
    defaults: { info: 5 },
  },
  'compliance-steer-rivals': {
    unit: 'ratio',
    basis:
      'the Bundorf understeer budget of a road car (after Bundorf & Leffert, SAE 760713): its elastic steer is 1.7 times its roll steer at the front ' +
      'and 1.25 times at the rear, so a ratio of that order is ordinary and only noted; a ratio of 3 or more (product default) means the bushes, ' +
      'not the link heights, set the axle steer in a corner. Not a hazard in itself, so never critical',
    defaults: { info: 1, warning: 3 },
  },
};

/** Codes of the rules that compare a measured value with thresholds. */
export type ThresholdCautionCode = keyof typeof CAUTION_RULES;

/** Default thresholds of a rule for a profile, with the intent's overrides on top. */
export function thresholdsFor(
  code: keyof typeof CAUTION_RULES,
  profile: TrackProfileId,
  overrides: CautionThresholds = {},
): LevelThresholds {
  const d = CAUTION_RULES[code].defaults;
  const base: LevelThresholds = 'info' in d || 'warning' in d || 'critical' in d ? d : (d as Record<TrackProfileId, LevelThresholds>)[profile];
  return { ...base, ...(overrides[code] ?? {}) };
}

/** Highest level whose threshold `value` reaches, or null. */
export function levelFor(value: number, t: LevelThresholds): { level: CautionLevel; threshold: number } | null {
  for (const level of ['critical', 'warning', 'info'] as const) {
    const th = t[level];
    if (th !== undefined && value >= th) return { level, threshold: th };
  }
  return null;
}

/** What the rules measure; the solver fills it from the verified kinematics. */
export interface CautionInputs {
  axle: AxleName;
  steered: boolean;
  profile: TrackProfile;
  /** Achieved roll steer coefficient ε, deg/deg (domain.md sign). */
  rollSteerCoefficient: number;
  /** The ride model's bump cost on the profile (needs the vehicle with its ride data), or null. */
  bumpCost?: BumpCost | null | undefined;
  /** Why there is no bump cost (no vehicle, or the field the ride model needs), when there is none. */
  bumpCostUnavailable?: string | undefined;
  /** Largest |toe change| over the profile's single-wheel bump across the rack positions, deg. */
  bumpToeChangeDeg: number;
  /** Rack position of that largest change, mm. */
  bumpToeRackMm: number;
  /** Cornering stiffness per unit load of the tyre at its landing load, 1/deg. */
  corneringCoefficientPerDeg: number;
  /** Where the coefficient came from (vehicle tyre data or the default). */
  corneringCoefficientSource: string;
  /** Landing load of that wheel, N, when the vehicle is known. */
  landingLoadN: number | null;
  /** |Half-track change| over the bump, mm. */
  bumpScrubMm: number;
  /** Change of the outside wheel's roll steer between φ = 0 and the reference roll, deg/deg. */
  rollSteerCurvatureChange: number;
  referenceRollDeg: number;
  /** Largest |bump-steer gradient at a rack position − gradient straight ahead|, deg/m, and where. */
  lockBumpSteerSpreadDegPerM: number;
  lockBumpSteerRackMm: number;
  /** |Compliance steer (deg/g)| ÷ |kinematic roll steer (deg/g)| on this axle, null without compliance data. */
  complianceRatio: number | null;
  /** The vehicle gives this axle's compliance steer (no "unmodelled" notice then). */
  complianceKnown?: boolean | undefined;
  /** Where the compliance steer came from: entered in the vehicle, or computed from the corner's bushings. */
  complianceSource?: 'entered' | 'computed' | undefined;
  /** Rack positions the proposal cannot reach over the whole travel range. */
  unreachableRacks?: { rackMm: number; travelMm: number | null; message: string }[] | undefined;
  thresholds?: CautionThresholds | undefined;
}

const fmt = (x: number, d = 3): string => (Math.abs(x) >= 100 ? x.toFixed(0) : x.toFixed(d));

/**
 * How a caution writes a figure with a unit, in the user's unit system: each returns the number and its
 * unit ("12.5 mm" or "0.49 in"). `siDecimals` is the resolution in the stored unit; a formatter for other
 * units keeps the same resolution. Screens pass theirs (built on the app's one number formatter); servers,
 * reports in SI and tests use `SI_FIGURES`.
 */
export interface CautionFigures {
  /** A length on the car, mm. */
  length(mm: number, siDecimals: number): string;
  /** A short sideways drift on the road, m (SI writes it in cm). */
  drift(m: number, siDecimals: number): string;
  /** A distance on the road (a corner radius), m. */
  distance(m: number): string;
  speed(kph: number): string;
  force(n: number): string;
  /** A bump-steer gradient, deg/m. */
  bumpSteer(degPerM: number, siDecimals: number): string;
}

export const SI_FIGURES: CautionFigures = {
  length: (mm, d) => `${fmt(mm, d)} mm`,
  drift: (m, d) => `${fmt(100 * m, d)} cm`,
  distance: (m) => `${fmt(m, 0)} m`,
  speed: (kph) => `${fmt(kph, 0)} km/h`,
  force: (n) => `${fmt(n, 0)} N`,
  bumpSteer: (g, d) => `${fmt(g, d)} deg/m`,
};

function measured(
  code: keyof typeof CAUTION_RULES,
  value: number,
  inputs: CautionInputs,
  message: (threshold: number, level: CautionLevel) => string,
): Caution | null {
  const hit = levelFor(value, thresholdsFor(code, inputs.profile.id, inputs.thresholds));
  if (!hit) return null;
  const rule = CAUTION_RULES[code];
  return { level: hit.level, code, message: message(hit.threshold, hit.level), value, threshold: hit.threshold, unit: rule.unit, basis: rule.basis };
}

/** Every caution that applies, most severe first; the safety notice always comes last. */
export function evaluateCautions(inputs: CautionInputs, figures: CautionFigures = SI_FIGURES): Caution[] {
  const f = figures;
  const out: (Caution | null)[] = [];
  const p = inputs.profile;
  const eps = inputs.rollSteerCoefficient;
  const rackNote = inputs.steered && inputs.bumpToeRackMm !== 0 ? ` at rack ${f.length(inputs.bumpToeRackMm, 1)}` : '';

  const bc = inputs.bumpCost;
  if (bc) {
    const at = bc.judgedAt === 'operating-steer' ? ` (at the steer of a ${f.distance(bc.cornerRadiusM)} corner)` : '';
    if (bc.yawDisturbancePct !== null) {
      out.push(
        measured('bump-yaw-disturbance', bc.yawDisturbancePct, inputs, (th) =>
          `On a ${bc.roadInWords} this bump steer shakes the car's yaw rate by ${fmt(bc.yawRateRmsDegPerS ?? 0)} deg/s RMS${at}, ${fmt(bc.yawDisturbancePct ?? 0, 2)} % of the ${fmt(bc.steadyYawRateDegPerS, 1)} deg/s of a ${f.distance(bc.cornerRadiusM)} corner (limit ${fmt(th, 1)} %).`,
        ),
      );
    }
    if (bc.driftM !== null) {
      out.push(
        measured('bump-heading-change', Math.abs(bc.driftM), inputs, (th) =>
          `A ${f.length(bc.bumpHeightMm, 0)} bump under one wheel at ${f.speed(bc.speedKph)} turns the car by ${fmt(bc.headingChangeDeg ?? 0)}°: ${f.drift(Math.abs(bc.driftM ?? 0), 1)} of sideways drift within a second (limit ${f.drift(th, 0)}).`,
        ),
      );
    }
    if (bc.landingSideForceFraction !== null) {
      out.push(
        measured('landing-side-force', bc.landingSideForceFraction, inputs, (th) =>
          `Landing from ${f.length(bc.landingDropMm ?? 0, 0)}, a wheel's toe change pushes its tyre sideways with ${fmt(100 * bc.landingSideForceFraction!, 1)} % of its load (limit ${fmt(100 * th, 0)} %): the car darts when the wheels land unevenly.`,
        ),
      );
    }
  } else if (inputs.bumpCostUnavailable) {
    out.push({
      level: 'info',
      code: 'bump-cost-unavailable',
      message: `No bump cost in yaw rate and heading: ${inputs.bumpCostUnavailable}.`,
      value: null,
      threshold: null,
      unit: '',
      basis: 'the ride model needs the vehicle (masses, spring, tyre rate)',
    });
  }
  out.push(
    measured('bump-toe-change', inputs.bumpToeChangeDeg, inputs, () =>
      `A ${f.length(p.bumpHeightMm, 0)} single-wheel bump toes the wheel by ${fmt(inputs.bumpToeChangeDeg)}°${rackNote} (information; its consequences are judged in yaw rate and heading).`,
    ),
  );
  const index = inputs.corneringCoefficientPerDeg * inputs.bumpToeChangeDeg;
  out.push(
    measured('bump-lateral-force', index, inputs, (th) => {
      const force = inputs.landingLoadN !== null ? ` (about ${f.force(index * inputs.landingLoadN)} at a landing load of ${f.force(inputs.landingLoadN)})` : '';
      return `That toe change pushes the tyre sideways with ${fmt(100 * index, 1)} % of its landing load${force}, at or above your ${fmt(100 * th, 1)} %; cornering coefficient from ${inputs.corneringCoefficientSource}.`;
    }),
  );
  out.push(
    measured('bump-lateral-scrub', inputs.bumpScrubMm, inputs, (th) =>
      `The contact patch moves ${f.length(inputs.bumpScrubMm, 1)} sideways over the ${f.length(p.bumpHeightMm, 0)} bump (limit ${f.length(th, 1)}): the tyre scrubs and the car is nudged off line.`,
    ),
  );
  if (inputs.axle === 'front' && inputs.steered) {
    out.push(
      measured('front-roll-steer-feel', Math.abs(eps), inputs, () =>
        `Front roll steer of ${fmt(eps)} deg/deg reaches the driver through the steering over bumps; prefer the rear axle for deliberate roll steer where you can.`,
      ),
    );
  }
  if (p.longTravel) {
    out.push(
      measured('long-travel-roll-steer', Math.abs(eps), inputs, () =>
        `Roll steer of ${fmt(eps)} deg/deg on a long-travel profile: aim for zero bump steer instead, because a heavily loaded wheel that toes on a landing makes the car dart.`,
      ),
    );
  }
  if (inputs.axle === 'rear') {
    out.push(
      measured('rear-roll-oversteer', eps, inputs, () =>
        `Rear roll oversteer of ${fmt(eps)} deg/deg steers the rear axle out of the turn as the body rolls, lowering stability as cornering builds.`,
      ),
    );
  }
  {
    // ε's sign (domain.md): positive is roll understeer at the front and roll oversteer at the rear.
    const change = inputs.rollSteerCurvatureChange;
    const towardOversteer = inputs.axle === 'front' ? change < 0 : change > 0;
    const c = measured('roll-steer-curvature', Math.abs(change), inputs, () =>
      towardOversteer
        ? `The toe line is curved: the loaded outside wheel's roll steer changes by ${fmt(change)} deg/deg between 0° and ${fmt(inputs.referenceRollDeg, 1)}° of roll, toward oversteer, so the car loses stability as cornering builds, after turn-in.`
        : `The toe line is curved: the loaded outside wheel's roll steer changes by ${fmt(change)} deg/deg between 0° and ${fmt(inputs.referenceRollDeg, 1)}° of roll, toward understeer, so the car grows steadier as cornering builds (information: the balance shifts between turn-in and mid-corner).`,
    );
    out.push(c && !towardOversteer ? { ...c, level: 'info' } : c);
  }
  if (inputs.steered) {
    out.push(
      measured('lock-bump-steer-spread', inputs.lockBumpSteerSpreadDegPerM, inputs, () =>
        `Bump steer at rack ${f.length(inputs.lockBumpSteerRackMm, 1)} differs from straight ahead by ${f.bumpSteer(inputs.lockBumpSteerSpreadDegPerM, 1)}: the match holds at one rack position only (information: the bump cost is judged on-centre and at the operating steer).`,
      ),
    );
  }
  if (inputs.complianceRatio !== null) {
    out.push(
      measured('compliance-steer-rivals', inputs.complianceRatio, inputs, () =>
        `Elastic steer under lateral force${inputs.complianceSource === 'computed' ? " (computed from the corner's bushings)" : ''} is ${fmt(inputs.complianceRatio ?? 0, 2)} times the kinematic roll steer of this axle: a change of the link heights moves this axle's steer in a corner less than the rigid-link figures alone suggest, so confirm the bush rates on a rig before relying on the roll-steer intent.`,
      ),
    );
  } else if (p.road && !inputs.complianceKnown) {
    out.push({
      level: 'info',
      code: 'compliance-steer-unmodelled',
      message:
        'On road cars, elastic steer of the bushes under lateral force can rival the kinematic roll steer of this rigid-link model; enter the axle compliance steer in the vehicle, or the corner’s bushing rates, to include it.',
      value: null,
      threshold: null,
      unit: '',
      basis: 'common practice (the Bundorf understeer budget of a road car, after Bundorf & Leffert, SAE 760713)',
    });
  }
  for (const u of inputs.unreachableRacks ?? []) {
    out.push({
      level: 'warning',
      code: 'rack-pose-unreachable',
      message: `At rack ${f.length(u.rackMm, 1)} the proposed geometry cannot reach ${u.travelMm !== null ? `travel ${f.length(u.travelMm, 1)}` : 'the whole travel range'}: ${u.message}. Its bump steer there is not verified.`,
      value: u.rackMm,
      threshold: null,
      unit: 'mm',
      basis: 'kinematics engine: a link cannot close at that pose',
    });
  }
  const rank: Record<CautionLevel, number> = { critical: 0, warning: 1, info: 2 };
  const list = out.filter((c): c is Caution => c !== null).sort((a, b) => rank[a.level] - rank[b.level]);
  list.push({ level: 'info', code: 'safety-notice', message: SAFETY_CAUTION, value: null, threshold: null, unit: '', basis: 'common practice' });
  return list;
}
