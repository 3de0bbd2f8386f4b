/**
 * The cautions' figures in a unit system: the data form (`FigureUnits`, which
 * crosses to a worker thread or a Web Worker as plain data) built from the one
 * quantity table, and the `CautionFigures` the shared caution rules write with.
 * The server words a viewer's cautions with it (the review record); SI is the
 * rules' own `SI_FIGURES`.
 */
import type { DisplayUnits } from '../api/accounts.js';
import { displayDecimals, inDisplayUnits, unitLabel, type QuantityKind } from '../units/quantities.js';
import { SI_FIGURES, type CautionFigures } from './cautions.js';

/** One kind of figure in the user's unit system: its unit, the factor from the stored unit, and how many more decimals keep the resolution. */
export interface FigureUnit {
  readonly unit: string;
  readonly factor: number;
  readonly extraDecimals: number;
}

/**
 * The units of the cautions' figures as data. `drift` is null in SI, where the shared rules' own SI
 * figures apply (the drift after a bump in cm).
 */
export interface FigureUnits {
  readonly length: FigureUnit;
  readonly distance: FigureUnit;
  readonly speed: FigureUnit;
  readonly force: FigureUnit;
  readonly bumpSteer: FigureUnit;
  readonly drift: FigureUnit | null;
}

/** The units of the cautions' figures in `units`, from the quantity table (exact factors, resolution kept). */
export function figureUnits(units: DisplayUnits): FigureUnits {
  const of = (kind: QuantityKind): FigureUnit => ({ unit: unitLabel(kind, units), factor: inDisplayUnits(1, kind, units), extraDecimals: displayDecimals(kind, units, 0) });
  return { length: of('length'), distance: of('distance'), speed: of('speed'), force: of('force'), bumpSteer: of('bumpSteer'), drift: units === 'si' ? null : of('length') };
}

/**
 * The cautions' figures in the unit system `u` describes: a figure shown to d decimals in its stored
 * unit is shown to d + extraDecimals in the user's unit (a length to 1 decimal in mm is to 2 in inches).
 */
export function cautionFigures(u: FigureUnits): CautionFigures {
  const drift = u.drift;
  if (!drift) return SI_FIGURES;
  const write = (v: number, f: FigureUnit, siDecimals: number) => `${(v * f.factor).toFixed(Math.max(0, siDecimals + f.extraDecimals))} ${f.unit}`;
  return {
    length: (mm, d) => write(mm, u.length, d),
    drift: (m, d) => write(1000 * m, drift, d - 1),
    distance: (m) => write(m, u.distance, 0),
    speed: (kph) => write(kph, u.speed, 0),
    force: (n) => write(n, u.force, 0),
    bumpSteer: (g, d) => write(g, u.bumpSteer, d),
  };
}
