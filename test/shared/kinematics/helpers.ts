/** Corners built for the analytic checks (check-values.md, "Kinematics: analytic cases"), in mm. */
import type { Corner, Vec3 } from '../../../shared/schema/corner.js';

/**
 * Planar-equivalent double wishbone of check-values.md: both arms horizontal,
 * pivot axes parallel to x, inner pivots y = 300 (z 350 upper, 120 lower),
 * ball joints at y = 300 + armLength, vertical kingpin, steering-arm point
 * 100 mm behind the kingpin at z = 200. Wheel centre, spindle and radius are
 * free choices (toe does not depend on them).
 */
export function planarWishbone(opts: { tieRodInner: Vec3; tieRodOuter?: Vec3; upperLength?: number; lowerLength?: number; wheelCentreY?: number; rackStroke?: [number, number] }): Corner {
  const lo = opts.lowerLength ?? 300;
  const up = opts.upperLength ?? 300;
  const wcY = opts.wheelCentreY ?? 300 + lo + 50;
  return {
    formatVersion: 1,
    type: 'double-wishbone',
    steered: true,
    wheel: { radius: 235 },
    points: {
      wheelCentre: [0, wcY, 235],
      spindle: [0, wcY - 50, 235],
      lowerFront: [100, 300, 120],
      lowerRear: [-100, 300, 120],
      lowerOuter: [0, 300 + lo, 120],
      upperFront: [100, 300 + lo - up, 350],
      upperRear: [-100, 300 + lo - up, 350],
      upperOuter: [0, 300 + lo, 350],
      tieRodInner: opts.tieRodInner,
      tieRodOuter: opts.tieRodOuter ?? [-100, 300 + lo, 200],
    },
    steering: { kind: 'rack', rackAxis: [0, 1, 0], rackStroke: opts.rackStroke ?? [-40, 40] },
  };
}
