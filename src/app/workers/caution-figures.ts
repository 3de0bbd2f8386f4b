import type { CautionFigures } from '../../../shared/cautions/cautions';
import type { DisplayUnits } from '../core/api-types';
import { formatNum } from '../core/format/num';
import { displayDecimals, unitLabel, type QuantityKind } from '../core/format/quantities';

/**
 * The cautions' figures in the user's unit system, written by the app's one number formatter (the shared
 * caution rules take it as a parameter): a length shown to 1 decimal in mm is shown to 2 in inches, so the
 * resolution stays the same; the drift after a bump is in cm (SI) or inches (inch/pound), to the same resolution.
 */
export function cautionFigures(units: DisplayUnits): CautionFigures {
  const write = (v: number, kind: QuantityKind, siDecimals: number) => `${formatNum(v, { decimals: displayDecimals(kind, units, siDecimals), kind }, units)} ${unitLabel(kind, units)}`;
  return {
    length: (mm, d) => write(mm, 'length', d),
    drift: (m, d) => (units === 'si' ? `${formatNum(100 * m, { decimals: d })} cm` : write(1000 * m, 'length', d - 1)),
    distance: (m) => write(m, 'distance', 0),
    speed: (kph) => write(kph, 'speed', 0),
    force: (n) => write(n, 'force', 0),
    bumpSteer: (g, d) => write(g, 'bumpSteer', d),
  };
}
