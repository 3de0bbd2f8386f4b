/**
 * How a configuration (a vehicle with its front and rear axle designs, run on
 * a track profile) is analysed: the balance engine with both corners linked,
 * and each corner's toe / camber fits over the profile's travel range. The
 * one definition: the server computes a configuration's results (and an
 * approval's frozen snapshot) from its requests on its worker threads, and
 * tests call `analyseConfiguration` to compare against it.
 */
import * as z from 'zod';
import { parseOrThrow } from '../errors.js';
import { computeBalance, type BalanceResponse } from '../balance/api.js';
import { computeCornerSweep } from '../kinematics/api.js';
import type { Range, SweepResult } from '../kinematics/index.js';
import { TRACK_PROFILE_IDS, trackProfiles, type TrackProfileId } from '../tracks/profiles.js';

/** Travel steps of each corner's bump-steer sweep over the profile's travel range. */
export const CONFIGURATION_SWEEP_STEPS = 40;

export const configurationInputsSchema = z.strictObject({
  /** The vehicle document (validated by the balance engine). */
  vehicle: z.unknown(),
  /** The front and rear axle designs' LEFT corners (validated by the kinematics engine). */
  frontCorner: z.unknown(),
  rearCorner: z.unknown(),
  trackProfile: z.enum(TRACK_PROFILE_IDS),
});

export interface ConfigurationAnalysis {
  /** The balance engine's answer for the vehicle with both corners linked. */
  balance: BalanceResponse;
  /** Toe / camber fits of each corner over the track profile's travel range, rack straight ahead. */
  bumpSteer: { front: SweepResult['fit']; rear: SweepResult['fit']; travelMm: [number, number] };
}

/** The travel range (mm) a configuration's corners are swept over on a profile: its droop to bump range in 40 steps. */
export function configurationTravel(trackProfile: TrackProfileId): Range {
  const [from, to] = trackProfiles[trackProfile].travelMm;
  return { from, to, step: (to - from) / CONFIGURATION_SWEEP_STEPS };
}

/**
 * The three engine requests a configuration's analysis is made of: the
 * balance with both corners linked (`computeBalance`) and each corner's sweep
 * over the profile's travel (`computeCornerSweep`). The server runs them as
 * three tasks on its worker threads, side by side, and puts the answers
 * together with `configurationAnalysis`.
 */
export function configurationRequests(input: unknown): { balance: unknown; front: unknown; rear: unknown; travelMm: [number, number] } {
  const inputs = parseOrThrow(configurationInputsSchema, input, 'configuration');
  const travel = configurationTravel(inputs.trackProfile);
  return {
    balance: { vehicle: inputs.vehicle, frontCorner: inputs.frontCorner, rearCorner: inputs.rearCorner },
    front: { corner: inputs.frontCorner, travel },
    rear: { corner: inputs.rearCorner, travel },
    travelMm: trackProfiles[inputs.trackProfile].travelMm,
  };
}

/** The analysis from the answers to `configurationRequests`: the balance as answered, each corner's fits. */
export function configurationAnalysis(
  requests: { travelMm: [number, number] },
  balance: BalanceResponse,
  frontSweep: Pick<SweepResult, 'fit'>,
  rearSweep: Pick<SweepResult, 'fit'>,
): ConfigurationAnalysis {
  return { balance, bumpSteer: { front: frontSweep.fit, rear: rearSweep.fit, travelMm: requests.travelMm } };
}

/** Analyses a configuration in this thread; InputError / SolveError name the document at fault as the engines do. */
export function analyseConfiguration(input: unknown): ConfigurationAnalysis {
  const r = configurationRequests(input);
  return configurationAnalysis(r, computeBalance(r.balance), computeCornerSweep(r.front), computeCornerSweep(r.rear));
}
