import type { DisplayUnits } from '../api/accounts.js';
import type { NumFormat } from '../units/format.js';
import { inDisplayUnits, kindForUnit, unitLabel } from '../units/quantities.js';
import { figuresIn, wordNumber } from '../schema/issue-words.js';

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

/** The figures a study label may carry: the profile's bump height and rack positions (mm), its corner radius (m) and speed (km/h). */
const LABEL_UNITS = ['mm', 'm', 'km/h'];

/**
 * A study label in the reader's units: "Toe change over a 10 mm single-wheel bump" reads "… over a 0.3937 in
 * single-wheel bump" for an inch-pound reader (figures as messages write them, shared/schema/issue-words.ts).
 * SI labels are shown as stored.
 */
export function studyLabel(label: string, units: DisplayUnits): string {
  if (units === 'si') return label;
  return figuresIn(
    label,
    (v, unit) => {
      const kind = kindForUnit(unit);
      return kind ? { value: wordNumber(inDisplayUnits(v, kind, units)), unit: unitLabel(kind, units) } : { value: wordNumber(v), unit };
    },
    LABEL_UNITS,
  );
}
