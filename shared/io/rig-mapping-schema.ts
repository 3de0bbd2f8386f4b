/** The zod schema of a rig file's column mapping (shared/io/rig-measurement.ts `RigMapping`), used at the API door. */
import * as z from 'zod';
import { CAMBER_SIGNS, CAMBER_UNITS, TOE_SIGNS, TOE_UNITS, TRAVEL_SIGNS, TRAVEL_UNITS, type RigMapping } from './rig-measurement.js';

const column = z.number().int().min(0).max(63);

export const rigMappingSchema: z.ZodType<RigMapping> = z
  .strictObject({
    hasHeader: z.boolean(),
    travelColumn: column,
    toeColumn: column,
    camberColumn: column.nullable().optional(),
    travelUnit: z.enum(TRAVEL_UNITS),
    toeUnit: z.enum(TOE_UNITS),
    camberUnit: z.enum(CAMBER_UNITS).optional(),
    rimDiameterMm: z.number().finite().min(100).max(2000).optional(),
    travelSign: z.enum(TRAVEL_SIGNS),
    toeSign: z.enum(TOE_SIGNS),
    camberSign: z.enum(CAMBER_SIGNS).optional(),
  })
  .superRefine((m, ctx) => {
    const cols = [m.travelColumn, m.toeColumn, ...(m.camberColumn != null ? [m.camberColumn] : [])];
    if (new Set(cols).size !== cols.length) ctx.addIssue({ code: 'custom', path: ['toeColumn'], message: 'travel, toe and camber must be different columns' });
    if (m.toeUnit === 'mm-at-rim' && m.rimDiameterMm === undefined) {
      ctx.addIssue({ code: 'custom', path: ['rimDiameterMm'], message: 'toe in mm at the rim needs the reference diameter in mm' });
    }
  });
