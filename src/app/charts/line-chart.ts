import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { extent, line, scaleLinear, symbol, symbolCircle, symbolCross, symbolDiamond, symbolSquare, symbolStar, symbolTriangle, SymbolType } from 'd3';
import {
  axisTitle,
  AxisSpec,
  ChartMark,
  formatNumber,
  LineSeries,
  MarkerShape,
  SERIES_DASHES,
  SERIES_MARKERS,
} from './chart-types';
import { ChartData } from './chart-data';
import { boxesOverlap, CHART_FONT, TextBox, textWidth, valueAxisText } from './chart-text';
import { toCsv } from './csv';
import { seriesTable, tableCells } from './series-table';

const SYMBOLS: Readonly<Record<MarkerShape, SymbolType>> = {
  circle: symbolCircle,
  square: symbolSquare,
  triangle: symbolTriangle,
  diamond: symbolDiamond,
  cross: symbolCross,
  star: symbolStar,
};

const MARGIN = { top: 12, right: 16, bottom: 44, left: 64 };
/** Markers per series: enough to identify it, few enough to keep the line readable. */
const MARKERS_PER_SERIES = 7;

let nextChartId = 0;

interface Tick {
  readonly position: number;
  readonly label: string;
}

interface DrawnSeries {
  readonly name: string;
  readonly path: string;
  readonly dash: string;
  readonly marker: string;
  readonly markerShape: MarkerShape;
  readonly markerPositions: readonly { readonly x: number; readonly y: number }[];
  readonly styleIndex: number;
  /** Drawn as markers only (no line). */
  readonly pointsOnly: boolean;
}

/** Widens a degenerate extent so a flat line still gets an axis. */
function paddedDomain(values: number[], includeZero: boolean): [number, number] {
  const [lo, hi] = extent(includeZero ? [...values, 0] : values) as [number | undefined, number | undefined];
  if (lo === undefined || hi === undefined) return [0, 1];
  if (lo === hi) {
    const pad = Math.abs(lo) > 0 ? Math.abs(lo) * 0.1 : 1;
    return [lo - pad, hi + pad];
  }
  return [lo, hi];
}

/**
 * Line chart of several series against one x axis. Series differ by line
 * style and marker shape as well as colour; axis titles carry their units;
 * the numbers are available as a table and as CSV.
 */
@Component({
  selector: 'rw-line-chart',
  templateUrl: './line-chart.html',
  imports: [ChartData],
  styleUrl: './chart.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LineChart {
  readonly chartTitle = input.required<string>();
  readonly series = input.required<readonly LineSeries[]>();
  readonly x = input.required<AxisSpec>();
  readonly y = input.required<AxisSpec>();
  /** Extra words for the text alternative (what the chart means). */
  readonly description = input<string>('');
  readonly marks = input<readonly ChartMark[]>([]);
  /** Draw the y = 0 line and keep zero in view (toe, steer: sign matters). */
  readonly zeroLine = input<boolean>(true);
  readonly width = input<number>(560);
  readonly height = input<number>(300);

  protected readonly id = `rw-line-chart-${nextChartId++}`;
  protected readonly margin = MARGIN;

  protected readonly plotHeight = computed(() => this.height() - MARGIN.top - MARGIN.bottom);

  /** The y axis' title lines and the left margin they and the tick labels take. */
  protected readonly yAxisText = computed(() =>
    valueAxisText(this.yTitle(), this.plotHeight(), this.yTicks().map((t) => t.label), MARGIN.left),
  );
  protected readonly left = computed(() => this.yAxisText().left);

  protected readonly plotWidth = computed(() => this.width() - this.left() - MARGIN.right);

  private readonly xScale = computed(() => {
    const xs = this.series().flatMap((s) => s.points.map((p) => p.x));
    xs.push(...this.marks().map((m) => m.x));
    return scaleLinear().domain(paddedDomain(xs, false)).range([0, this.plotWidth()]);
  });

  private readonly yScale = computed(() => {
    const ys = this.series().flatMap((s) => s.points.map((p) => p.y));
    ys.push(...this.marks().map((m) => m.y));
    return scaleLinear()
      .domain(paddedDomain(ys, this.zeroLine()))
      .nice()
      .range([this.plotHeight(), 0]);
  });

  /** x ticks: fewer when their labels would come closer than a gap. */
  protected readonly xTicks = computed<Tick[]>(() => {
    const scale = this.xScale();
    for (const count of [6, 4, 2]) {
      const format = scale.tickFormat(count);
      const ticks = scale.ticks(count).map((t) => ({ position: scale(t), label: format(t) }));
      const fits = ticks.every(
        (t, i) =>
          i === 0 ||
          t.position - ticks[i - 1]!.position >=
            (textWidth(t.label, CHART_FONT.tick) + textWidth(ticks[i - 1]!.label, CHART_FONT.tick)) / 2 + 6,
      );
      if (fits || count === 2) return ticks;
    }
    return [];
  });

  protected readonly yTicks = computed<Tick[]>(() => {
    const scale = this.yScale();
    const format = scale.tickFormat(6);
    return scale.ticks(6).map((t) => ({ position: scale(t), label: format(t) }));
  });

  protected readonly zeroY = computed(() => {
    const [lo, hi] = this.yScale().domain() as [number, number];
    return this.zeroLine() && lo <= 0 && hi >= 0 ? this.yScale()(0) : null;
  });

  protected readonly drawn = computed<DrawnSeries[]>(() => {
    const xs = this.xScale();
    const ys = this.yScale();
    const path = line<{ x: number; y: number }>()
      .defined((p) => Number.isFinite(p.x) && Number.isFinite(p.y))
      .x((p) => xs(p.x))
      .y((p) => ys(p.y));
    return this.series().map((s, i) => {
      const styleIndex = i % SERIES_DASHES.length;
      const shape = SERIES_MARKERS[styleIndex]!;
      const n = s.points.length;
      const pointsOnly = s.style === 'points';
      const stride = pointsOnly ? 1 : Math.max(1, Math.ceil(n / MARKERS_PER_SERIES));
      // Offset each series' markers so that coincident lines still show every marker.
      const offset = pointsOnly ? 0 : Math.floor((i * stride) / Math.max(1, this.series().length)) % stride;
      const markerPositions = s.points
        .filter((p, k) => (k - offset) % stride === 0 && Number.isFinite(p.y))
        .map((p) => ({ x: xs(p.x), y: ys(p.y) }));
      return {
        name: s.name,
        path: pointsOnly ? '' : (path(s.points as { x: number; y: number }[]) ?? ''),
        dash: SERIES_DASHES[styleIndex]!,
        marker: symbol(SYMBOLS[shape], 42)() ?? '',
        markerShape: shape,
        markerPositions,
        styleIndex,
        pointsOnly,
      };
    });
  });

  /**
   * Marks with their labels placed beside them where no other label is:
   * above right, below right, above left or below left, in that order.
   */
  protected readonly drawnMarks = computed(() => {
    const font = CHART_FONT.title;
    const placed: TextBox[] = [];
    return this.marks().map((m) => {
      const cx = this.xScale()(m.x);
      const cy = this.yScale()(m.y);
      const w = textWidth(m.label, font);
      const candidates = [
        { x: cx + 10, y: cy - 8, anchor: 'start' },
        { x: cx + 10, y: cy + 8 + font, anchor: 'start' },
        { x: cx - 10, y: cy - 8, anchor: 'end' },
        { x: cx - 10, y: cy + 8 + font, anchor: 'end' },
      ] as const;
      const boxOf = (c: (typeof candidates)[number]): TextBox => ({
        x: c.anchor === 'start' ? c.x : c.x - w,
        y: c.y - font,
        width: w,
        height: font * 1.25,
      });
      const inside = (b: TextBox) => b.x >= -4 && b.x + b.width <= this.plotWidth() + MARGIN.right && b.y >= -MARGIN.top && b.y + b.height <= this.plotHeight();
      const chosen = candidates.find((c) => inside(boxOf(c)) && !placed.some((p) => boxesOverlap(p, boxOf(c)))) ?? candidates[0];
      placed.push(boxOf(chosen));
      return { ...m, cx, cy, lx: chosen.x, ly: chosen.y, anchor: chosen.anchor };
    });
  });

  protected readonly xTitle = computed(() => axisTitle(this.x()));
  protected readonly yTitle = computed(() => axisTitle(this.y()));

  /** Text alternative: what is plotted and each series' range in numbers. */
  protected readonly summary = computed(() => {
    const parts = this.series().map((s) => {
      const ys = s.points.map((p) => p.y).filter(Number.isFinite);
      const xs = s.points.map((p) => p.x);
      if (ys.length === 0) return `${s.name}: no values`;
      return (
        `${s.name}: ${this.y().label} from ${formatNumber(Math.min(...ys), 4)} to ${formatNumber(Math.max(...ys), 4)} ${this.y().unit}` +
        ` over ${this.x().label} ${formatNumber(Math.min(...xs), 4)} to ${formatNumber(Math.max(...xs), 4)} ${this.x().unit}`
      );
    });
    const marks = this.marks().map(
      (m) => `${m.label} at ${formatNumber(m.x, 4)} ${this.x().unit}, ${formatNumber(m.y, 4)} ${this.y().unit}`,
    );
    const head = `${this.yTitle()} against ${this.xTitle()}, ${this.series().length} series.`;
    return [this.description(), head, ...parts, ...marks].filter(Boolean).join(' ');
  });

  protected readonly table = computed(() => seriesTable(this.series(), this.x(), this.y()));
  protected readonly cells = computed(() => tableCells(this.table()));

  /** The chart's numbers as CSV text (also what the download button saves). */
  csv(): string {
    return toCsv(this.table().header, this.cells(), [this.chartTitle()]);
  }

}
