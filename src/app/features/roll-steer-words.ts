import type { AxleName } from './features-api';

/** Below this |ε| (deg/deg) an axle is described as having no roll steer to speak of. */
export const NEGLIGIBLE_ROLL_STEER = 0.0005;

/**
 * The words beside ε (domain.md): positive ε steers the axle out of the
 * turn, which is roll understeer at the front and roll oversteer at the rear.
 */
export function rollSteerWords(epsilon: number, axle: AxleName): string {
  if (!Number.isFinite(epsilon)) return '';
  if (Math.abs(epsilon) < NEGLIGIBLE_ROLL_STEER) return 'practically no roll steer';
  const outOfTurn = epsilon > 0;
  if (axle === 'front') return outOfTurn ? 'roll understeer' : 'roll oversteer';
  return outOfTurn ? 'roll oversteer' : 'roll understeer';
}
