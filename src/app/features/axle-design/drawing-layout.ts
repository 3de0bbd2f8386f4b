/**
 * Layout of the editor's scaled linkage drawings, kept free of Angular so it
 * can be checked on its own: the length of the scale bar, and where each
 * point's number goes so that no two labels (numbers and dimension texts)
 * overlap and no number covers another point.
 */

/** An axis-aligned box in drawing units (SVG viewBox units, y down). */
export interface Box {
  readonly x: number;
  readonly y: number;
  readonly w: number;
  readonly h: number;
}

export function boxesOverlap(a: Box, b: Box): boolean {
  return a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;
}

const IN_MM = 25.4;

/**
 * A round scale-bar length close to `targetMm`, in the user's unit: 1, 2 or
 * 5 × a power of ten millimetres (SI) or inches (inch-pound). Returns the
 * length in mm and in the shown unit.
 */
export function scaleBarLength(targetMm: number, units: 'si' | 'imperial'): { readonly mm: number; readonly shown: number } {
  const perUnit = units === 'imperial' ? IN_MM : 1;
  const target = Math.max(targetMm / perUnit, 1e-6);
  const decade = 10 ** Math.floor(Math.log10(target));
  // The largest round step not above the target, so the bar fits the space it was given.
  const shown = [5, 2, 1].map((m) => m * decade).find((v) => v <= target) ?? decade;
  return { mm: shown * perUnit, shown };
}

/** Size of a text label at the drawings' font (digits and short words; a fixed advance per character). */
export const LABEL_FONT = 10;
const ADVANCE = 0.62 * LABEL_FONT;
export function textBox(text: string, cx: number, cy: number): Box {
  const w = text.length * ADVANCE + 6;
  const h = LABEL_FONT + 4;
  return { x: cx - w / 2, y: cy - h / 2, w, h };
}

export interface LabelRequest {
  readonly key: string;
  readonly text: string;
  /** The point the label names. */
  readonly x: number;
  readonly y: number;
}

export interface PlacedLabel extends LabelRequest {
  readonly box: Box;
  /** The label sits away from its point: draw a leader line to it. */
  readonly leader: boolean;
}

/** Radius of a point marker, drawing units (labels keep off every other point). */
export const MARKER_R = 3.5;

/**
 * Places each label near its point: first on a ring of eight positions
 * close around it, then further out, then anywhere free in the drawing
 * nearest the point. A label never overlaps another label, a fixed box
 * (dimension texts) or another point's marker, and stays inside the
 * drawing. Points are taken in order; the first ones get the closest spots.
 */
export function placeLabels(requests: readonly LabelRequest[], bounds: Box, fixed: readonly Box[]): PlacedLabel[] {
  const placed: PlacedLabel[] = [];
  const markers = requests.map((r) => ({ key: r.key, box: { x: r.x - MARKER_R, y: r.y - MARKER_R, w: 2 * MARKER_R, h: 2 * MARKER_R } }));
  const inside = (b: Box) => b.x >= bounds.x && b.y >= bounds.y && b.x + b.w <= bounds.x + bounds.w && b.y + b.h <= bounds.y + bounds.h;
  const free = (b: Box, key: string, avoidMarkers: boolean) =>
    inside(b) &&
    !placed.some((p) => boxesOverlap(p.box, b)) &&
    !fixed.some((f) => boxesOverlap(f, b)) &&
    (!avoidMarkers || !markers.some((m) => m.key !== key && boxesOverlap(m.box, b)));

  for (const r of requests) {
    const size = textBox(r.text, 0, 0);
    const at = (cx: number, cy: number): Box => ({ x: cx - size.w / 2, y: cy - size.h / 2, w: size.w, h: size.h });
    // Close ring: the label just off the marker, up-right first (the usual reading position).
    const near = Math.max(size.w, size.h) / 2 + MARKER_R + 1;
    const rings = [near, near + 7, near + 15, near + 26, near + 40];
    const directions = [
      [1, -1], [1, 1], [-1, -1], [-1, 1], [1, 0], [-1, 0], [0, -1], [0, 1],
    ] as const;
    let chosen: { box: Box; leader: boolean } | null = null;
    for (const avoidMarkers of [true, false]) {
      for (const [ri, radius] of rings.entries()) {
        for (const [dx, dy] of directions) {
          const n = Math.hypot(dx, dy);
          const box = at(r.x + (dx / n) * radius, r.y + (dy / n) * radius);
          if (free(box, r.key, avoidMarkers)) {
            chosen = { box, leader: ri > 0 };
            break;
          }
        }
        if (chosen) break;
      }
      if (chosen) break;
    }
    if (!chosen) {
      // Anywhere free in the drawing, nearest the point (a crowded view).
      const step = 3;
      let best: { box: Box; d: number } | null = null;
      for (let cy = bounds.y + size.h / 2; cy <= bounds.y + bounds.h - size.h / 2; cy += step) {
        for (let cx = bounds.x + size.w / 2; cx <= bounds.x + bounds.w - size.w / 2; cx += step) {
          const d = Math.hypot(cx - r.x, cy - r.y);
          if (best && d >= best.d) continue;
          const box = at(cx, cy);
          if (free(box, r.key, false)) best = { box, d };
        }
      }
      // Never on top of another label: a label with no free spot at all is left off (its point keeps its tooltip).
      if (best) chosen = { box: best.box, leader: true };
    }
    if (chosen) placed.push({ ...r, ...chosen });
  }
  return placed;
}
