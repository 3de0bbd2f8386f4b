/**
 * A study result as CSV: the study's facts and the safety caution, then one
 * table per section (outputs, breach probabilities, tornado, histograms,
 * Pareto front, response surfaces), separated by blank lines, written by the
 * one CSV writer (shared/io/csv.ts: formula escaping, CRLF).
 *
 * Figures are in the reader's unit system (SI or inch-pound) and rounded as
 * the study screens round them (shared/study/units.ts: the quantity's own
 * significant figures, named per output in the outputs table). Every numeric
 * column names its unit: in its header where the column holds one quantity,
 * in a `unit` column where each row is a different output.
 */
import { toCsv, type CsvCell } from '../io/csv.js';
import { SAFETY_CAUTION } from '../cautions/cautions.js';
import type { DisplayUnits } from '../api/accounts.js';
import { formatNum, type NumFormat } from '../units/format.js';
import { kindForUnit, QUANTITIES, unitLabel } from '../units/quantities.js';
import { studyFormat, studyLabel, studyUnit } from './units.js';
import type { StudySpec } from './schema.js';
import type { StudyResult } from './run.js';

const UNIT_WORDS: Readonly<Record<DisplayUnits, string>> = {
  si: 'SI (mm, deg, deg/m, deg/g)',
  imperial: 'inch-pound (in, deg, deg/in, deg/g)',
};

/** A figure as the CSV writes it: converted and rounded, an empty cell when missing. */
function figure(v: number | null | undefined, format: NumFormat, units: DisplayUnits): CsvCell {
  const text = formatNum(v, { ...format, missing: '' }, units);
  return text === '' ? null : text;
}

/** The significant figures a study figure stored in `unit` is written with. */
function sigOf(unit: string, fallback: number): number {
  const kind = kindForUnit(unit);
  return kind ? QUANTITIES[kind].sig : fallback;
}

export function studyResultCsv(spec: Pick<StudySpec, 'kind' | 'label'>, result: StudyResult, units: DisplayUnits = 'si'): string {
  const parts: string[] = [];
  const fig = (v: number | null | undefined, unit: string, sig = 4) => figure(v, studyFormat(unit, sig, ''), units);
  const plain = (v: number | null | undefined, sig: number) => figure(v, { sig }, units);
  const length = unitLabel('length', units);
  parts.push(
    toCsv(
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
        ['units', UNIT_WORDS[units]],
        ['rounding', "each output to the significant figures of its quantity (the outputs table's sig column), as on the study screen"],
        ['percentiles', result.percentileMethod],
        ['tolerance ranking', result.sensitivityMethod ?? ''],
        ['caution', SAFETY_CAUTION],
      ],
    ),
  );
  parts.push(
    toCsv(
      ['output', 'label', 'unit', 'sig', 'nominal', 'mean', 'sd', 'p5', 'p50', 'p95', 'min', 'max', 'samples', 'r2'],
      result.outputs.map((o) => [
        o.key,
        studyLabel(o.label, units),
        studyUnit(o.unit, units),
        sigOf(o.unit, 4),
        fig(o.nominal, o.unit),
        fig(o.mean, o.unit),
        fig(o.sd, o.unit, 3),
        fig(o.p5, o.unit),
        fig(o.p50, o.unit),
        fig(o.p95, o.unit),
        fig(o.min, o.unit),
        fig(o.max, o.unit),
        o.n,
        plain(o.r2, 3),
      ]),
    ),
  );
  const breaches = result.outputs.flatMap((o) =>
    o.breaches.map((b): CsvCell[] => {
      const threshold = `${fig(b.threshold, o.unit) ?? ''} ${studyUnit(o.unit, units)}`.trimEnd();
      return [o.key, b.code, b.level, b.absolute ? `|value| >= ${threshold}` : `value >= ${threshold}`, plain(b.probability, 3), plain(b.interval[0], 3), plain(b.interval[1], 3)];
    }),
  );
  if (breaches.length) parts.push(toCsv(['output', 'caution', 'level', 'breach when', 'probability (0 to 1)', 'low 95% (0 to 1)', 'high 95% (0 to 1)'], breaches));
  const tornado = result.outputs.flatMap((o) => (o.tornado ?? []).map((t): CsvCell[] => [o.key, t.factor, t.label, plain(t.src, 3)]));
  if (tornado.length) parts.push(toCsv(['output', 'tolerance', 'point and coordinate', 'standardized regression coefficient (SD per SD)'], tornado));
  parts.push(
    toCsv(
      ['output', 'unit', 'bin from', 'bin to', 'count (samples)'],
      result.outputs.flatMap((o) =>
        o.histogram.counts.map((c, i): CsvCell[] => [o.key, studyUnit(o.unit, units), fig(o.histogram.from + i * o.histogram.width, o.unit), fig(o.histogram.from + (i + 1) * o.histogram.width, o.unit), c]),
      ),
    ),
  );
  if (result.sweep) {
    const sw = result.sweep;
    const costOutput = sw.costOutput ?? 'bumpToeChangeDeg';
    const costUnit = sw.costUnit ?? 'deg';
    const unitOf = new Map(result.outputs.map((o) => [o.key, o.unit]));
    parts.push(
      toCsv(
        ['variant', `balance gained (${studyUnit('deg/g', units)})`, `bump cost: ${costOutput} (${studyUnit(costUnit, units)})`, ...result.factors.map((f) => `${f.label} (${length})`)],
        // Results stored before the ride-model bump cost carry the toe change over the bump as costDeg.
        sw.pareto.map((v): CsvCell[] => [
          v.index,
          fig(v.gainDegPerG, 'deg/g', 4),
          fig(v.cost ?? (v as { costDeg?: number }).costDeg ?? null, costUnit),
          ...v.factors.map((x) => figure(x, { kind: 'length', sig: 5 }, units)),
        ]),
      ),
    );
    parts.push(
      toCsv(
        ['output', 'unit', 'term', 'coefficient'],
        sw.surfaces.flatMap((s) => {
          const unit = unitOf.get(s.output) ?? '';
          return s.terms.map((t, i): CsvCell[] => [s.output, studyUnit(unit, units), t, fig(s.coefficients[i], unit)]);
        }),
      ),
    );
  }
  return parts.join('\r\n');
}
