/**
 * Track profiles: the surface a car runs on decides how much bump
 * sensitivity its roll steer may cost. Each profile carries a default
 * wheel-travel range for the objective and verification sweeps, a default
 * single-wheel bump height for the bump cautions and a landing-load factor;
 * an intent may override the first two (`trackProfile: { id, travelMm,
 * bumpHeightMm }`).
 *
 * Defaults are product defaults of ours, sized from facts of the trade
 * (domain.md / check-values.md, common practice): Formula-Student-class cars
 * run about ±25 mm of travel, road cars about ±80 mm, off-road cars several
 * hundred mm. Bump heights and landing factors are our own round numbers;
 * docs/cautions.md lists them with their basis.
 */
export const TRACK_PROFILE_IDS = ['smooth-circuit', 'bumpy-circuit', 'rough-road', 'off-road'] as const;
export type TrackProfileId = (typeof TRACK_PROFILE_IDS)[number];

export interface TrackProfile {
  id: TrackProfileId;
  label: string;
  /** Wheel-travel range of the objective and verification sweeps, mm (droop negative). */
  travelMm: [number, number];
  /** Height of a single-wheel bump for the bump cautions, mm. */
  bumpHeightMm: number;
  /** Vertical load on a wheel landing from that bump, as a multiple of its static load. */
  landingLoadFactor: number;
  /** True where the profile is a long-travel one (zero bump steer advised). */
  longTravel: boolean;
  /** True where the profile describes public roads (compliance cautions apply). */
  road: boolean;
}

export const trackProfiles: Readonly<Record<TrackProfileId, TrackProfile>> = {
  'smooth-circuit': {
    id: 'smooth-circuit',
    label: 'Smooth circuit',
    travelMm: [-25, 25],
    bumpHeightMm: 10,
    landingLoadFactor: 1.5,
    longTravel: false,
    road: false,
  },
  'bumpy-circuit': {
    id: 'bumpy-circuit',
    label: 'Bumpy circuit',
    travelMm: [-40, 40],
    bumpHeightMm: 25,
    landingLoadFactor: 2,
    longTravel: false,
    road: false,
  },
  'rough-road': {
    id: 'rough-road',
    label: 'Rough road',
    travelMm: [-80, 80],
    bumpHeightMm: 40,
    landingLoadFactor: 2,
    longTravel: false,
    road: true,
  },
  'off-road': {
    id: 'off-road',
    label: 'Off-road, long travel',
    travelMm: [-200, 250],
    bumpHeightMm: 150,
    landingLoadFactor: 3,
    longTravel: true,
    road: false,
  },
};

/** The profile a screen starts from for each axle (vehicles store no profile of their own yet). */
export const DEFAULT_TRACK_PROFILE: Readonly<Record<'front' | 'rear', TrackProfileId>> = { front: 'smooth-circuit', rear: 'smooth-circuit' };

/** Total travel (mm) from which any profile counts as long travel. */
export const LONG_TRAVEL_SPAN_MM = 300;

export interface TrackProfileChoice {
  id: TrackProfileId;
  travelMm?: [number, number] | undefined;
  bumpHeightMm?: number | undefined;
}

/** The profile with the intent's overrides applied. */
export function resolveTrackProfile(choice: TrackProfileId | TrackProfileChoice): TrackProfile {
  const c = typeof choice === 'string' ? { id: choice } : choice;
  const base = trackProfiles[c.id];
  const travelMm: [number, number] = c.travelMm ? [c.travelMm[0], c.travelMm[1]] : [base.travelMm[0], base.travelMm[1]];
  return {
    ...base,
    travelMm,
    bumpHeightMm: c.bumpHeightMm ?? base.bumpHeightMm,
    longTravel: base.longTravel || travelMm[1] - travelMm[0] >= LONG_TRAVEL_SPAN_MM,
  };
}
