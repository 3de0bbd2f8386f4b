import { ChangeDetectionStrategy, Component, computed, effect, inject, input, OnInit, signal, untracked } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatCheckbox } from '@angular/material/checkbox';
import { firstValueFrom } from 'rxjs';
import type { Corner } from '../../../../shared/schema/corner';
import type { OutputCurveAxis } from '../../../../shared/kinematics/output-curves';
import { LineChart } from '../../charts/line-chart';
import type { AxisSpec, LineSeries } from '../../charts/chart-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { formatNum } from '../../core/format/num';
import { inDisplayUnits, unitLabel } from '../../core/format/quantities';
import { apiProblem } from '../../core/http/api-error';
import { AnalysisError, AnalysisSuperseded } from '../../workers/kinematics-client';
import { ConfigurationsApi } from '../configurations/configurations-api';
import { FeaturesApi, type Proposal, type RevisionRow } from '../features-api';
import { DEFAULT_OUTPUTS, outputDefs, SWEEP_AXES, type OutputDef } from './output-defs';
import { ViewsClient } from './views-client';
import type { CurveSource, CurvesReply } from './views-types';
import type { AxleName } from '../../../../shared/schema/axle';

/** Roll range of the roll axis, deg (a hard cornering car rolls a few degrees). */
const ROLL_RANGE = { from: -3, to: 3, step: 0.5 };
/** At most this many geometries on one chart (the line chart tells six apart by dash and marker). */
const MAX_SOURCES = 6;

type LoadState = { readonly kind: 'loading' } | { readonly kind: 'ready'; readonly reply: CurvesReply } | { readonly kind: 'error'; readonly message: string };

/**
 * Every per-pose output of the axle as a curve against wheel travel, rack
 * travel or body roll. The user picks the outputs and the sweep axis and
 * overlays saved revisions and open proposals on the design being edited.
 * The engine runs in the views worker; this component only arranges series.
 */
@Component({
  selector: 'rw-output-curves',
  imports: [LineChart, MatButton, MatCheckbox, MatButtonToggleGroup, MatButtonToggle],
  templateUrl: './output-curves.html',
  styleUrl: './output-curves.scss',
  providers: [ViewsClient],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutputCurves implements OnInit {
  private readonly engine = inject(ViewsClient);
  private readonly api = inject(FeaturesApi);
  private readonly configs = inject(ConfigurationsApi);

  readonly corner = input.required<Corner>();
  readonly axle = input<AxleName>('front');
  readonly teamId = input.required<string>();
  readonly designId = input.required<string>();
  readonly vehicleId = input.required<string>();
  /** The saved revision the editor started from, and whether the corner has unsaved edits. */
  readonly revision = input.required<number>();
  readonly dirty = input<boolean>(false);
  readonly revisions = input<readonly RevisionRow[]>([]);
  readonly proposals = input<readonly Proposal[]>([]);
  /** Travel range of the editor's curves, mm. */
  readonly travelRange = input<{ from: number; to: number; step: number }>({ from: -25, to: 25, step: 2.5 });
  /** The editor's pose: rack held in travel and roll sweeps, travel held in the rack sweep. */
  readonly rackMm = input<number>(0);
  readonly travelMm = input<number>(0);

  protected readonly axes = (['travel', 'steer', 'roll'] as const).map((k) => ({ key: k, ...SWEEP_AXES[k] }));
  protected readonly axis = signal<OutputCurveAxis>('travel');
  protected readonly chosen = signal<ReadonlySet<string>>(new Set(DEFAULT_OUTPUTS));
  /** Overlays: `r:<revision>` or `p:<proposal id>`. */
  protected readonly overlays = signal<ReadonlySet<string>>(new Set());
  protected readonly overlayError = signal<string | null>(null);
  private readonly overlayCorners = signal<ReadonlyMap<string, Corner>>(new Map());
  private readonly vehicleData = signal<unknown>(null);
  protected readonly state = signal<LoadState>({ kind: 'loading' });
  /** A newer request is running; the curves shown are those of the previous inputs until it answers. */
  protected readonly solving = signal(false);

  protected readonly defs = computed(() => outputDefs(this.axle()));
  protected readonly groups = computed(() => {
    const out: { name: string; defs: OutputDef[] }[] = [];
    for (const d of this.defs()) {
      const g = out.find((x) => x.name === d.group);
      if (g) g.defs.push(d);
      else out.push({ name: d.group, defs: [d] });
    }
    return out;
  });
  protected readonly steered = computed(() => this.corner().steered);
  protected readonly otherRevisions = computed(() => this.revisions().filter((r) => this.dirty() || r.revision !== this.revision()));
  protected readonly overlayCount = computed(() => this.overlays().size);
  protected readonly maxOverlays = MAX_SOURCES - 1;

  private readonly sources = computed<CurveSource[]>(() => {
    const current: CurveSource = {
      id: 'current',
      label: this.dirty() ? `Revision ${this.revision()} with unsaved edits` : `Revision ${this.revision()} (shown)`,
      corner: this.corner(),
    };
    const extra: CurveSource[] = [];
    const corners = this.overlayCorners();
    for (const id of this.overlays()) {
      const c = corners.get(id);
      if (!c) continue;
      extra.push({ id, label: this.overlayLabel(id), corner: c });
    }
    return [current, ...extra];
  });

  /** One chart per chosen output that applies to the axis. */
  protected readonly charts = computed(() => {
    const s = this.state();
    if (s.kind !== 'ready') return [];
    const axis = this.axis();
    return this.defs()
      .filter((d) => this.chosen().has(d.key) && (!d.onlyAxis || d.onlyAxis === axis))
      .map((d) => {
        const series: LineSeries[] = [];
        const missing: string[] = [];
        const x = this.shownValue(SWEEP_AXES[axis].x);
        const y = this.shownValue(d.y);
        for (const c of s.reply.curves) {
          if (!c.rows) continue;
          const points = c.rows.filter((r) => r[d.key] !== null && Number.isFinite(r[d.key] as number)).map((r) => ({ x: x(r.x), y: y(r[d.key] as number) }));
          if (points.length > 0) series.push({ name: c.label, points });
          else missing.push(c.label);
        }
        return { def: d, y: this.shownAxis(d.y), series, missing };
      });
  });

  protected readonly failures = computed(() => {
    const s = this.state();
    return s.kind === 'ready' ? s.reply.curves.filter((c) => c.failure).map((c) => `${c.label}: ${c.failure!.message}`) : [];
  });
  protected readonly vehicleNote = computed(() => {
    const s = this.state();
    return s.kind === 'ready' ? s.reply.vehicleNote : null;
  });
  protected readonly xAxis = computed(() => this.shownAxis(SWEEP_AXES[this.axis()].x));
  protected readonly heldAt = computed(() => {
    const u = this.units();
    const len = (mm: number) => `${formatNum(mm, { kind: 'length' }, u)} ${unitLabel('length', u)}`;
    return this.axis() === 'steer' ? `Both wheels at ${len(this.travelMm())} travel; rack over its whole stroke.` : `Rack at ${len(this.rackMm())}.`;
  });

  private readonly units = inject(DISPLAY_UNITS);

  /** An axis in the user's unit system: a length in mm becomes inches for an inch-pound user. */
  private shownAxis(a: AxisSpec): AxisSpec {
    return a.unit === 'mm' ? { ...a, unit: unitLabel('length', this.units()) } : a;
  }

  /** How a value of that axis is shown (lengths converted, everything else as the engine gives it). */
  private shownValue(a: AxisSpec): (v: number) => number {
    const u = this.units();
    return a.unit === 'mm' ? (v) => inDisplayUnits(v, 'length', u) : (v) => v;
  }

  ngOnInit(): void {
    void this.loadVehicle();
  }

  constructor() {
    effect(() => {
      const request = {
        sources: this.sources(),
        axis: this.axis(),
        range: this.axis() === 'roll' ? ROLL_RANGE : this.travelRange(),
        rackMm: this.rackMm(),
        travelMm: this.travelMm(),
        axle: this.axle(),
        vehicleData: this.vehicleData(),
      };
      untracked(() => void this.solve(request));
    });
    // Off a steered axle there is no rack sweep.
    effect(() => {
      if (!this.steered() && untracked(this.axis) === 'steer') this.axis.set('travel');
    });
  }

  protected setAxis(value: unknown): void {
    if (value === 'travel' || value === 'steer' || value === 'roll') this.axis.set(value);
  }

  /** Back to the first three outputs (toe, camber, roll centre height). */
  protected usualOutputs(): void {
    this.chosen.set(new Set(DEFAULT_OUTPUTS));
  }

  protected toggleOutput(key: string, on: boolean): void {
    const next = new Set(this.chosen());
    if (on) next.add(key);
    else next.delete(key);
    this.chosen.set(next);
  }

  protected async toggleOverlay(id: string, on: boolean): Promise<void> {
    const next = new Set(this.overlays());
    if (!on) {
      next.delete(id);
      this.overlays.set(next);
      return;
    }
    if (next.size >= this.maxOverlays) return;
    this.overlayError.set(null);
    try {
      if (!this.overlayCorners().has(id)) {
        const corner = await this.fetchOverlay(id);
        this.overlayCorners.set(new Map(this.overlayCorners()).set(id, corner));
      }
      this.overlays.set(new Set([...this.overlays(), id]));
    } catch (error) {
      this.overlayError.set(`${this.overlayLabel(id)} could not be loaded: ${apiProblem(error).message}`);
    }
  }

  private async fetchOverlay(id: string): Promise<Corner> {
    if (id.startsWith('r:')) {
      const rev = Number(id.slice(2));
      return (await firstValueFrom(this.configs.designRevision(this.teamId(), this.designId(), rev))).corner;
    }
    const pid = id.slice(2);
    const listed = this.proposals().find((p) => p.id === pid);
    if (listed?.corner) return listed.corner;
    const p = await firstValueFrom(this.api.proposal(this.teamId(), this.designId(), pid));
    if (!p.corner) throw new Error('the proposal carries no geometry');
    return p.corner;
  }

  protected overlayLabel(id: string): string {
    if (id.startsWith('r:')) return `Revision ${id.slice(2)}`;
    const p = this.proposals().find((x) => x.id === id.slice(2));
    return `Proposal${p?.authorName ? ' by ' + p.authorName : ''} on revision ${p?.baseRevision ?? '?'}`;
  }

  protected isChosen(key: string): boolean {
    return this.chosen().has(key);
  }

  protected isOverlaid(id: string): boolean {
    return this.overlays().has(id);
  }

  private async loadVehicle(): Promise<void> {
    try {
      this.vehicleData.set((await firstValueFrom(this.api.vehicle(this.teamId(), this.vehicleId()))).data);
    } catch {
      this.vehicleData.set(null);
    }
  }

  private async solve(request: Parameters<ViewsClient['curves']>[0]): Promise<void> {
    this.solving.set(true);
    try {
      const reply = await this.engine.curves(request);
      this.state.set({ kind: 'ready', reply });
      this.solving.set(false);
    } catch (error) {
      if (error instanceof AnalysisSuperseded) return;
      this.state.set({ kind: 'error', message: error instanceof AnalysisError ? error.failure.message : String(error) });
      this.solving.set(false);
    }
  }
}
