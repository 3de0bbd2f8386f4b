import * as z from 'zod';
import { AXIS_DIRECTIONS, LENGTH_UNITS, type AxisDirection, type LengthUnit } from './cad-frame.js';

const axisDirection = z.enum(AXIS_DIRECTIONS as [AxisDirection, ...AxisDirection[]]);

/** A CAD frame as sent with an upload (the same shape as `CadFrame`). */
export const cadFrameSchema = z.strictObject({
  axes: z.tuple([axisDirection, axisDirection, axisDirection]),
  unit: z.enum(Object.keys(LENGTH_UNITS) as [LengthUnit, ...LengthUnit[]]),
  originMm: z.tuple([z.number().finite(), z.number().finite(), z.number().finite()]),
  side: z.enum(['left', 'right']),
});
