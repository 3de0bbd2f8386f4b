import { ChangeDetectionStrategy, Component, computed, effect, inject, input, OnInit, signal, untracked } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatCheckbox } from '@angular/material/checkbox';
import { rxResource } from '@angular/core/rxjs-interop';
import { firstValueFrom } from 'rxjs';
import type { Corner } from '../../../../shared/schema/corner';
import type { OutputCurveAxis } from '../../../../shared/kinematics/output-curves';
import { LineChart } from '../../charts/line-chart';
import type { AxisSpec, LineSeries } from '../../charts/chart-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { formatNum } from '../../core/format/num';
import { inDisplayUnits, unitLabel } from '../../core/format/quantities';
import { apiProblem } from '../../core/http/api-error';
import { loadState } from '../../core/http/load-state';
import { RigApi, type RigMeasurementDetail } from '../rig/rig-api';
import { LocalTimePipe } from '../../core/time/local-time';
import { AnalysisError, AnalysisSuperseded } from '../../workers/kinematics-client';
import { failureWords } from '../../workers/failure-words';
import { ConfigurationsApi } from '../configurations/configurations-api';
import { FeaturesApi, type Proposal, type RevisionRow } from '../features-api';
import { DEFAULT_OUTPUTS, outputDefs, SWEEP_AXES, type OutputDef } from './output-defs';
import { ViewsClient } from './views-client';
import type { CurveSource, CurvesReply, CurvesRequest } from './views-types';
import type { AxleName } from '../../../../shared/schema/axle';

/** Roll range of the roll axis, deg (a hard cornering car rolls a few degrees). */
const ROLL_RANGE = { from: -3, to: 3, step: 0.5 };
/** At most this many geometries on one chart (the line chart tells six apart by dash and marker). */
const MAX_SOURCES = 6;

/** What the engine was asked (the request without its kind). */
type CurvesAsk = Omit<CurvesRequest, 'kind'>;
/** The curves on screen always travel with the request that produced them. */
interface Solved {
  readonly request: CurvesAsk;
  readonly reply: CurvesReply;
}
type LoadState =
  | { readonly kind: 'loading' }
  | { readonly kind: 'ready'; readonly reply: CurvesReply; readonly request: CurvesAsk }
  | { readonly kind: 'error'; readonly message: string };

/**
 * Every per-pose output of the axle as a curve against wheel travel, rack
 * travel or body roll. The user picks the outputs and the sweep axis and
 * overlays saved revisions, open proposals and the rig measurements of the
 * design (as measured, on the toe and camber charts against wheel travel).
 * What is drawn is always the answer to the request that produced it: the
 * axis, range and held pose are read from that request, and the charts are
 * marked out of date while newer inputs are solving or after they failed.
 * The engine runs in the views worker; this component only arranges series.
 */
@Component({
  selector: 'rw-output-curves',
  imports: [LineChart, MatButton, MatCheckbox, MatButtonToggleGroup, MatButtonToggle, LocalTimePipe],
  templateUrl: './output-curves.html',
  styleUrl: './output-curves.scss',
  providers: [ViewsClient],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutputCurves implements OnInit {
  private readonly engine = inject(ViewsClient);
  private readonly api = inject(FeaturesApi);
  private readonly configs = inject(ConfigurationsApi);
  private readonly rigApi = inject(RigApi);

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
  /** The last answer that solved, with its request (kept on screen, marked out of date, while newer inputs solve or fail). */
  private readonly solved = signal<Solved | null>(null);
  /** A newer request is running; the curves shown are those of the previous inputs until it answers. */
  protected readonly solving = signal(false);
  /** The curves on screen are not those of the current inputs. */
  protected readonly outOfDate = computed(() => this.solved() !== null && (this.solving() || this.state().kind === 'error'));

  /** Rig measurements of this design (read from the rig API), offered as overlays. */
  private readonly rigList = rxResource({
    params: () => ({ teamId: this.teamId(), designId: this.designId() }),
    stream: ({ params: p }) => this.rigApi.list(p.teamId, { designId: p.designId }),
  });
  protected readonly rigs = loadState(this.rigList);
  protected readonly rigCount = computed(() => {
    const r = this.rigs();
    return r.status === 'ready' ? r.value.length : 0;
  });
  /** Rig measurements drawn (ids), and their points once loaded. */
  protected readonly rigShown = signal<ReadonlySet<string>>(new Set());
  private readonly rigDetails = signal<ReadonlyMap<string, RigMeasurementDetail>>(new Map());

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
  protected readonly overlayCount = computed(() => this.overlays().size + this.rigShown().size);
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

  /** One chart per chosen output that applies to the axis the shown curves were solved along. */
  protected readonly charts = computed(() => {
    const solved = this.solved();
    if (!solved) return [];
    const axis = solved.request.axis;
    return this.defs()
      .filter((d) => this.chosen().has(d.key) && (!d.onlyAxis || d.onlyAxis === axis))
      .map((d) => {
        const series: LineSeries[] = [];
        const missing: string[] = [];
        const x = this.shownValue(SWEEP_AXES[axis].x);
        const y = this.shownValue(d.y);
        for (const c of solved.reply.curves) {
          if (!c.rows) continue;
          const points = c.rows.filter((r) => r[d.key] !== null && Number.isFinite(r[d.key] as number)).map((r) => ({ x: x(r.x), y: y(r[d.key] as number) }));
          if (points.length > 0) series.push({ name: c.label, points });
          else missing.push(c.label);
        }
        // Rig measurements: toe and camber against wheel travel, as measured.
        if (axis === 'travel' && (d.key === 'toeDeg' || d.key === 'camberDeg')) {
          for (const id of this.rigShown()) {
            const m = this.rigDetails().get(id);
            if (!m) continue;
            const points = m.points
              .filter((p) => (d.key === 'toeDeg' ? true : p.camberDeg !== null))
              .map((p) => ({ x: x(p.travelMm), y: d.key === 'toeDeg' ? p.toeDeg : p.camberDeg! }))
              .sort((a, b) => a.x - b.x);
            if (points.length > 0) series.push({ name: this.rigLabel(m), points, style: 'points' });
          }
        }
        return { def: d, y: this.shownAxis(d.y), series, missing };
      });
  });

  protected readonly failures = computed(() => {
    const s = this.solved();
    return s ? s.reply.curves.filter((c) => c.failure).map((c) => `${c.label}: ${failureWords(c.failure!, this.units())}`) : [];
  });
  protected readonly vehicleNote = computed(() => this.solved()?.reply.vehicleNote ?? null);
  protected readonly xAxis = computed(() => this.shownAxis(SWEEP_AXES[this.solved()?.request.axis ?? this.axis()].x));
  /** What the shown curves were swept over and what was held, from the request that produced them. */
  protected readonly heldAt = computed(() => {
    const r = this.solved()?.request;
    if (!r) return '';
    const u = this.units();
    const lu = unitLabel('length', u);
    const len = (mm: number) => formatNum(mm, { kind: 'length' }, u);
    if (r.axis === 'steer') return `Rack over its whole stroke; both wheels at ${len(r.travelMm)} ${lu} travel.`;
    if (r.axis === 'roll') return `Swept over ${formatNum(r.range.from, { decimals: 1 })} to ${formatNum(r.range.to, { decimals: 1 })} deg of body roll; rack at ${len(r.rackMm)} ${lu}.`;
    // The travels actually solved (the last step may stop short of the range's end).
    const xs = (this.solved()?.reply.curves ?? []).flatMap((c) => (c.rows ?? []).map((row) => row.x));
    const [from, to] = xs.length > 0 ? [Math.min(...xs), Math.max(...xs)] : [r.range.from, r.range.to];
    return `Swept over ${len(from)} to ${len(to)} ${lu} of wheel travel; rack at ${len(r.rackMm)} ${lu}.`;
  });
  /** The rig files drawn, when measured at another rack position than the curves'. */
  protected readonly rigRackNotes = computed(() => {
    const r = this.solved()?.request;
    if (!r || r.axis !== 'travel') return [];
    const u = this.units();
    const len = (mm: number) => `${formatNum(mm, { kind: 'length' }, u)} ${unitLabel('length', u)}`;
    return [...this.rigShown()]
      .map((id) => this.rigDetails().get(id))
      .filter((m): m is RigMeasurementDetail => !!m && m.rackMm !== r.rackMm)
      .map((m) => `${m.name} was measured at rack ${len(m.rackMm)}; the curves are at rack ${len(r.rackMm)}.`);
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

  protected async toggleRig(id: string, on: boolean): Promise<void> {
    const next = new Set(this.rigShown());
    if (!on) {
      next.delete(id);
      this.rigShown.set(next);
      return;
    }
    if (this.overlayCount() >= this.maxOverlays) return;
    this.overlayError.set(null);
    try {
      if (!this.rigDetails().has(id)) {
        const detail = await firstValueFrom(this.rigApi.get(this.teamId(), id));
        this.rigDetails.set(new Map(this.rigDetails()).set(id, detail));
      }
      this.rigShown.set(new Set([...this.rigShown(), id]));
    } catch (error) {
      this.overlayError.set(`The rig measurement could not be loaded: ${apiProblem(error).message}`);
    }
  }

  protected rigLabel(m: { readonly name: string; readonly side: 'left' | 'right' }): string {
    return `Rig: ${m.name} (${m.side} wheel, as measured)`;
  }

  protected isRigShown(id: string): boolean {
    return this.rigShown().has(id);
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

  private async solve(request: CurvesAsk): Promise<void> {
    this.solving.set(true);
    try {
      const reply = await this.engine.curves(request);
      this.state.set({ kind: 'ready', reply, request });
      this.solved.set({ request, reply });
      this.solving.set(false);
    } catch (error) {
      if (error instanceof AnalysisSuperseded) return;
      this.state.set({ kind: 'error', message: error instanceof AnalysisError ? failureWords(error.failure, this.units()) : String(error) });
      this.solving.set(false);
    }
  }
}
