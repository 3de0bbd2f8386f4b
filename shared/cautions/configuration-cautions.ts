/**
 * The cautions of a configuration: both corners on the configuration's track
 * profile, each with the vehicle linked in when its data is complete. The
 * same measurement (`measureCornerCautions`) the configuration screen runs in
 * the browser, so the sign-off gate on the server and the list the reviewer
 * sees come from one code. docs/cautions.md, docs/workflow.md (sign-off).
 */
import { cornerSchema, upgradeCornerDocument } from '../schema/corner.js';
import { upgradeVehicleDocument, vehicleSchema, type Vehicle } from '../schema/vehicle.js';
import { InputError, SolveError, parseOrThrow } from '../errors.js';
import type { Caution } from './cautions.js';
import { measureCornerCautions } from './corner-cautions.js';
import type { TrackProfileId } from '../tracks/profiles.js';
import type { BumpCost } from '../ride/cost.js';
import type { AxleName } from '../schema/axle.js';
import type { DisplayUnits } from '../api/accounts.js';
import { cautionFigures, figureUnits } from './figures.js';

export interface ConfigurationCautionsInput {
  vehicle: unknown;
  frontCorner: unknown;
  rearCorner: unknown;
  trackProfile: TrackProfileId;
  /** The reader's unit system for the messages' figures (plain data, so it crosses to the worker thread); default SI. */
  units?: DisplayUnits | undefined;
}

export type AxleCautionList =
  | { axle: AxleName; ok: true; cautions: Caution[]; bumpCost: BumpCost | null; bumpCostUnavailable: string | null }
  | { axle: AxleName; ok: false; failure: { code: string; message: string } };

/** The vehicle as the balance model reads it, or undefined when it is missing or incomplete (as on the screen). */
function usableVehicle(data: unknown): Vehicle | undefined {
  if (data === null || data === undefined) return undefined;
  const parsed = vehicleSchema.safeParse(upgradeVehicleDocument(data));
  return parsed.success ? parsed.data : undefined;
}

/** Each axle's caution list and bump cost, or why it could not be measured (a corner that cannot reach the profile's travel). */
export function computeConfigurationCautions(input: unknown): AxleCautionList[] {
  const i = input as ConfigurationCautionsInput;
  const vehicle = usableVehicle(i.vehicle);
  const figures = cautionFigures(figureUnits(i.units ?? 'si'));
  return (['front', 'rear'] as const).map((axle) => {
    try {
      const corner = parseOrThrow(cornerSchema, upgradeCornerDocument(axle === 'front' ? i.frontCorner : i.rearCorner), `${axle} corner`);
      const m = measureCornerCautions(corner, { axle, trackProfile: i.trackProfile, vehicle, figures });
      return { axle, ok: true as const, cautions: m.cautions, bumpCost: m.bumpCost, bumpCostUnavailable: m.bumpCostUnavailable };
    } catch (e) {
      if (e instanceof InputError || e instanceof SolveError) return { axle, ok: false as const, failure: { code: e.code, message: e.message } };
      throw e;
    }
  });
}
