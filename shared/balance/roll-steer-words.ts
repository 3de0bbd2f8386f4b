/**
 * The words beside a roll steer coefficient ε (domain.md): positive ε steers
 * the axle out of the turn, which is roll understeer at the front and roll
 * oversteer at the rear. The one wording for the solver's labels and every
 * screen.
 */
import type { AxleName } from '../schema/axle.js';

/** Below this |ε| (deg/deg) an axle is described as having no roll steer to speak of. */
export const NEGLIGIBLE_ROLL_STEER = 0.0005;

/** "roll understeer", "roll oversteer" or "practically no roll steer" for ε on that axle; '' for a non-finite ε. */
export function rollSteerWords(epsilon: number, axle: AxleName): string {
  if (!Number.isFinite(epsilon)) return '';
  if (Math.abs(epsilon) < NEGLIGIBLE_ROLL_STEER) return 'practically no roll steer';
  const outOfTurn = epsilon > 0;
  if (axle === 'front') return outOfTurn ? 'roll understeer' : 'roll oversteer';
  return outOfTurn ? 'roll oversteer' : 'roll understeer';
}
