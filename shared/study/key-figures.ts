/**
 * The few figures of a study result shown where the study is attached (a
 * configuration's review record, the programme board): P5 / P50 / P95 of
 * the balance change, roll steer, the bump cost and static toe. The first
 * present is the headline.
 */
import type { OutputResult } from './run.js';

export interface StudyKeyFigure {
  key: string;
  label: string;
  unit: string;
  p5: number | null;
  p50: number | null;
  p95: number | null;
}

/** The outputs key figures are taken from, in order of precedence. */
export const KEY_FIGURE_OUTPUTS = ['understeerGradientChangeDegPerG', 'rollSteerCoefficient', 'bumpYawDisturbancePct', 'bumpToeChangeDeg', 'staticToeDeg'] as const;

/** What the key figures read of an output; a stored result has null where a percentile is not a number. */
export type KeyFigureSource = Pick<OutputResult, 'key' | 'label' | 'unit'> & { p5: number | null; p50: number | null; p95: number | null };

/** From a result's outputs (all of them, or only those named in KEY_FIGURE_OUTPUTS). */
export function studyKeyFigures(result: { readonly outputs: readonly KeyFigureSource[] }): StudyKeyFigure[] {
  const num = (x: number | null) => (x !== null && Number.isFinite(x) ? x : null);
  const out: StudyKeyFigure[] = [];
  for (const key of KEY_FIGURE_OUTPUTS) {
    const o = result.outputs.find((x) => x.key === key);
    // The toe change over the bump only where there is no ride-model bump cost.
    if (!o || (key === 'bumpToeChangeDeg' && out.some((f) => f.key === 'bumpYawDisturbancePct'))) continue;
    out.push({ key, label: o.label, unit: o.unit, p5: num(o.p5), p50: num(o.p50), p95: num(o.p95) });
  }
  return out;
}
