import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import type { Corner, Vec3 } from '../../../../shared/schema/corner';
import { formatNum } from '../../core/format/num';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { unitLabel } from '../../core/format/quantities';
import { type Box, LABEL_FONT, MARKER_R, placeLabels, scaleBarLength, textBox } from './drawing-layout';
import { hardpointRows, linkRows, pointName } from './hardpoint-model';

type ViewName = 'front' | 'side' | 'top';

interface ViewSpec {
  readonly name: ViewName;
  readonly title: string;
  readonly across: string;
  readonly up: string;
  /** Screen (right, up) of a vehicle point, mm. */
  readonly project: (p: Vec3) => [number, number];
}

// Front elevation: seen from ahead, the car's left (+y) is on the viewer's right.
// Side elevation: seen from the left, forward (+x) is on the viewer's left.
// Plan: seen from above with forward up, the car's left is on the viewer's left.
const VIEWS: readonly ViewSpec[] = [
  { name: 'front', title: 'Front elevation, looking rearward', across: 'y (left to the right)', up: 'z', project: (p) => [p[1], p[2]] },
  { name: 'side', title: 'Side elevation, from the left', across: 'x (forward to the left)', up: 'z', project: (p) => [-p[0], p[2]] },
  { name: 'top', title: 'Plan, from above', across: 'y (left to the left)', up: 'x (forward)', project: (p) => [-p[1], p[0]] },
];

/** Drawing size and margins, viewBox units: vertical dimensions on the left, horizontal ones and the scale bar below. */
const WIDTH = 420;
const HEIGHT = 330;
const MARGIN = { left: 58, right: 12, top: 12, bottom: 46 };
const INNER = { x: MARGIN.left, y: MARGIN.top, w: WIDTH - MARGIN.left - MARGIN.right, h: HEIGHT - MARGIN.top - MARGIN.bottom };

interface Pt {
  readonly x: number;
  readonly y: number;
}

/** A dimension: its lines (extension and dimension lines with arrows) and its text on a cleared box. */
export interface Dimension {
  readonly id: string;
  /** What it measures, in words (a tooltip and the drawing's list of dimensions). */
  readonly meaning: string;
  readonly text: string;
  readonly extensions: readonly { a: Pt; b: Pt }[];
  readonly line: { a: Pt; b: Pt };
  /** The dimension runs on past the drawing's edge (its far end is off the sheet). */
  readonly broken: boolean;
  readonly box: Box;
  readonly textAt: Pt;
  /** Text rotated to read along a vertical dimension line. */
  readonly vertical: boolean;
}

/** The steering link's two points (tie rod, or the five-link's toe link), when the corner has one. */
function steeringLink(corner: Corner): { inner: string; outer: string; name: string } | null {
  const pts = corner.points as Record<string, Vec3 | undefined>;
  if (corner.type === 'five-link') {
    const k = corner.toeLink;
    return pts[`link${k}Inner`] && pts[`link${k}Outer`] ? { inner: `link${k}Inner`, outer: `link${k}Outer`, name: `link ${k} (toe link)` } : null;
  }
  return pts['tieRodInner'] && pts['tieRodOuter'] ? { inner: 'tieRodInner', outer: 'tieRodOuter', name: corner.steered ? 'tie rod' : 'toe link' } : null;
}

/**
 * Scaled drawings of the linkage at the solved pose, in three views: links
 * as lines, points as markers numbered as in the hardpoint table, the wheel
 * and the ground, key dimensions in the user's unit and a scale bar. One
 * scale per view for both directions, so lengths and angles read true.
 * An optional overlay (e.g. points mapped from a CAD frame) is drawn as
 * crosses. Pure drawing: positions come from the engine.
 */
@Component({
  selector: 'rw-linkage-views',
  templateUrl: './linkage-views.html',
  styleUrl: './linkage-views.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LinkageViews {
  readonly corner = input.required<Corner>();
  /** Points where they are at the shown pose (defaults to the design points). */
  readonly posed = input<Readonly<Record<string, Vec3>> | null>(null);
  readonly contactPatch = input<Vec3 | null>(null);
  readonly overlay = input<ReadonlyMap<string, Vec3> | null>(null);
  readonly caption = input<string>('');

  private readonly units = inject(DISPLAY_UNITS);
  protected readonly width = WIDTH;
  protected readonly height = HEIGHT;
  protected readonly inner = INNER;
  protected readonly labelFont = LABEL_FONT;
  protected readonly markerR = MARKER_R;

  private readonly points = computed<Record<string, Vec3>>(() => ({ ...(this.corner().points as Record<string, Vec3>), ...(this.posed() ?? {}) }));

  /** Table number of each linkage point (`points.<name>` → 1-based row of the hardpoint table). */
  private readonly numbers = computed(() => new Map(hardpointRows(this.corner()).map((r, i) => [r.key, i + 1])));

  private length(mm: number): string {
    const u = this.units();
    return `${formatNum(mm, { kind: 'length' }, u)} ${unitLabel('length', u)}`;
  }

  protected readonly views = computed(() => {
    const pts = this.points();
    const corner = this.corner();
    const units = this.units();
    const numbers = this.numbers();
    const radius = corner.wheel.radius;
    const wc = pts['wheelCentre']!;
    const sp = pts['spindle']!;
    // Wheel drawn as its mid-plane outline: a circle of the loaded radius about the spin axis.
    const axis = [wc[0] - sp[0], wc[1] - sp[1], wc[2] - sp[2]];
    const an = Math.hypot(axis[0]!, axis[1]!, axis[2]!) || 1;
    const a: Vec3 = [axis[0]! / an, axis[1]! / an, axis[2]! / an];
    const ref: Vec3 = Math.abs(a[2]) < 0.9 ? [0, 0, 1] : [1, 0, 0];
    const u = cross(a, ref);
    const v = cross(a, u);
    const wheel: Vec3[] = Array.from({ length: 49 }, (_, i) => {
      const t = (i / 48) * 2 * Math.PI;
      return [
        wc[0] + radius * (Math.cos(t) * u[0] + Math.sin(t) * v[0]),
        wc[1] + radius * (Math.cos(t) * u[1] + Math.sin(t) * v[1]),
        wc[2] + radius * (Math.cos(t) * u[2] + Math.sin(t) * v[2]),
      ];
    });
    const links = linkRows(corner).map((l) => ({ name: l.name, from: l.from.split('.')[1]!, to: l.to.split('.')[1]! }));
    const overlay = this.overlay();
    const overlayPts = overlay ? [...overlay].filter(([k]) => k.startsWith('points.')).map(([k, p]) => ({ key: k, p })) : [];
    const steer = steeringLink(corner);
    const contact = this.contactPatch();

    return VIEWS.map((view) => {
      const all = [...Object.values(pts), ...wheel, ...overlayPts.map((o) => o.p)].map(view.project);
      const xs = all.map((q) => q[0]);
      const ys = all.map((q) => q[1]);
      if (view.name !== 'top') ys.push(0); // keep the ground in view
      const [x0, x1] = [Math.min(...xs), Math.max(...xs)];
      const [y0, y1] = [Math.min(...ys), Math.max(...ys)];
      // One scale (drawing units per mm) for both directions, so angles and lengths look true.
      const k = Math.min(INNER.w / Math.max(x1 - x0, 1), INNER.h / Math.max(y1 - y0, 1));
      const cx = (x0 + x1) / 2;
      const cy = (y0 + y1) / 2;
      const sx = (mm: number) => INNER.x + INNER.w / 2 + (mm - cx) * k;
      const sy = (mm: number) => INNER.y + INNER.h / 2 - (mm - cy) * k;
      const at = (p: Vec3): Pt => {
        const [px, py] = view.project(p);
        return { x: sx(px), y: sy(py) };
      };
      const groundY = view.name === 'top' ? null : sy(0);

      // ---- dimensions ----
      const dims: Dimension[] = [];
      const vertical = (id: string, meaning: string, p: Vec3, slot: number) => {
        const q = at(p);
        const lineX = MARGIN.left - 8 - slot * 18;
        const mid = (q.y + groundY!) / 2;
        const text = this.length(p[2]);
        const tb = textBox(text, 0, 0);
        dims.push({
          id,
          meaning,
          text,
          extensions: [{ a: { x: q.x - MARKER_R - 1, y: q.y }, b: { x: lineX - 3, y: q.y } }],
          line: { a: { x: lineX, y: groundY! }, b: { x: lineX, y: q.y } },
          broken: false,
          // Rotated text reads up the line, on its left.
          box: { x: lineX - 2 - tb.h, y: mid - tb.w / 2, w: tb.h, h: tb.w },
          textAt: { x: lineX - 2 - tb.h / 2, y: mid },
          vertical: true,
        });
      };
      if (view.name === 'front' && steer) {
        vertical('inner-height', `Height of the ${steer.name}'s body end above the ground`, pts[steer.inner]!, 0);
        vertical('outer-height', `Height of the ${steer.name}'s upright end above the ground`, pts[steer.outer]!, 1);
      }
      if (view.name === 'side') vertical('centre-height', 'Wheel centre height above the ground', wc, 0);
      if (view.name === 'front' && contact) {
        // Half track: contact patch to the car's centreline (y = 0), usually off the sheet to the viewer's left.
        const c = at(contact);
        const lineY = HEIGHT - MARGIN.bottom + 8;
        const centre = sx(0);
        const broken = centre < 2;
        const far = broken ? 2 : centre;
        const text = `Half track ${this.length(Math.abs(contact[1]))}`;
        const textAt = { x: Math.max((c.x + far) / 2, textBox(text, 0, 0).w / 2 + 2), y: lineY + 10 };
        dims.push({
          id: 'half-track',
          meaning: "Contact patch centre to the car's centreline",
          text,
          extensions: [{ a: { x: c.x, y: c.y + 4 }, b: { x: c.x, y: lineY + 3 } }],
          line: { a: { x: c.x, y: lineY }, b: { x: far, y: lineY } },
          broken,
          box: textBox(text, textAt.x, textAt.y),
          textAt,
          vertical: false,
        });
      }
      if (view.name === 'top' && steer) {
        // Aligned dimension of the steering link, offset to the side away from the wheel.
        const p = at(pts[steer.inner]!);
        const q = at(pts[steer.outer]!);
        const len = Math.hypot(q.x - p.x, q.y - p.y) || 1;
        let n = { x: -(q.y - p.y) / len, y: (q.x - p.x) / len };
        const w = at(wc);
        const mid = { x: (p.x + q.x) / 2, y: (p.y + q.y) / 2 };
        if ((w.x - mid.x) * n.x + (w.y - mid.y) * n.y > 0) n = { x: -n.x, y: -n.y };
        const off = 14;
        const [i3, o3] = [pts[steer.inner]!, pts[steer.outer]!];
        const text = this.length(Math.hypot(o3[0] - i3[0], o3[1] - i3[1], o3[2] - i3[2]));
        const tb = textBox(text, 0, 0);
        const textAt = { x: mid.x + n.x * (off + tb.h), y: mid.y + n.y * (off + tb.h) };
        dims.push({
          id: 'steer-length',
          meaning: `Length of the ${steer.name} (true length, end to end)`,
          text,
          extensions: [
            { a: { x: p.x + n.x * 4, y: p.y + n.y * 4 }, b: { x: p.x + n.x * (off + 3), y: p.y + n.y * (off + 3) } },
            { a: { x: q.x + n.x * 4, y: q.y + n.y * 4 }, b: { x: q.x + n.x * (off + 3), y: q.y + n.y * (off + 3) } },
          ],
          line: { a: { x: p.x + n.x * off, y: p.y + n.y * off }, b: { x: q.x + n.x * off, y: q.y + n.y * off } },
          broken: false,
          box: textBox(text, textAt.x, textAt.y),
          textAt,
          vertical: false,
        });
      }

      // ---- scale bar: a round length in the user's unit, about a third of the drawing's width ----
      const bar = scaleBarLength((INNER.w * 0.3) / k, units);
      const barY = HEIGHT - 10;
      const barPx = bar.mm * k;
      const barText = `${formatNum(bar.shown, { sig: 3 }, 'si')} ${unitLabel('length', units)}`;
      const barTextAt = { x: MARGIN.left + barPx + 6 + textBox(barText, 0, 0).w / 2, y: barY };
      const scale = {
        x1: MARGIN.left,
        x2: MARGIN.left + barPx,
        y: barY,
        text: barText,
        mm: bar.mm,
        textAt: barTextAt,
        box: textBox(barText, barTextAt.x, barTextAt.y),
      };

      // ---- numbered points ----
      const posedPoints = Object.entries(pts).map(([name, p]) => {
        const key = `points.${name}`;
        return { key, name: pointName(key, corner), number: numbers.get(key) ?? null, ...at(p) };
      });
      const fixed: Box[] = [...dims.map((d) => d.box), scale.box, { x: scale.x1, y: barY - 4, w: barPx, h: 8 }];
      const labels = placeLabels(
        posedPoints.filter((p) => p.number !== null).map((p) => ({ key: p.key, text: String(p.number), x: p.x, y: p.y })),
        { x: 0, y: 0, w: WIDTH, h: HEIGHT - MARGIN.bottom },
        fixed,
      ).map((l) => ({ ...l, name: posedPoints.find((p) => p.key === l.key)!.name }));

      return {
        name: view.name,
        title: view.title,
        description: `${view.title} of the ${corner.type} linkage, to scale (scale bar ${barText}); across: ${view.across}, up: ${view.up}; ${links.length} links drawn; points numbered as in the hardpoint table.`,
        ground: groundY,
        wheel: wheel
          .map((p) => {
            const q = at(p);
            return `${q.x.toFixed(2)},${q.y.toFixed(2)}`;
          })
          .join(' '),
        links: links
          .filter((l) => pts[l.from] && pts[l.to])
          .map((l) => ({ name: l.name, a: at(pts[l.from]!), b: at(pts[l.to]!), tie: /Tie rod|Toe link|toe link/.test(l.name) })),
        points: posedPoints,
        labels,
        dims,
        scale,
        /** Drawing units per mm (for checks: the scale bar's length over this is its stated length). */
        k,
        overlay: overlayPts.map((o) => ({ key: o.key, name: pointName(o.key, corner), ...at(o.p) })),
        contact: contact ? at(contact) : null,
      };
    });
  });
}

function cross(a: Vec3, b: Vec3): Vec3 {
  const c: Vec3 = [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
  const n = Math.hypot(c[0], c[1], c[2]) || 1;
  return [c[0] / n, c[1] / n, c[2] / n];
}
