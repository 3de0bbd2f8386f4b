import type { DisplayUnits } from '../../core/api-types';
import type { NumFormat } from '../../core/format/num';
import { inDisplayUnits, kindForUnit, unitLabel } from '../../core/format/quantities';

/**
 * A study figure arrives with its stored unit as text ('deg/m', 'mm', '%').
 * Where a quantity kind converts that unit, the figure is shown in the user's
 * unit system with the kind's significant figures; otherwise as stored, to
 * `sig` significant figures. A missing figure is an em dash, as in the tables.
 */
export function studyFormat(unit: string, sig = 4): NumFormat {
  const kind = kindForUnit(unit);
  return kind ? { kind, missing: '—' } : { sig, missing: '—' };
}

/** The unit a study figure stored in `unit` is shown in. */
export function studyUnit(unit: string, units: DisplayUnits): string {
  const kind = kindForUnit(unit);
  return kind ? unitLabel(kind, units) : unit;
}

/** A stored study value in the user's unit system (for charts, which draw numbers, not text). */
export function studyValue(value: number, unit: string, units: DisplayUnits): number {
  const kind = kindForUnit(unit);
  return kind ? inDisplayUnits(value, kind, units) : value;
}
