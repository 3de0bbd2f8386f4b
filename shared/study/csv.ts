/**
 * A study result as CSV: the study's facts and the safety caution, then one
 * table per section (outputs, breach probabilities, tornado, histograms,
 * Pareto front), separated by blank lines. papaparse writes it with
 * formula escaping (a cell a spreadsheet would run as a formula gets a
 * leading apostrophe).
 */
import Papa from 'papaparse';
import { SAFETY_CAUTION } from '../cautions/cautions.js';
import type { StudySpec } from './schema.js';
import type { StudyResult } from './run.js';

type Cell = string | number | null;

function table(header: string[], rows: Cell[][]): string {
  return Papa.unparse({ fields: header, data: rows.map((r) => r.map((c) => (typeof c === 'number' && !Number.isFinite(c) ? null : c))) }, { escapeFormulae: true, newline: '\r\n' });
}

export function studyResultCsv(spec: Pick<StudySpec, 'kind' | 'label'>, result: StudyResult): string {
  const parts: string[] = [];
  parts.push(
    table(
      ['study', 'value'],
      [
        ['label', spec.label ?? ''],
        ['kind', result.kind === 'tolerance' ? 'tolerance study' : 'design sweep'],
        ['axle', result.axle],
        ['track profile', result.trackProfile.label],
        ['seed', result.seed],
        ['samples', result.totalSamples],
        ['samples solved', result.validSamples],
        ['engine version', result.engineVersion],
        ['percentiles', result.percentileMethod],
        ['tolerance ranking', result.sensitivityMethod ?? ''],
        ['caution', SAFETY_CAUTION],
      ],
    ),
  );
  parts.push(
    table(
      ['output', 'label', 'unit', 'nominal', 'mean', 'sd', 'p5', 'p50', 'p95', 'min', 'max', 'samples', 'r2'],
      result.outputs.map((o) => [o.key, o.label, o.unit, o.nominal, o.mean, o.sd, o.p5, o.p50, o.p95, o.min, o.max, o.n, o.r2]),
    ),
  );
  const breaches = result.outputs.flatMap((o) => o.breaches.map((b) => [o.key, b.code, b.level, b.absolute ? `|value| >= ${b.threshold}` : `value >= ${b.threshold}`, b.probability, b.interval[0], b.interval[1]] as Cell[]));
  if (breaches.length) parts.push(table(['output', 'caution', 'level', 'breach when', 'probability', 'low 95%', 'high 95%'], breaches));
  const tornado = result.outputs.flatMap((o) => (o.tornado ?? []).map((t) => [o.key, t.factor, t.src] as Cell[]));
  if (tornado.length) parts.push(table(['output', 'tolerance', 'standardized regression coefficient'], tornado));
  parts.push(
    table(
      ['output', 'bin from', 'bin to', 'count'],
      result.outputs.flatMap((o) => o.histogram.counts.map((c, i) => [o.key, o.histogram.from + i * o.histogram.width, o.histogram.from + (i + 1) * o.histogram.width, c] as Cell[])),
    ),
  );
  if (result.sweep) {
    const names = result.factors.map((f) => f.key);
    parts.push(table(
        ['variant', 'balance gained (deg/g)', `bump cost: ${result.sweep.costOutput ?? 'bumpToeChangeDeg'} (${result.sweep.costUnit ?? 'deg'})`, ...names],
        // Results stored before the ride-model bump cost carry the toe change over the bump as costDeg.
        result.sweep.pareto.map((v) => [v.index, v.gainDegPerG, v.cost ?? (v as { costDeg?: number }).costDeg ?? null, ...v.factors]),
      ));
    parts.push(
      table(
        ['output', 'term', 'coefficient'],
        result.sweep.surfaces.flatMap((s) => s.terms.map((t, i) => [s.output, t, s.coefficients[i]!] as Cell[])),
      ),
    );
  }
  return parts.join('\r\n\r\n') + '\r\n';
}
