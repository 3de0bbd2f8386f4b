/**
 * The bump cost of an axle on a track profile: the ride model's consequences
 * that the cautions judge and the screens show beside every roll-steer
 * result (docs/ride.md §6, docs/cautions.md):
 *  - RMS yaw-rate disturbance on the profile's random road (uncorrelated
 *    left and right tracks), against the steady yaw rate V/R of the
 *    profile's corner;
 *  - heading change after the profile's single-wheel bump, and the lateral
 *    drift it makes within one second (V·1 s·tan Δψ);
 *  - on profiles with landings, the side force a landing wheel's toe change
 *    asks of its tyre, as a fraction of that wheel's load.
 * A steered axle is judged at the worse of on-centre and the operating steer
 * of the profile's corner; full lock is reported as information only.
 */
import type { Corner } from '../schema/corner.js';
import type { Vehicle } from '../schema/vehicle.js';
import { evaluateRide, quarterCarOf, quarterCarSpectra, steeringSpectra, ToeCurve, lateralModel, type RideResult } from './index.js';
import { ROAD_CLASS_WORDS, roadSpectrum, type RoadClass } from './road.js';
import { rackForAxleSteer } from '../kinematics/index.js';
import { RAD_PER_DEG } from '../angles.js';
import { SI_FIGURES, type CautionFigures } from '../cautions/cautions.js';
import type { AxleName } from '../schema/axle.js';

/** Time over which the heading change is turned into a lateral drift, s. */
export const DRIFT_HORIZON_S = 1;

/** What a profile gives the bump cost (TrackProfile satisfies it). */
export interface BumpCostProfile {
  roadClass: RoadClass;
  speedKph: number;
  cornerRadiusM: number;
  travelMm: [number, number];
  bumpHeightMm: number;
  bumpLengthMm: number;
  landingDropMm: number | null;
}

export interface BumpCost {
  /** "average road (ISO 8608 class C) at 70 km/h". */
  roadInWords: string;
  roadClass: RoadClass;
  speedKph: number;
  cornerRadiusM: number;
  /** The condition that set the figures: on-centre or at the operating steer. */
  judgedAt: 'on-centre' | 'operating-steer';
  wheelTravelRmsMm: number;
  toeRmsDeg: number;
  yawRateRmsDegPerS: number | null;
  /** Steady yaw rate V/R of the profile's corner, deg/s. */
  steadyYawRateDegPerS: number;
  /** yawRateRms / steadyYawRate, % (null above the critical speed). */
  yawDisturbancePct: number | null;
  bumpHeightMm: number;
  bumpLengthMm: number;
  /** Largest heading change after the bump, deg. */
  headingChangeDeg: number | null;
  /** Lateral drift within 1 s at that heading, m. */
  driftM: number | null;
  peakToeChangeDeg: number;
  landingDropMm: number | null;
  /** Side force of a landing wheel's toe change / its load, –. */
  landingSideForceFraction: number | null;
  /** The on-centre bump steer and at full lock (information), deg/m; null unsteered / no stroke. */
  fullLockBumpSteerDegPerM: number | null;
  /** One sentence for screens and reports. */
  summary: string;
}

export function bumpCostFrom(r: RideResult, p: BumpCostProfile, axle: AxleName): BumpCost {
  const pick = <T extends { condition: string }>(xs: T[], value: (x: T) => number): T | null => {
    let best: T | null = null;
    for (const x of xs) if (x.condition === 'on-centre' || x.condition === 'operating-steer') if (!best || value(x) > value(best)) best = x;
    return best;
  };
  const random = pick(r.steering, (s) => s.uncorrelated.yawRateRmsDegPerS ?? s.uncorrelated.sideForceRmsN);
  const bump = r.bump ? pick(r.bump.steering, (s) => s.headingChangeDeg ?? s.peakSideForceN) : null;
  const landing = r.landing ? pick(r.landing.steering, (s) => s.peakWheelSideForceFraction) : null;
  const V = p.speedKph / 3.6;
  const steady = V / p.cornerRadiusM / RAD_PER_DEG;
  const yaw = random?.uncorrelated.yawRateRmsDegPerS ?? null;
  const heading = bump?.headingChangeDeg ?? null;
  const drift = heading === null ? null : V * DRIFT_HORIZON_S * Math.tan(heading * RAD_PER_DEG);
  const fullLock = r.steering.filter((s) => s.condition === 'full-lock');
  let lock: number | null = null;
  for (const s of fullLock) for (const w of [s.wheels.left, s.wheels.right]) if (lock === null || Math.abs(w.gradientDegPerM) > Math.abs(lock)) lock = w.gradientDegPerM;
  const pct = yaw === null ? null : (100 * yaw) / steady;
  const words = `${ROAD_CLASS_WORDS[p.roadClass]} at ${p.speedKph} km/h`;
  const cost: BumpCost = {
    roadInWords: words,
    roadClass: p.roadClass,
    speedKph: p.speedKph,
    cornerRadiusM: p.cornerRadiusM,
    judgedAt: (random?.condition as 'on-centre' | 'operating-steer') ?? 'on-centre',
    wheelTravelRmsMm: r.wheelTravelRmsMm,
    toeRmsDeg: random?.toeRmsDeg ?? 0,
    yawRateRmsDegPerS: yaw,
    steadyYawRateDegPerS: steady,
    yawDisturbancePct: pct,
    bumpHeightMm: p.bumpHeightMm,
    bumpLengthMm: p.bumpLengthMm,
    headingChangeDeg: heading,
    driftM: drift,
    peakToeChangeDeg: bump?.peakToeChangeDeg ?? 0,
    landingDropMm: p.landingDropMm,
    landingSideForceFraction: landing ? landing.peakWheelSideForceFraction : null,
    fullLockBumpSteerDegPerM: lock,
    summary: '',
  };
  return { ...cost, summary: bumpCostWords(cost, axle) };
}

/**
 * The bump cost in one sentence, for screens and reports, its figures written by `figures` (the reader's
 * unit system, shared/cautions/figures.ts; SI by default, as stored in `summary`).
 */
export function bumpCostWords(c: BumpCost, axle: AxleName, figures: CautionFigures = SI_FIGURES): string {
  const f = figures;
  const decimals = (x: number) => (Number.isInteger(x) ? 0 : 1);
  const yaw = c.yawRateRmsDegPerS;
  const heading = c.headingChangeDeg;
  const parts = [
    `On a ${ROAD_CLASS_WORDS[c.roadClass]} at ${f.speed(c.speedKph)} the ${axle} axle's bump steer gives ${yaw === null || c.yawDisturbancePct === null ? 'no stable yaw response (above the critical speed)' : `${fmt(yaw, 3)} deg/s RMS of yaw-rate disturbance (${fmt(c.yawDisturbancePct, 2)} % of the ${fmt(c.steadyYawRateDegPerS, 1)} deg/s on a ${f.distance(c.cornerRadiusM)} corner)`}`,
    heading === null || c.driftM === null ? '' : `a ${f.length(c.bumpHeightMm, decimals(c.bumpHeightMm))} single-wheel bump turns the car by ${fmt(heading, 3)}° (${f.drift(c.driftM, 1)} of drift in 1 s)`,
  ].filter(Boolean);
  return parts.join('; ') + '.';
}

/** The bump cost of `corner` on `axle` of `vehicle` on a profile (throws InputError when the vehicle lacks ride data). */
export function bumpCost(vehicle: Vehicle, axle: AxleName, corner: Corner, p: BumpCostProfile): BumpCost {
  const r = evaluateRide(vehicle, {
    axle,
    roadClass: p.roadClass,
    speedKph: p.speedKph,
    corner,
    cornerRadiusM: corner.steered ? p.cornerRadiusM : undefined,
    bump: { heightMm: p.bumpHeightMm, lengthMm: p.bumpLengthMm },
    landing: p.landingDropMm !== null ? { dropHeightMm: p.landingDropMm } : undefined,
    travelRangeMm: p.travelMm,
    fullLock: true,
  });
  return bumpCostFrom(r, p, axle);
}

function fmt(x: number, d: number): string {
  return x.toFixed(d);
}

/**
 * The random-road part of the bump cost as a function of the geometry alone,
 * for the solver's budget and its family chart: the quarter car, the road
 * and the lateral chain do not depend on the toe curve, so the yaw-rate
 * variance per unit axle-steer gain, I = ∫|H_r·H_s|²·G df, is integrated
 * once; a geometry then costs its toe statistics only (9 poses per wheel and
 * condition). Same figures as `bumpCost(...).yawRateRmsDegPerS`.
 */
export class RandomRoadYawCost {
  /** RMS wheel travel on this road, mm: the Gaussian travel the toe statistics are taken over. */
  readonly sigmaMm: number;
  /** Yaw-rate variance per unit κ² (κ² in rad²/m², variance in (deg/s)²). */
  private readonly perKappa2: number;
  readonly steadyYawRateDegPerS: number;
  readonly unstable: boolean;

  constructor(
    vehicle: Vehicle,
    private readonly axle: AxleName,
    private readonly p: BumpCostProfile,
  ) {
    const { car, info } = quarterCarOf(vehicle, axle);
    const V = p.speedKph / 3.6;
    const road = roadSpectrum(p.roadClass, V);
    this.sigmaMm = quarterCarSpectra(car, road).travelRmsM * 1000;
    const lat = lateralModel(vehicle, axle, V);
    this.unstable = lat.unstable;
    const unit = steeringSpectra(car, lat, 2 * lat.wheelStiffnessNPerRad(info.staticTyreLoadN), road, 1);
    this.perKappa2 = (unit.yawRateRmsDegPerS ?? 0) ** 2;
    this.steadyYawRateDegPerS = V / p.cornerRadiusM / RAD_PER_DEG;
    this.wheelbaseMm = vehicle.wheelbaseMm;
  }
  private readonly wheelbaseMm: number;

  /** The rack positions judged: 0, and for a steered corner the operating steer of the profile's corner (Ackermann angle L/R). */
  racksMm(corner: Corner): number[] {
    const racks = [0];
    if (corner.steered) racks.push(rackForAxleSteer(corner, this.wheelbaseMm / 1000 / this.p.cornerRadiusM / RAD_PER_DEG));
    return racks;
  }

  /** RMS yaw-rate disturbance of `corner` (worse of on-centre and the operating steer), deg/s and % of V/R; null above the critical speed. */
  of(corner: Corner): { yawRateRmsDegPerS: number; yawDisturbancePct: number } | null {
    if (this.unstable) return null;
    return this.fromToeRms(
      this.racksMm(corner).map((rack) => {
        const l = new ToeCurve(corner, 'left', rack, this.p.travelMm).gaussian(this.sigmaMm).rmsDeg;
        const r = rack === 0 ? l : new ToeCurve(corner, 'right', rack, this.p.travelMm).gaussian(this.sigmaMm).rmsDeg;
        return [l, r];
      }),
    );
  }

  /**
   * The same figure from the toe statistics of each judged condition, for callers that solve the toe
   * themselves (studies): [left, right] RMS toe change (deg) over the Gaussian travel of RMS `sigmaMm`
   * (ToeCurve.gaussian, travels clipped to the profile's range). Null above the critical speed.
   */
  fromToeRms(conditions: [number, number][]): { yawRateRmsDegPerS: number; yawDisturbancePct: number } | null {
    if (this.unstable) return null;
    let worst = 0;
    for (const [lRms, rRms] of conditions) {
      // Equivalent gains rms/σ (rad/m); the sign drops out of the squares.
      const l = this.sigmaMm > 0 ? ((lRms / (this.sigmaMm / 1000)) * RAD_PER_DEG) : 0;
      const r = this.sigmaMm > 0 ? ((rRms / (this.sigmaMm / 1000)) * RAD_PER_DEG) : 0;
      worst = Math.max(worst, Math.sqrt(((l * l + r * r) / 4) * this.perKappa2));
    }
    return { yawRateRmsDegPerS: worst, yawDisturbancePct: (100 * worst) / this.steadyYawRateDegPerS };
  }

  /** Poses one `of` call solves (for the solver's pose count). */
  posesPerCall(corner: Corner): number {
    return corner.steered ? 27 : 9;
  }
}
