import { AfterViewInit, ChangeDetectionStrategy, Component, computed, DestroyRef, effect, ElementRef, inject, input, output, signal, untracked, viewChild } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatCheckbox } from '@angular/material/checkbox';
import {
  AmbientLight,
  AxesHelper,
  BufferGeometry,
  Color,
  CylinderGeometry,
  DirectionalLight,
  DoubleSide,
  GridHelper,
  Group,
  Mesh,
  MeshLambertMaterial,
  Object3D,
  PerspectiveCamera,
  Quaternion,
  Raycaster,
  Scene,
  SphereGeometry,
  TorusGeometry,
  Vector2,
  Vector3,
  WebGLRenderer,
} from 'three';
import { CSS2DObject, CSS2DRenderer } from 'three/addons/renderers/CSS2DRenderer.js';
import { OrbitControls } from 'three/addons/controls/OrbitControls.js';
import type { Corner, Vec3 } from '../../../../shared/schema/corner';
import { pointName } from '../../../../shared/io/hardpoint-points';
import { AnalysisSuperseded } from '../../workers/kinematics-client';
import { linkagePairs, UPRIGHT_POINT_NAMES } from './linkage-pairs';
import { ViewsClient } from './views-client';
import { DISPLAY_UNITS, NumPipe } from '../../core/format/num-pipe';
import { unitLabel } from '../../core/format/quantities';
import type { LinkagePose } from './views-types';

/** Our palette for the 3D view (reads on screen and in greyscale: body dark, upright mid, selection light and large). */
const COLOURS = {
  background: 0xf3f1ec,
  body: 0x34424f,
  upright: 0xa4532a,
  link: 0x2e6b6e,
  uprightEdge: 0xa4532a,
  selected: 0xe3a21a,
  tyre: 0x4a4f55,
  grid: 0xc9c4b8,
};
const POINT_RADIUS_MM = 7;
const LINK_RADIUS_MM = 3.5;
/** Frames of the travel sweep animation (each way) and its pace. */
const SWEEP_FRAMES = 41;
const FRAME_MS = 60;

/** Whether a WebGL context can be made (software rendering counts), without keeping it. */
function webglAvailable(): boolean {
  if (typeof WebGLRenderingContext === 'undefined') return false;
  try {
    const canvas = document.createElement('canvas');
    return !!(canvas.getContext('webgl2') ?? canvas.getContext('webgl'));
  } catch {
    return false;
  }
}

/**
 * The corner's linkage in 3D (three.js, loaded only when the view is opened):
 * hardpoints labelled, links and upright drawn, wheel and tyre shown, in
 * ISO 8855 vehicle axes (x forward, y left, z up; mm). Orbit with the mouse
 * or touch, zoom with the wheel. It follows the editor's travel and rack;
 * "Animate travel sweep" plays the linkage through the curves' travel range.
 * Picking a point emits its key (`points.lowerOuter`); `selectedKey`
 * highlights one. Without WebGL it says so and draws nothing.
 */
@Component({
  selector: 'rw-linkage-3d',
  imports: [MatButton, MatCheckbox, NumPipe],
  templateUrl: './linkage-3d.html',
  styleUrl: './linkage-3d.scss',
  providers: [ViewsClient],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Linkage3d implements AfterViewInit {
  private readonly engine = inject(ViewsClient);

  readonly corner = input.required<Corner>();
  /** Hardpoints at the editor's pose (left frame, keyed by point name), or null before the first solve. */
  readonly posed = input<Readonly<Record<string, Vec3>> | null>(null);
  readonly contactPatch = input<Vec3 | null>(null);
  readonly travelMm = input<number>(0);
  readonly rackMm = input<number>(0);
  readonly travelRange = input<{ from: number; to: number }>({ from: -25, to: 25 });
  /** Hardpoint table key of the highlighted point (e.g. `points.upperOuter`). */
  readonly selectedKey = input<string | null>(null);
  /** A point picked in the view, by its hardpoint table key. */
  readonly picked = output<string>();

  private readonly host = viewChild.required<ElementRef<HTMLElement>>('stage');

  protected readonly available = signal<boolean | null>(null);
  protected readonly failure = signal<string | null>(null);
  protected readonly labels = signal(true);
  protected readonly animating = signal(false);
  protected readonly animationTravel = signal<number | null>(null);
  private readonly units = inject(DISPLAY_UNITS);
  /** The user's length unit for the pose read-out. */
  protected readonly lengthUnit = computed(() => unitLabel('length', this.units()));
  protected readonly pickedName = computed(() => {
    const k = this.selectedKey();
    return k ? pointName(k, this.corner()) : null;
  });

  private renderer: WebGLRenderer | null = null;
  private labelRenderer: CSS2DRenderer | null = null;
  private scene = new Scene();
  private camera = new PerspectiveCamera(35, 1.6, 5, 20000);
  private controls: OrbitControls | null = null;
  private readonly linkage = new Group();
  private readonly points = new Map<string, Mesh>();
  private readonly pointLabels = new Map<string, CSS2DObject>();
  private readonly links: { a: string; b: string; mesh: Mesh }[] = [];
  private tyre: Group | null = null;
  private resize: ResizeObserver | null = null;
  /** The frame a resize is fitted in, and the size last fitted (a resize that changes nothing draws nothing). */
  private resizeFrame: number | null = null;
  private fitted = '';
  private timer: ReturnType<typeof setInterval> | null = null;
  private framed = false;

  /** The stage element exists once the view is initialised. */
  ngAfterViewInit(): void {
    this.start();
  }

  constructor() {
    // Rebuild when the corner's structure or values change; move when the pose changes.
    effect(() => {
      const corner = this.corner();
      const posed = this.posed();
      const cp = this.contactPatch();
      untracked(() => {
        if (!this.renderer || this.animating()) return;
        this.build(corner);
        this.pose(posed ?? (corner.points), cp);
      });
    });
    effect(() => {
      const key = this.selectedKey();
      untracked(() => this.highlight(key));
    });
    effect(() => {
      const on = this.labels();
      untracked(() => {
        for (const l of this.pointLabels.values()) l.visible = on;
        this.render();
      });
    });
    inject(DestroyRef).onDestroy(() => this.stop());
  }

  private start(): void {
    if (!webglAvailable()) {
      this.available.set(false);
      return;
    }
    const stage = this.host().nativeElement;
    try {
      this.renderer = new WebGLRenderer({ antialias: true, preserveDrawingBuffer: true });
    } catch (error) {
      this.available.set(false);
      this.failure.set(error instanceof Error ? error.message : String(error));
      return;
    }
    this.available.set(true);
    const r = this.renderer;
    r.setPixelRatio(Math.min(2, globalThis.devicePixelRatio || 1));
    r.setClearColor(COLOURS.background);
    r.domElement.setAttribute('role', 'img');
    r.domElement.setAttribute('aria-label', 'Linkage in 3D. Select a point with the mouse; the hardpoint table selects the same point.');
    stage.appendChild(r.domElement);
    this.labelRenderer = new CSS2DRenderer();
    this.labelRenderer.domElement.classList.add('rw-3d-labels');
    stage.appendChild(this.labelRenderer.domElement);

    // ISO 8855: z up.
    this.camera.up.set(0, 0, 1);
    this.scene.background = new Color(COLOURS.background);
    this.scene.add(new AmbientLight(0xffffff, 1.6));
    const sun = new DirectionalLight(0xffffff, 1.6);
    sun.position.set(1500, 2500, 3000);
    this.scene.add(sun);
    this.scene.add(this.linkage);
    const axes = new AxesHelper(150);
    axes.setColors(new Color(0x8c2f39), new Color(0x2e6b6e), new Color(0x34424f));
    this.scene.add(axes);
    for (const [name, at] of [['x forward', [170, 0, 0]], ['y left', [0, 170, 0]], ['z up', [0, 0, 170]]] as const) {
      const el = document.createElement('span');
      el.className = 'rw-3d-axis-label';
      el.textContent = name;
      const o = new CSS2DObject(el);
      o.position.set(at[0], at[1], at[2]);
      this.scene.add(o);
    }

    this.controls = new OrbitControls(this.camera, this.labelRenderer.domElement);
    this.controls.addEventListener('change', () => this.render());
    this.listenForPicks(this.labelRenderer.domElement);
    // Fitted in the next frame, not inside the observer's callback: the canvas height follows the width, so
    // resizing it there would change the observed stage again in the same frame (the browser reports that
    // as an error, "ResizeObserver loop completed with undelivered notifications").
    this.resize = new ResizeObserver(() => {
      if (this.resizeFrame !== null) return;
      this.resizeFrame = requestAnimationFrame(() => {
        this.resizeFrame = null;
        this.fitToView();
      });
    });
    this.resize.observe(stage);
    this.fitToView();
    const corner = this.corner();
    this.build(corner);
    this.pose(this.posed() ?? (corner.points), this.contactPatch());
    this.highlight(this.selectedKey());
  }

  private fitToView(): void {
    const stage = this.host().nativeElement;
    // The stage's own width (the canvas never widens it: max-width 100 %, and the hosts may shrink).
    const w = Math.max(200, Math.floor(stage.getBoundingClientRect().width));
    const h = Math.round(Math.min(560, Math.max(320, w * 0.6)));
    if (this.fitted === `${w}×${h}`) return;
    this.fitted = `${w}×${h}`;
    this.renderer?.setSize(w, h);
    this.labelRenderer?.setSize(w, h);
    this.camera.aspect = w / h;
    this.camera.updateProjectionMatrix();
    this.render();
  }

  private render(): void {
    if (!this.renderer || !this.labelRenderer) return;
    this.renderer.render(this.scene, this.camera);
    this.labelRenderer.render(this.scene, this.camera);
  }

  /** (Re)creates the meshes for the corner's points and links. */
  private build(corner: Corner): void {
    const pts = corner.points as Record<string, Vec3>;
    const names = Object.keys(pts);
    const same = names.length === this.points.size && names.every((n) => this.points.has(n));
    if (!same) {
      for (const child of [...this.linkage.children]) this.dispose(child);
      this.linkage.clear();
      this.points.clear();
      this.pointLabels.clear();
      this.links.length = 0;
      const sphere = new SphereGeometry(POINT_RADIUS_MM, 20, 14);
      for (const name of names) {
        const upright = UPRIGHT_POINT_NAMES.has(name) || /^link[1-5]Outer$/.test(name);
        const mesh = new Mesh(sphere, new MeshLambertMaterial({ color: upright ? COLOURS.upright : COLOURS.body }));
        mesh.userData = { key: `points.${name}`, upright };
        this.points.set(name, mesh);
        this.linkage.add(mesh);
        const el = document.createElement('span');
        el.className = 'rw-3d-label';
        el.dataset['point'] = `points.${name}`;
        el.textContent = pointName(`points.${name}`, corner);
        // Anchored at the point; the style lifts the name 16 px above it (linkage-3d.scss).
        const label = new CSS2DObject(el);
        label.visible = this.labels();
        mesh.add(label);
        this.pointLabels.set(name, label);
      }
      for (const [a, b, kind] of linkagePairs(corner)) {
        if (!(a in pts) || !(b in pts)) continue;
        const r = kind === 'upright' ? LINK_RADIUS_MM * 1.4 : LINK_RADIUS_MM;
        const mesh = new Mesh(new CylinderGeometry(r, r, 1, 12), new MeshLambertMaterial({ color: kind === 'upright' ? COLOURS.uprightEdge : COLOURS.link }));
        this.links.push({ a, b, mesh });
        this.linkage.add(mesh);
      }
      this.tyre = this.makeTyre(corner.wheel.radius);
      this.linkage.add(this.tyre);
      this.framed = false;
    } else if (this.tyre) {
      // A radius edit rebuilds only the tyre.
      const radius = (this.tyre.userData as { radius: number }).radius;
      if (radius !== corner.wheel.radius) {
        this.linkage.remove(this.tyre);
        this.dispose(this.tyre);
        this.tyre = this.makeTyre(corner.wheel.radius);
        this.linkage.add(this.tyre);
      }
    }
    for (const [name, label] of this.pointLabels) (label.element).textContent = pointName(`points.${name}`, corner);
  }

  private makeTyre(radius: number): Group {
    const g = new Group();
    const width = Math.max(80, radius * 0.8);
    // The tyre: a torus squashed along the spin axis (local y), a translucent band so the linkage shows through.
    const tyre = new Mesh(
      new TorusGeometry(radius - width * 0.3, width * 0.3, 16, 64),
      new MeshLambertMaterial({ color: COLOURS.tyre, transparent: true, opacity: 0.16, side: DoubleSide, depthWrite: false }),
    );
    tyre.rotation.x = Math.PI / 2;
    tyre.scale.set(1, 1, (width / (width * 0.6)) * 0.9);
    g.add(tyre);
    const rim = new Mesh(
      new CylinderGeometry(radius * 0.62, radius * 0.62, width * 0.7, 40, 1, true),
      new MeshLambertMaterial({ color: 0x8a8f96, transparent: true, opacity: 0.25, side: DoubleSide, depthWrite: false }),
    );
    g.add(rim);
    g.userData = { radius };
    return g;
  }

  /** Moves every mesh to the pose. */
  private pose(points: Readonly<Record<string, Vec3>>, cp: Vec3 | null): void {
    for (const [name, mesh] of this.points) {
      const p = points[name];
      if (p) mesh.position.set(p[0], p[1], p[2]);
    }
    const up = new Vector3(0, 1, 0);
    for (const { a, b, mesh } of this.links) {
      const pa = points[a];
      const pb = points[b];
      if (!pa || !pb) continue;
      const va = new Vector3(...pa);
      const vb = new Vector3(...pb);
      const d = vb.clone().sub(va);
      const len = d.length();
      mesh.position.copy(va).add(vb).multiplyScalar(0.5);
      mesh.scale.set(1, Math.max(len, 1e-3), 1);
      mesh.quaternion.copy(new Quaternion().setFromUnitVectors(up, d.normalize()));
    }
    const wc = points['wheelCentre'];
    const sp = points['spindle'];
    if (this.tyre && wc && sp) {
      // Local y of the tyre group along the spin axis (outboard).
      const axis = new Vector3(wc[0] - sp[0], wc[1] - sp[1], wc[2] - sp[2]).normalize();
      this.tyre.position.set(wc[0], wc[1], wc[2]);
      this.tyre.quaternion.copy(new Quaternion().setFromUnitVectors(up, axis));
    }
    if (!this.framed) this.frame(points, cp);
    this.render();
  }

  /** Points the camera at the linkage from ahead, above and outboard (left front). */
  private frame(points: Readonly<Record<string, Vec3>>, cp: Vec3 | null): void {
    const all = Object.values(points);
    if (all.length === 0) return;
    const centre = new Vector3();
    for (const p of all) centre.add(new Vector3(...p));
    centre.multiplyScalar(1 / all.length);
    let span = 0;
    for (const p of all) span = Math.max(span, centre.distanceTo(new Vector3(...p)));
    span = Math.max(span, this.corner().wheel.radius) * 1.15;
    // About 3.3 spans away with the 35° field of view: the linkage fills most of the stage.
    this.camera.position.set(centre.x + span * 2.0, centre.y + span * 2.3, centre.z + span * 1.2);
    this.controls?.target.copy(centre);
    this.controls?.update();
    // The ground under the wheel.
    const z = cp ? cp[2] : 0;
    const grid = new GridHelper(2000, 20, COLOURS.grid, COLOURS.grid);
    grid.rotation.x = Math.PI / 2;
    grid.position.set(centre.x, centre.y, z);
    grid.name = 'ground';
    const old = this.scene.getObjectByName('ground');
    if (old) {
      this.scene.remove(old);
      this.dispose(old);
    }
    this.scene.add(grid);
    this.framed = true;
  }

  private highlight(key: string | null): void {
    for (const [name, mesh] of this.points) {
      const on = key === `points.${name}`;
      const upright = (mesh.userData as { upright: boolean }).upright;
      (mesh.material as MeshLambertMaterial).color.setHex(on ? COLOURS.selected : upright ? COLOURS.upright : COLOURS.body);
      mesh.scale.setScalar(on ? 1.8 : 1);
      this.pointLabels.get(name)?.element.classList.toggle('rw-3d-label-selected', on);
    }
    this.render();
  }

  /** A click without a drag picks the nearest point under the pointer. */
  private listenForPicks(el: HTMLElement): void {
    let down: { x: number; y: number } | null = null;
    el.addEventListener('pointerdown', (e) => (down = { x: e.clientX, y: e.clientY }));
    el.addEventListener('pointerup', (e) => {
      if (!down || Math.hypot(e.clientX - down.x, e.clientY - down.y) > 4) return;
      down = null;
      const key = this.pickAt(e.clientX, e.clientY);
      if (key) this.picked.emit(key);
    });
  }

  /** The hardpoint key under a screen position, or null (public for tests of the wiring). */
  pickAt(clientX: number, clientY: number): string | null {
    if (!this.renderer) return null;
    const rect = this.renderer.domElement.getBoundingClientRect();
    const ndc = new Vector2(((clientX - rect.left) / rect.width) * 2 - 1, -((clientY - rect.top) / rect.height) * 2 + 1);
    const ray = new Raycaster();
    ray.setFromCamera(ndc, this.camera);
    const hits = ray.intersectObjects([...this.points.values()], false);
    const hit = hits[0]?.object;
    return hit ? ((hit.userData as { key: string }).key ?? null) : null;
  }

  protected async toggleAnimation(): Promise<void> {
    if (this.animating()) {
      this.stopAnimation();
      return;
    }
    const { from, to } = this.travelRange();
    const travels = Array.from({ length: SWEEP_FRAMES }, (_, i) => from + ((to - from) * i) / (SWEEP_FRAMES - 1));
    this.animating.set(true);
    let poses: readonly LinkagePose[];
    try {
      poses = (await this.engine.poses({ corner: this.corner(), travelsMm: travels, rackMm: this.rackMm() })).poses;
    } catch (error) {
      if (!(error instanceof AnalysisSuperseded)) this.failure.set(error instanceof Error ? error.message : String(error));
      this.animating.set(false);
      return;
    }
    if (!this.animating()) return;
    const loop = [...poses, ...[...poses].reverse().slice(1, -1)];
    let i = 0;
    this.timer = setInterval(() => {
      const p = loop[i % loop.length]!;
      this.animationTravel.set(Math.round(p.travelMm * 10) / 10);
      this.pose(p.points, p.contactPatch);
      i++;
    }, FRAME_MS);
  }

  private stopAnimation(): void {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    this.animating.set(false);
    this.animationTravel.set(null);
    const corner = this.corner();
    this.pose(this.posed() ?? (corner.points), this.contactPatch());
  }

  protected resetView(): void {
    this.framed = false;
    const corner = this.corner();
    this.pose(this.posed() ?? (corner.points), this.contactPatch());
  }

  private dispose(o: Object3D): void {
    o.traverse((c) => {
      if (c instanceof Mesh) {
        (c.geometry as BufferGeometry).dispose();
        const m = c.material as MeshLambertMaterial | MeshLambertMaterial[];
        (Array.isArray(m) ? m : [m]).forEach((x) => x.dispose());
      }
      if (c instanceof CSS2DObject) c.element.remove();
    });
  }

  private stop(): void {
    if (this.timer) clearInterval(this.timer);
    this.resize?.disconnect();
    if (this.resizeFrame !== null) cancelAnimationFrame(this.resizeFrame);
    this.controls?.dispose();
    this.dispose(this.scene);
    this.renderer?.dispose();
    this.renderer?.forceContextLoss();
    this.renderer = null;
  }
}
