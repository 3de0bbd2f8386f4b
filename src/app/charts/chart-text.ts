/**
 * Text layout for the charts: how much room a label takes, so that tick
 * labels, bar values and category names are placed (wrapped, turned or
 * thinned) where they cannot overlap. Charts draw in the app's one font,
 * Source Sans 3 (chart.scss), at fixed sizes in SVG user units.
 */

/** Font sizes of chart text in SVG user units (chart.scss sets the same). */
export const CHART_FONT = {
  /** Tick labels, category names, legend. */
  tick: 12,
  /** Values printed on bars. */
  value: 11,
  /** Axis titles and mark labels. */
  title: 12,
} as const;

/** Line height of chart text: font size plus leading. */
export function lineHeight(fontPx: number): number {
  return Math.ceil(fontPx * 1.25);
}

/**
 * Estimated advance width of `text` in px at `fontPx`. Source Sans 3
 * averages about 0.5 em per glyph (digits 0.5 em); 0.6 em per glyph is an
 * upper bound for the mixed capitals, digits and symbols charts print, so a
 * layout built on it leaves a little air rather than a collision.
 */
export function textWidth(text: string, fontPx: number): number {
  return text.length * fontPx * 0.6;
}

/**
 * Breaks `text` at spaces into lines no wider than `maxWidth`; `null` when
 * a single word is wider than that (the caller turns or thins the labels).
 */
export function wrapWords(text: string, maxWidth: number, fontPx: number): string[] | null {
  const words = text.split(/\s+/).filter(Boolean);
  const lines: string[] = [];
  let current = '';
  for (const word of words) {
    if (textWidth(word, fontPx) > maxWidth) return null;
    const candidate = current ? `${current} ${word}` : word;
    if (textWidth(candidate, fontPx) <= maxWidth) current = candidate;
    else {
      lines.push(current);
      current = word;
    }
  }
  if (current) lines.push(current);
  return lines;
}

/** An axis-aligned box in SVG user units. */
export interface TextBox {
  readonly x: number;
  readonly y: number;
  readonly width: number;
  readonly height: number;
}

export function boxesOverlap(a: TextBox, b: TextBox): boolean {
  return a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height;
}

/** The value (y) axis' text: its title wrapped to the plot's height, and the left margin it and the tick labels take. */
export interface ValueAxisText {
  /** The title's lines (turned a quarter, reading upwards). */
  readonly lines: readonly string[];
  /** Offset of each line from the plot's left edge, in the turned text's own y (negative: leftwards). */
  readonly lineOffsets: readonly number[];
  /** Left margin: the widest tick label, the tick, a gap and the title's lines (at least `minLeft`). */
  readonly left: number;
}

export function valueAxisText(title: string, plotHeight: number, tickLabels: readonly string[], minLeft: number): ValueAxisText {
  const lines = wrapWords(title, plotHeight - 8, CHART_FONT.title) ?? [title];
  const lh = lineHeight(CHART_FONT.title);
  const widest = Math.max(0, ...tickLabels.map((t) => textWidth(t, CHART_FONT.tick)));
  const left = Math.max(minLeft, Math.ceil(widest + 8 + 8 + lines.length * lh));
  return { lines, left, lineOffsets: lines.map((_, i) => 4 - left + CHART_FONT.title * 0.8 + i * lh) };
}
