import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { scaleBand, scaleLinear } from 'd3';
import { BarGroup, formatNumber } from './chart-types';
import { ChartData } from './chart-data';
import { toCsv } from './csv';

const MARGIN = { top: 16, right: 16, bottom: 56, left: 64 };

let nextBarChartId = 0;

/** Fills that tell bar series apart in greyscale print: solid, hatched, dotted. */
const FILLS = ['solid', 'hatch', 'dots'] as const;

/**
 * Grouped bar chart, e.g. the understeer budget with baseline and variant
 * side by side per term. Bars differ by fill pattern as well as colour; a
 * value label sits on each bar; numbers are available as a table and CSV.
 */
@Component({
  selector: 'rw-bar-chart',
  templateUrl: './bar-chart.html',
  imports: [ChartData],
  styleUrl: './chart.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BarChart {
  readonly chartTitle = input.required<string>();
  readonly groups = input.required<readonly BarGroup[]>();
  /** Names of the bars within each group, e.g. `['Baseline', 'Variant']`. */
  readonly seriesNames = input.required<readonly string[]>();
  /** Quantity and unit of the value axis, e.g. `{ label: 'Understeer gradient', unit: 'deg/g' }`. */
  readonly valueLabel = input.required<string>();
  readonly unit = input.required<string>();
  readonly description = input<string>('');
  readonly width = input<number>(640);
  readonly height = input<number>(300);

  protected readonly id = `rw-bar-chart-${nextBarChartId++}`;
  protected readonly margin = MARGIN;

  protected readonly plotWidth = computed(() => this.width() - MARGIN.left - MARGIN.right);
  protected readonly plotHeight = computed(() => this.height() - MARGIN.top - MARGIN.bottom);

  private readonly groupScale = computed(() =>
    scaleBand<string>()
      .domain(this.groups().map((g) => g.label))
      .range([0, this.plotWidth()])
      .paddingInner(0.25)
      .paddingOuter(0.1),
  );

  private readonly barScale = computed(() =>
    scaleBand<number>()
      .domain(this.seriesNames().map((_, i) => i))
      .range([0, this.groupScale().bandwidth()])
      .padding(0.08),
  );

  private readonly valueScale = computed(() => {
    const values = this.groups().flatMap((g) => g.values.filter(Number.isFinite));
    const lo = Math.min(0, ...values);
    const hi = Math.max(0, ...values);
    return scaleLinear()
      .domain(lo === hi ? [-1, 1] : [lo, hi])
      .nice()
      .range([this.plotHeight(), 0]);
  });

  protected readonly ticks = computed(() => {
    const scale = this.valueScale();
    const format = scale.tickFormat(6);
    return scale.ticks(6).map((t) => ({ position: scale(t), label: format(t) }));
  });

  protected readonly zeroY = computed(() => this.valueScale()(0));

  protected readonly bars = computed(() => {
    const gs = this.groupScale();
    const bs = this.barScale();
    const vs = this.valueScale();
    const zero = vs(0);
    return this.groups().flatMap((g) =>
      g.values.map((v, i) => {
        const y = Number.isFinite(v) ? vs(v) : zero;
        return {
          group: g.label,
          series: this.seriesNames()[i] ?? `Series ${i + 1}`,
          seriesIndex: i,
          fill: FILLS[i % FILLS.length]!,
          value: v,
          x: (gs(g.label) ?? 0) + (bs(i) ?? 0),
          width: bs.bandwidth(),
          y: Math.min(y, zero),
          height: Math.abs(zero - y),
          labelY: v >= 0 ? y - 4 : y + 12,
          label: Number.isFinite(v) ? formatNumber(v, 3) : 'n/a',
        };
      }),
    );
  });

  protected readonly groupLabels = computed(() => {
    const gs = this.groupScale();
    return this.groups().map((g) => ({ label: g.label, x: (gs(g.label) ?? 0) + gs.bandwidth() / 2 }));
  });

  protected readonly valueTitle = computed(() => `${this.valueLabel()} (${this.unit()})`);

  protected readonly summary = computed(() => {
    const parts = this.groups().map(
      (g) =>
        `${g.label}: ` +
        g.values.map((v, i) => `${this.seriesNames()[i] ?? ''} ${formatNumber(v, 4)} ${this.unit()}`).join(', '),
    );
    return [this.description(), `${this.valueTitle()} by term for ${this.seriesNames().join(' and ')}.`, ...parts]
      .filter(Boolean)
      .join(' ');
  });

  protected readonly header = computed(() => [
    'Term',
    ...this.seriesNames().map((n) => `${n} (${this.unit()})`),
    ...(this.seriesNames().length === 2 ? [`Change (${this.unit()})`] : []),
  ]);

  protected readonly cells = computed(() =>
    this.groups().map((g) => [
      g.label,
      ...g.values.map((v) => formatNumber(v)),
      ...(g.values.length === 2 ? [formatNumber(g.values[1]! - g.values[0]!)] : []),
    ]),
  );

  csv(): string {
    return toCsv(this.header(), this.cells(), [this.chartTitle()]);
  }

}
