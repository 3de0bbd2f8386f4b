import { SI_FIGURES, type CautionFigures } from '../../../shared/cautions/cautions';

/** One kind of figure in the user's unit system: its unit, the factor from the stored unit, and how many more decimals keep the resolution. */
export interface FigureUnit {
  readonly unit: string;
  readonly factor: number;
  readonly extraDecimals: number;
}

/**
 * The units of the cautions' figures, as data the page sends to the worker (built from the app's quantity
 * table by `figureUnits` in intent-client.ts, so the worker carries no formatting code of its own beyond this).
 * `drift` is null in SI, where the shared rules' own SI figures apply (the drift after a bump in cm).
 */
export interface FigureUnits {
  readonly length: FigureUnit;
  readonly distance: FigureUnit;
  readonly speed: FigureUnit;
  readonly force: FigureUnit;
  readonly bumpSteer: FigureUnit;
  readonly drift: FigureUnit | null;
}

/**
 * The cautions' figures in the user's unit system (the shared caution rules take it as a parameter): a
 * figure shown to d decimals in its stored unit is shown to d + extraDecimals in the user's unit (a
 * length to 1 decimal in mm is to 2 in inches), as the app's one formatter writes decimals.
 */
export function cautionFigures(u: FigureUnits): CautionFigures {
  // SI: the shared rules' own figures.
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
