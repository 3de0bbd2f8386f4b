import { axisTitle, AxisSpec, formatNumber, LineSeries } from './chart-types';

/** A chart's numbers as a table: header cells and rows of numbers (NaN = no value). */
export interface SeriesTable {
  readonly header: readonly string[];
  readonly rows: readonly (readonly number[])[];
  /** Long form: first column is the series index into `seriesNames`. */
  readonly long: boolean;
  readonly seriesNames: readonly string[];
}

function sameXs(series: readonly LineSeries[]): boolean {
  const first = series[0]?.points ?? [];
  return series.every(
    (s) => s.points.length === first.length && s.points.every((p, i) => p.x === first[i]!.x),
  );
}

/**
 * Wide table (x, then one column per series) when every series shares the
 * same x values, as a sweep at several rack positions does; otherwise a long
 * table with one row per point.
 */
export function seriesTable(series: readonly LineSeries[], x: AxisSpec, y: AxisSpec): SeriesTable {
  const names = series.map((s) => s.name);
  if (series.length > 0 && sameXs(series)) {
    const header = [axisTitle(x), ...series.map((s) => `${s.name}: ${axisTitle(y)}`)];
    const rows = series[0]!.points.map((p, i) => [p.x, ...series.map((s) => s.points[i]!.y)]);
    return { header, rows, long: false, seriesNames: names };
  }
  const rows: number[][] = [];
  series.forEach((s, k) => s.points.forEach((p) => rows.push([k, p.x, p.y])));
  return { header: ['Series', axisTitle(x), axisTitle(y)], rows, long: true, seriesNames: names };
}

/** Cells as text for display or CSV (long tables show the series name). */
export function tableCells(table: SeriesTable): string[][] {
  return table.rows.map((row) =>
    row.map((v, i) => (table.long && i === 0 ? (table.seriesNames[v] ?? '') : formatNumber(v))),
  );
}
