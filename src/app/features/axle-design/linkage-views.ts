import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { scaleLinear } from 'd3';
import type { Corner, Vec3 } from '../../../../shared/schema/corner';
import { linkRows, pointName } from './hardpoint-model';

type ViewName = 'front' | 'side' | 'top';

interface ViewSpec {
  readonly name: ViewName;
  readonly title: string;
  readonly across: string;
  readonly up: string;
  /** Screen (right, up) of a vehicle point, mm. */
  readonly project: (p: Vec3) => [number, number];
}

// Front view: seen from ahead, the car's left (+y) is on the viewer's right.
// Side view: seen from the left, forward (+x) is on the viewer's left.
// Top view: seen from above with forward up, the car's left is on the viewer's left.
const VIEWS: readonly ViewSpec[] = [
  { name: 'front', title: 'Front view', across: 'y (left)', up: 'z', project: (p) => [p[1], p[2]] },
  { name: 'side', title: 'Side view, from the left', across: 'x (forward to the left)', up: 'z', project: (p) => [-p[0], p[2]] },
  { name: 'top', title: 'Top view', across: 'y (left to the left)', up: 'x (forward)', project: (p) => [-p[1], p[0]] },
];

const WIDTH = 300;
const HEIGHT = 230;
const PAD = 14;

/**
 * Front, side and top drawings of the linkage at the solved pose: links as
 * lines, points as dots with their names, the wheel and the ground. An
 * optional overlay (e.g. points mapped from a CAD frame) is drawn as crosses
 * over the current points. Pure drawing: positions come from the engine.
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

  protected readonly width = WIDTH;
  protected readonly height = HEIGHT;

  private readonly points = computed<Record<string, Vec3>>(
    () => ({ ...(this.corner().points as Record<string, Vec3>), ...(this.posed() ?? {}) }),
  );

  protected readonly views = computed(() => {
    const pts = this.points();
    const corner = this.corner();
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

    return VIEWS.map((view) => {
      const all = [...Object.values(pts), ...wheel, ...overlayPts.map((o) => o.p)].map(view.project);
      const xs = all.map((q) => q[0]);
      const ys = all.map((q) => q[1]);
      if (view.name !== 'top') ys.push(0); // keep the ground in view
      const [x0, x1] = [Math.min(...xs), Math.max(...xs)];
      const [y0, y1] = [Math.min(...ys), Math.max(...ys)];
      // One scale for both directions, so angles and lengths look true.
      const k = Math.min((WIDTH - 2 * PAD) / Math.max(x1 - x0, 1), (HEIGHT - 2 * PAD) / Math.max(y1 - y0, 1));
      const cx = (x0 + x1) / 2;
      const cy = (y0 + y1) / 2;
      const sx = scaleLinear().domain([cx - WIDTH / 2 / k, cx + WIDTH / 2 / k]).range([0, WIDTH]);
      const sy = scaleLinear().domain([cy - HEIGHT / 2 / k, cy + HEIGHT / 2 / k]).range([HEIGHT, 0]);
      const at = (p: Vec3) => {
        const [px, py] = view.project(p);
        return { x: sx(px), y: sy(py) };
      };
      return {
        name: view.name,
        title: view.title,
        description: `${view.title} of the ${corner.type} linkage; across: ${view.across}, up: ${view.up}; ${links.length} links drawn.`,
        ground: view.name === 'top' ? null : sy(0),
        wheel: wheel.map((p) => {
          const q = at(p);
          return `${q.x.toFixed(2)},${q.y.toFixed(2)}`;
        }).join(' '),
        links: links
          .filter((l) => pts[l.from] && pts[l.to])
          .map((l) => ({ name: l.name, a: at(pts[l.from]!), b: at(pts[l.to]!), tie: /Tie rod|Toe link|toe link/.test(l.name) })),
        points: Object.entries(pts).map(([key, p]) => ({ key, name: pointName(`points.${key}`, corner), ...at(p) })),
        overlay: overlayPts.map((o) => ({ key: o.key, name: pointName(o.key, corner), ...at(o.p) })),
        contact: this.contactPatch() ? at(this.contactPatch()!) : null,
      };
    });
  });
}

function cross(a: Vec3, b: Vec3): Vec3 {
  const c: Vec3 = [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
  const n = Math.hypot(c[0], c[1], c[2]) || 1;
  return [c[0] / n, c[1] / n, c[2] / n];
}
