import * as z from 'zod';
import { CORNER_RANGES } from '../schema/ranges.js';
import { inRange } from '../schema/ranged.js';
import { AXIS_DIRECTIONS, LENGTH_UNITS, type AxisDirection, type LengthUnit } from './cad-frame.js';

/** The frame's origin is a position in the vehicle: held to the coordinate range (shared/schema/ranges.ts). */
const coordinate = inRange(z.number().finite(), CORNER_RANGES.coordinateMm);
const axisDirection = z.enum(AXIS_DIRECTIONS as [AxisDirection, ...AxisDirection[]]);

/** A CAD frame as sent with an upload (the same shape as `CadFrame`). */
export const cadFrameSchema = z.strictObject({
  axes: z.tuple([axisDirection, axisDirection, axisDirection]),
  unit: z.enum(Object.keys(LENGTH_UNITS) as [LengthUnit, ...LengthUnit[]]),
  originMm: z.tuple([coordinate, coordinate, coordinate]),
  side: z.enum(['left', 'right']),
});
