import type { DisplayUnits } from '../api/accounts.js';
import type { NumFormat } from '../units/format.js';
import { inDisplayUnits, kindForUnit, unitLabel } from '../units/quantities.js';

/**
 * A study figure is stored with its unit as text ('deg/m', 'mm', '%'). The study
 * screens and the study CSV write it through these, so both convert and round alike.
 * Where a quantity kind converts that unit, the figure is shown in the user's
 * unit system with the kind's significant figures; otherwise as stored, to
 * `sig` significant figures. A missing figure is an em dash, as in the tables
 * (`missing` names another text, '' for a CSV's empty cell).
 */
export function studyFormat(unit: string, sig = 4, missing = '—'): NumFormat {
  const kind = kindForUnit(unit);
  return kind ? { kind, missing } : { sig, missing };
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
