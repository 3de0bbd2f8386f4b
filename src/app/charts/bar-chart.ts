import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { scaleBand, scaleLinear } from 'd3';
import { BarGroup, formatNumber } from './chart-types';
import { CHART_FONT, lineHeight, textWidth, valueAxisText, wrapWords } from './chart-text';
import { ChartData } from './chart-data';
import { toCsv } from './csv';

const MARGIN = { top: 16, right: 16, bottom: 56, left: 64 };
/** Lines a category name may wrap to before the names are turned instead. */
const MAX_NAME_LINES = 3;
/** Category names are turned by this angle when they do not fit level. */
const TURN_DEG = 45;
const TURN_COS = Math.cos((TURN_DEG * Math.PI) / 180);
/** Longest turned category name, in px (longer names end in an ellipsis; the table has them whole). */
const MAX_TURNED_NAME = 150;

let nextBarChartId = 0;

/** `text` cut to `room` px with an ellipsis when longer. */
function fitText(text: string, room: number, fontPx: number): string {
  if (textWidth(text, fontPx) <= room) return text;
  const chars = Math.max(1, Math.floor(room / (fontPx * 0.6)) - 1);
  return text.slice(0, chars).trimEnd() + '…';
}

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

  /** Height of the value axis: fixed by the chart's height, whatever room the category names take below it. */
  protected readonly plotHeight = computed(() => this.height() - MARGIN.top - MARGIN.bottom);

  private readonly values = computed(() => this.groups().flatMap((g) => g.values.filter(Number.isFinite)));

  /** The value axis' rounded domain (its ticks depend on the domain only). */
  private readonly domain = computed<[number, number]>(() => {
    const values = this.values();
    const lo = Math.min(0, ...values);
    const hi = Math.max(0, ...values);
    return scaleLinear()
      .domain(lo === hi ? [-1, 1] : [lo, hi])
      .nice()
      .domain() as [number, number];
  });

  private readonly tickValues = computed(() => {
    const scale = scaleLinear().domain(this.domain());
    const format = scale.tickFormat(6);
    return scale.ticks(6).map((t) => ({ value: t, label: format(t) }));
  });

  protected readonly valueTitle = computed(() => `${this.valueLabel()} (${this.unit()})`);

  /** The value axis' title lines and the left margin they and the tick labels take. */
  protected readonly axisText = computed(() =>
    valueAxisText(this.valueTitle(), this.plotHeight(), this.tickValues().map((t) => t.label), MARGIN.left),
  );
  protected readonly left = computed(() => this.axisText().left);

  protected readonly plotWidth = computed(() => this.width() - this.left() - MARGIN.right);

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

  private readonly valueTexts = computed(() =>
    this.groups().map((g) => g.values.map((v) => (Number.isFinite(v) ? formatNumber(v, 3) : 'n/a'))),
  );

  /**
   * How the values are printed on the bars: level when neighbouring labels
   * have room, turned a quarter when only the text's height fits between
   * bars, not at all when bars are too close (the table holds them).
   */
  protected readonly valueMode = computed<'level' | 'turned' | 'none'>(() => {
    const gs = this.groupScale();
    const bs = this.barScale();
    const n = this.seriesNames().length;
    const spacing = n > 1 ? bs.step() : gs.step();
    const widest = Math.max(0, ...this.valueTexts().flat().map((t) => textWidth(t, CHART_FONT.value)));
    const groups = this.groups();
    const firstCentre = (gs(groups[0]?.label ?? '') ?? 0) + bs.bandwidth() / 2;
    const lastCentre = (gs(groups[groups.length - 1]?.label ?? '') ?? 0) + (bs(n - 1) ?? 0) + bs.bandwidth() / 2;
    if (widest + 3 <= spacing && firstCentre - widest / 2 >= -2 && lastCentre + widest / 2 <= this.plotWidth() + MARGIN.right) {
      return 'level';
    }
    return lineHeight(CHART_FONT.value) <= spacing ? 'turned' : 'none';
  });

  /** Room kept inside the plot beyond the tallest bars for their value labels. */
  private readonly valueRoom = computed(() => {
    const mode = this.valueMode();
    if (mode === 'none') return 0;
    if (mode === 'level') return lineHeight(CHART_FONT.value) + 2;
    return Math.ceil(Math.max(0, ...this.valueTexts().flat().map((t) => textWidth(t, CHART_FONT.value)))) + 6;
  });

  private readonly valueScale = computed(() => {
    const [lo, hi] = this.domain();
    const room = this.valueRoom();
    return scaleLinear()
      .domain([lo, hi])
      .range([this.plotHeight() - (lo < 0 ? room : 0), hi > 0 ? room : 0]);
  });

  protected readonly ticks = computed(() => {
    const scale = this.valueScale();
    return this.tickValues().map((t) => ({ position: scale(t.value), label: t.label }));
  });

  protected readonly zeroY = computed(() => this.valueScale()(0));

  protected readonly bars = computed(() => {
    const gs = this.groupScale();
    const bs = this.barScale();
    const vs = this.valueScale();
    const zero = vs(0);
    const texts = this.valueTexts();
    const mode = this.valueMode();
    return this.groups().flatMap((g, gi) =>
      g.values.map((v, i) => {
        const y = Number.isFinite(v) ? vs(v) : zero;
        const x = (gs(g.label) ?? 0) + (bs(i) ?? 0);
        const centre = x + bs.bandwidth() / 2;
        const up = !(v < 0);
        const end = up ? y - 4 : y + 4;
        return {
          group: g.label,
          series: this.seriesNames()[i] ?? `Series ${i + 1}`,
          seriesIndex: i,
          fill: FILLS[i % FILLS.length]!,
          value: v,
          x,
          width: bs.bandwidth(),
          y: Math.min(y, zero),
          height: Math.abs(zero - y),
          label: mode === 'none' ? '' : texts[gi]![i]!,
          // Level: centred above (below) the bar; turned: reading upwards from the bar's end.
          labelTransform:
            mode === 'turned'
              ? `translate(${centre + CHART_FONT.value * 0.35},${end}) rotate(-90)`
              : `translate(${centre},${up ? end : y + 4 + CHART_FONT.value * 0.8})`,
          labelAnchor: mode === 'turned' ? (up ? 'start' : 'end') : 'middle',
        };
      }),
    );
  });

  /**
   * Category names under the groups: level and wrapped at spaces when they
   * fit their group's width, else turned; when even turned names would
   * touch, every k-th name is shown (the table lists them all).
   */
  protected readonly nameLayout = computed(() => {
    const gs = this.groupScale();
    const step = gs.step();
    const font = CHART_FONT.tick;
    const lh = lineHeight(font);
    const groups = this.groups();
    const wrapped = groups.map((g) => wrapWords(g.label, step - 4, font));
    if (wrapped.every((w) => w !== null && w.length <= MAX_NAME_LINES)) {
      const lines = Math.max(1, ...wrapped.map((w) => w!.length));
      return {
        turned: false,
        height: 8 + lines * lh,
        names: groups.map((g, i) => {
          const ls = wrapped[i]!;
          return {
            label: g.label,
            x: (gs(g.label) ?? 0) + gs.bandwidth() / 2,
            lines: ls.map((l, k) => (k < ls.length - 1 ? `${l} ` : l)),
          };
        }),
      };
    }
    // Parallel turned names `step` apart stand step·sin(turn) apart: keep that at least a line.
    const every = Math.max(1, Math.ceil(lh / (step * Math.sin((TURN_DEG * Math.PI) / 180))));
    const names = groups
      .map((g, i) => ({ g, i }))
      .filter(({ i }) => i % every === 0)
      .map(({ g }) => {
        const x = (gs(g.label) ?? 0) + gs.bandwidth() / 2;
        const room = Math.min(MAX_TURNED_NAME, (x + this.left() - 4) / TURN_COS);
        return { label: g.label, x, lines: [fitText(g.label, room, font)] };
      });
    const longest = Math.max(0, ...names.map((n) => textWidth(n.lines[0]!, font)));
    return { turned: true, height: Math.ceil(12 + (longest + font) * TURN_COS) + 4, names };
  });

  /** Whole height: the plot plus whatever the category names need below it. */
  protected readonly totalHeight = computed(() => MARGIN.top + this.plotHeight() + Math.max(24, this.nameLayout().height));

  protected readonly lineHeight = lineHeight(CHART_FONT.tick);
  protected readonly turnDeg = TURN_DEG;

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
