/**
 * Track profiles: the surface a car runs on decides how much bump
 * sensitivity its roll steer may cost. Each profile is a road (an ISO 8608
 * class), a speed, the corner whose operating steer a steered axle is judged
 * at, a wheel-travel range for the sweeps, and the events that matter (a
 * single-wheel half-sine bump; a landing from a drop height off-road). The
 * ride model (shared/ride) turns them into the bump cost. An intent may
 * override any of them (`trackProfile: { id, travelMm, bumpHeightMm, … }`).
 *
 * Defaults are product defaults of ours, sized from facts of the trade
 * (domain.md / check-values.md, common practice): Formula-Student-class cars
 * run about ±25 mm of travel, road cars about ±80 mm, off-road cars several
 * hundred mm; circuits are ISO 8608 class A–B surfaces, ordinary roads B–C,
 * unmade tracks D and worse. docs/cautions.md lists them with their basis.
 */
import type { RoadClass } from '../ride/road.js';
import type { AxleName } from '../schema/axle.js';
export const TRACK_PROFILE_IDS = ['smooth-circuit', 'bumpy-circuit', 'rough-road', 'off-road'] as const;
export type TrackProfileId = (typeof TRACK_PROFILE_IDS)[number];

export interface TrackProfile {
  id: TrackProfileId;
  label: string;
  /** Wheel-travel range of the objective and verification sweeps, mm (droop negative). */
  travelMm: [number, number];
  /** Height of a single-wheel bump for the bump cautions, mm. */
  bumpHeightMm: number;
  /** Length of that half-sine bump, mm. */
  bumpLengthMm: number;
  /** ISO 8608 class of the random road. */
  roadClass: RoadClass;
  /** Speed of the bump cost, km/h. */
  speedKph: number;
  /** Radius of the corner whose steer a steered axle is judged at, m (its steady yaw rate V/R is the yaw yardstick). */
  cornerRadiusM: number;
  /** Drop height of a landing, mm, or null where landings do not happen. */
  landingDropMm: number | null;
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
    bumpLengthMm: 300,
    roadClass: 'A',
    speedKph: 100,
    cornerRadiusM: 60,
    landingDropMm: null,
    landingLoadFactor: 1.5,
    longTravel: false,
    road: false,
  },
  'bumpy-circuit': {
    id: 'bumpy-circuit',
    label: 'Bumpy circuit',
    travelMm: [-40, 40],
    bumpHeightMm: 25,
    bumpLengthMm: 500,
    roadClass: 'B',
    speedKph: 80,
    cornerRadiusM: 40,
    landingDropMm: null,
    landingLoadFactor: 2,
    longTravel: false,
    road: false,
  },
  'rough-road': {
    id: 'rough-road',
    label: 'Rough road',
    travelMm: [-80, 80],
    bumpHeightMm: 40,
    bumpLengthMm: 600,
    roadClass: 'C',
    speedKph: 70,
    cornerRadiusM: 50,
    landingDropMm: null,
    landingLoadFactor: 2,
    longTravel: false,
    road: true,
  },
  'off-road': {
    id: 'off-road',
    label: 'Off-road, long travel',
    travelMm: [-200, 250],
    bumpHeightMm: 150,
    bumpLengthMm: 1500,
    roadClass: 'E',
    speedKph: 50,
    cornerRadiusM: 30,
    landingDropMm: 500,
    landingLoadFactor: 3,
    longTravel: true,
    road: false,
  },
};

/** The profile a screen starts from for each axle (vehicles store no profile of their own yet). */
export const DEFAULT_TRACK_PROFILE: Readonly<Record<AxleName, TrackProfileId>> = { front: 'smooth-circuit', rear: 'smooth-circuit' };

/** Total travel (mm) from which any profile counts as long travel. */
export const LONG_TRAVEL_SPAN_MM = 300;

export interface TrackProfileChoice {
  id: TrackProfileId;
  travelMm?: [number, number] | undefined;
  bumpHeightMm?: number | undefined;
  bumpLengthMm?: number | undefined;
  roadClass?: RoadClass | undefined;
  speedKph?: number | undefined;
  cornerRadiusM?: number | undefined;
  landingDropMm?: number | null | undefined;
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
    bumpLengthMm: c.bumpLengthMm ?? base.bumpLengthMm,
    roadClass: c.roadClass ?? base.roadClass,
    speedKph: c.speedKph ?? base.speedKph,
    cornerRadiusM: c.cornerRadiusM ?? base.cornerRadiusM,
    landingDropMm: c.landingDropMm !== undefined ? c.landingDropMm : base.landingDropMm,
    longTravel: base.longTravel || travelMm[1] - travelMm[0] >= LONG_TRAVEL_SPAN_MM,
  };
}
