/**
 * Bump-sensitivity and handling cautions shown beside every solve result.
 *
 * Each rule has a stable code of ours, a measured value, default thresholds
 * per level (a team may override them per vehicle through the intent's
 * `cautionThresholds`) and the basis of those defaults. A rule fires at the
 * highest level whose threshold the value reaches (value ≥ threshold).
 * docs/cautions.md documents every code, default and basis.
 */
import type { TrackProfile, TrackProfileId } from './profiles.js';
export { trackProfiles, resolveTrackProfile, TRACK_PROFILE_IDS } from './profiles.js';

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

const ALIGNMENT_BASIS =
  'common practice: alignment specs hold toe to about ±0.1–0.2° per wheel (check-values.md); a bump that toes the wheel by more than that is felt';

/** Rig-measurement codes compare with the team's rig tolerance (shared/intent/rig-compare.ts), not with per-profile thresholds. */
export type RigCautionCode = 'rig-toe-disagreement' | 'rig-camber-disagreement';

export const CAUTION_RULES: Readonly<Record<Exclude<CautionCode, 'compliance-steer-unmodelled' | 'rack-pose-unreachable' | 'safety-notice' | RigCautionCode>, RuleDefinition>> = {
  'bump-toe-change': {
    unit: 'deg',
    basis: ALIGNMENT_BASIS + '; tighter where landings are heavy',
    defaults: {
      'smooth-circuit': { warning: 0.15, critical: 0.3 },
      'bumpy-circuit': { warning: 0.1, critical: 0.2 },
      'rough-road': { warning: 0.1, critical: 0.2 },
      'off-road': { warning: 0.05, critical: 0.15 },
    },
  },
  'bump-lateral-force': {
    unit: 'fraction of landing load',
    basis:
      'common practice (product default): a side force of a few per cent of the wheel load from one bump is noticeable as a dart; ' +
      'cornering coefficient of car tyres about 0.15–0.25 per degree (from memory) when the vehicle gives none',
    defaults: {
      'smooth-circuit': { warning: 0.03, critical: 0.06 },
      'bumpy-circuit': { warning: 0.02, critical: 0.05 },
      'rough-road': { warning: 0.02, critical: 0.05 },
      'off-road': { warning: 0.01, critical: 0.03 },
    },
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
    basis: 'common practice (domain.md): front roll steer reaches the driver through the steering; the rear has no such path',
    defaults: { info: 0.01, warning: 0.03, critical: 0.08 },
  },
  'long-travel-roll-steer': {
    unit: 'deg/deg',
    basis: 'common practice (domain.md): off-road and on landings the aim is zero bump steer; a loaded wheel that toes on landing makes the car dart',
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
      'common practice (product default): the loaded outside wheel sets most of the axle side force, so a curved toe line changes the effective roll steer between turn-in and mid-corner',
    defaults: { warning: 0.01, critical: 0.025 },
  },
  'lock-bump-steer-spread': {
    unit: 'deg/m',
    basis: 'common practice (check-values.md): production bump steer spans about −10 to +4 deg/m, so a spread of 5 deg/m across the stroke is large',
    defaults: { warning: 5, critical: 15 },
  },
  'compliance-steer-rivals': {
    unit: 'ratio',
    basis: 'common practice (Bundorf analysis table, check-values.md: compliance steer terms are of the same order as roll steer on road cars)',
    defaults: { warning: 0.5, critical: 1 },
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
  const base: LevelThresholds = 'info' in d || 'warning' in d || 'critical' in d ? (d as LevelThresholds) : (d as Record<TrackProfileId, LevelThresholds>)[profile];
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
  axle: 'front' | 'rear';
  steered: boolean;
  profile: TrackProfile;
  /** Achieved roll steer coefficient ε, deg/deg (domain.md sign). */
  rollSteerCoefficient: number;
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
export function evaluateCautions(inputs: CautionInputs): Caution[] {
  const out: (Caution | null)[] = [];
  const p = inputs.profile;
  const eps = inputs.rollSteerCoefficient;
  const rackNote = inputs.steered && inputs.bumpToeRackMm !== 0 ? ` at rack ${fmt(inputs.bumpToeRackMm, 1)} mm` : '';

  out.push(
    measured('bump-toe-change', inputs.bumpToeChangeDeg, inputs, (th) =>
      `A ${fmt(p.bumpHeightMm, 0)} mm single-wheel bump toes the wheel by ${fmt(inputs.bumpToeChangeDeg)}°${rackNote}, at or above ${fmt(th)}° for ${p.label.toLowerCase()}.`,
    ),
  );
  const index = inputs.corneringCoefficientPerDeg * inputs.bumpToeChangeDeg;
  out.push(
    measured('bump-lateral-force', index, inputs, (th) => {
      const force = inputs.landingLoadN !== null ? ` (about ${fmt(index * inputs.landingLoadN, 0)} N at a landing load of ${fmt(inputs.landingLoadN, 0)} N)` : '';
      return `That toe change pushes the tyre sideways with ${fmt(100 * index, 1)} % of its landing load${force}, at or above ${fmt(100 * th, 1)} %; cornering coefficient from ${inputs.corneringCoefficientSource}.`;
    }),
  );
  out.push(
    measured('bump-lateral-scrub', inputs.bumpScrubMm, inputs, (th) =>
      `The contact patch moves ${fmt(inputs.bumpScrubMm, 1)} mm sideways over the ${fmt(p.bumpHeightMm, 0)} mm bump (limit ${fmt(th, 1)} mm): the tyre scrubs and the car is nudged off line.`,
    ),
  );
  if (inputs.axle === 'front' && inputs.steered) {
    out.push(
      measured('front-roll-steer-feel', Math.abs(eps), inputs, () =>
        `Front roll steer of ${fmt(eps)} deg/deg disturbs steering feel and kicks back through the steering wheel over bumps; prefer the rear axle for deliberate roll steer where you can.`,
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
  out.push(
    measured('roll-steer-curvature', Math.abs(inputs.rollSteerCurvatureChange), inputs, () =>
      `The toe line is curved: the loaded outside wheel's roll steer changes by ${fmt(inputs.rollSteerCurvatureChange)} deg/deg between 0° and ${fmt(inputs.referenceRollDeg, 1)}° of roll, so the balance shifts between turn-in and mid-corner.`,
    ),
  );
  if (inputs.steered) {
    out.push(
      measured('lock-bump-steer-spread', inputs.lockBumpSteerSpreadDegPerM, inputs, () =>
        `Bump steer at rack ${fmt(inputs.lockBumpSteerRackMm, 1)} mm differs from straight ahead by ${fmt(inputs.lockBumpSteerSpreadDegPerM, 1)} deg/m: the match holds at one rack position only.`,
      ),
    );
  }
  if (inputs.complianceRatio !== null) {
    out.push(
      measured('compliance-steer-rivals', inputs.complianceRatio, inputs, () =>
        `Elastic steer under lateral force${inputs.complianceSource === 'computed' ? " (computed from the corner's bushings)" : ''} is ${fmt(inputs.complianceRatio ?? 0, 2)} times the kinematic roll steer of this axle: the rigid-link result alone does not set the balance.`,
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
      basis: 'common practice (Bundorf analysis table, check-values.md)',
    });
  }
  for (const u of inputs.unreachableRacks ?? []) {
    out.push({
      level: 'warning',
      code: 'rack-pose-unreachable',
      message: `At rack ${fmt(u.rackMm, 1)} mm the proposed geometry cannot reach ${u.travelMm !== null ? `travel ${fmt(u.travelMm, 1)} mm` : 'the whole travel range'}: ${u.message}. Its bump steer there is not verified.`,
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
