import { formatNum } from '../core/format/num';
/**
 * Plain inputs of the chart components. Charts know nothing about the
 * solver: a screen turns its results into series with units and hands them
 * over.
 */

/** One point of a line series, in the units of the chart's axes. */
export interface ChartPoint {
  readonly x: number;
  readonly y: number;
}

/** A named line; `points` sorted by x are drawn joined in order. */
export interface LineSeries {
  readonly name: string;
  readonly points: readonly ChartPoint[];
  /**
   * `line` (default): a line with a few markers to tell it apart; `points`: a
   * marker at every point and no line (measured data such as a rig file).
   */
  readonly style?: 'line' | 'points';
}

/** An axis: what is plotted and in which unit, e.g. `{ label: 'Wheel travel', unit: 'mm' }`. */
export interface AxisSpec {
  readonly label: string;
  readonly unit: string;
}

/** A marked point drawn over the lines (e.g. the chosen member of a family). */
export interface ChartMark {
  readonly x: number;
  readonly y: number;
  readonly label: string;
}

/** One group of bars (e.g. one term of the understeer budget). */
export interface BarGroup {
  readonly label: string;
  /** One value per bar series, in the order of `BarChart.seriesNames`. */
  readonly values: readonly number[];
}

/** Axis title with its unit in brackets, the form every chart and table uses. */
export function axisTitle(axis: AxisSpec): string {
  return axis.unit ? `${axis.label} (${axis.unit})` : axis.label;
}

/** Dash patterns that tell series apart without colour (solid first). */
export const SERIES_DASHES: readonly string[] = ['', '7 4', '2 3', '10 3 2 3', '4 2 4 6', '1 5'];

/** Marker shapes, in the same order as the dashes. */
export const SERIES_MARKERS = ['circle', 'square', 'triangle', 'diamond', 'cross', 'star'] as const;
export type MarkerShape = (typeof SERIES_MARKERS)[number];

/** Numbers for tables and CSV: enough digits for engineering use, no float noise. */
export function formatNumber(value: number, significant = 6): string {
  return formatNum(value, { sig: significant, missing: '' });
}
