/**
 * The few figures of a study result shown where the study is attached (a
 * configuration's review record, the programme board): P5 / P50 / P95 of
 * the balance change, roll steer, the bump cost and static toe. The first
 * present is the headline.
 */
import type { StudyResult } from './run.js';

export interface StudyKeyFigure {
  key: string;
  label: string;
  unit: string;
  p5: number | null;
  p50: number | null;
  p95: number | null;
}

const KEYS = ['understeerGradientChangeDegPerG', 'rollSteerCoefficient', 'bumpYawDisturbancePct', 'bumpToeChangeDeg', 'staticToeDeg'] as const;

export function studyKeyFigures(result: Pick<StudyResult, 'outputs'>): StudyKeyFigure[] {
  const num = (x: number) => (Number.isFinite(x) ? x : null);
  const out: StudyKeyFigure[] = [];
  for (const key of KEYS) {
    const o = result.outputs.find((x) => x.key === key);
    // The toe change over the bump only where there is no ride-model bump cost.
    if (!o || (key === 'bumpToeChangeDeg' && out.some((f) => f.key === 'bumpYawDisturbancePct'))) continue;
    out.push({ key, label: o.label, unit: o.unit, p5: num(o.p5), p50: num(o.p50), p95: num(o.p95) });
  }
  return out;
}
