import { ChangeDetectionStrategy, Component, computed, effect, inject, input, linkedSignal, signal, untracked } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { DEFAULT_TRACK_PROFILE, trackProfiles, type TrackProfileId } from '../../../../shared/tracks/profiles';
import type { Corner, Vec3 } from '../../../../shared/schema/corner';
import { LineSeries } from '../../charts/chart-types';
import { downloadText, fileNameFor } from '../../charts/csv';
import { LineChart } from '../../charts/line-chart';
import { DISPLAY_UNITS, NumPipe } from '../../core/format/num-pipe';
import { formatNum } from '../../core/format/num';
import { inDisplayUnits, unitLabel } from '../../core/format/quantities';
import { failureWords } from '../../workers/failure-words';
import { TeamAccess } from '../../core/teams/team-access';
import type { AnalysisFailure, AnalysisRequest, CornerAnalysis } from '../../workers/analysis-types';
import { AnalysisError, AnalysisSuperseded, KinematicsClient } from '../../workers/kinematics-client';
import { RigMeasurementsPanel } from '../rig/rig-measurements-panel';
import { rollSteerWords } from '../../../../shared/balance/roll-steer-words';
import { SafetyCaution } from '../safety-caution';
import { AxleDesignStore } from './axle-design-store';
import { DesignProposals } from './design-proposals';
import { HardpointImport } from './hardpoint-import';
import { hardpointCsv, hardpointJson } from './hardpoint-io';
import { HardpointTable, PointEdit } from './hardpoint-table';
import { SaveConflict } from './save-conflict';
import { Linkage3dPanel } from '../linkage-view/linkage-3d-panel';
import { OutputCurvesPanel } from '../linkage-view/output-curves-panel';
import { checkTravelRange, type TravelRange } from './sweep-settings';
import { CostStage } from './cost-stage';
import { GeometryDrawings } from './geometry-drawings';
import { CornerSettings } from './corner-settings';
import { CornerMounts } from './corner-mounts';
import { revisionAuthor } from '../features-api';
import { SectionNav, type PageSection } from '../../core/layout/section-nav';
import { LocalTimePipe } from '../../core/time/local-time';

const ROLL_RANGE = { from: -3, to: 3, step: 0.25 };

function travelStorageKey(designId: string): string {
  return `rollwise.travel.${designId}`;
}

function profileStorageKey(designId: string): string {
  return `rollwise.cautionProfile.${designId}`;
}

/** The editor's four stages, in the order a design is worked, then its history. */
export const EDITOR_STAGES: readonly PageSection[] = [
  { id: 'rw-stage-intent', label: '1 Intent' },
  { id: 'rw-stage-geometry', label: '2 Geometry' },
  { id: 'rw-stage-proof', label: '3 Proof' },
  { id: 'rw-stage-cost', label: '4 Cost' },
  { id: 'rw-revisions-title', label: 'Revisions' },
];

const DEFAULT_TRAVEL: TravelRange = { from: -25, to: 25, step: 2.5 };

/** The travel range last used on this design in this browser, if it is still usable. */
function storedTravel(designId: string): TravelRange {
  const stored = globalThis.localStorage?.getItem(travelStorageKey(designId));
  if (!stored) return DEFAULT_TRAVEL;
  const [from, to, step] = stored.split(',').map(Number);
  const range = { from: from ?? NaN, to: to ?? NaN, step: step ?? NaN };
  return checkTravelRange(range) === null ? range : DEFAULT_TRAVEL;
}

function storedProfile(designId: string): TrackProfileId | null {
  const profile = globalThis.localStorage?.getItem(profileStorageKey(designId));
  return profile && profile in trackProfiles ? (profile as TrackProfileId) : null;
}

/**
 * Axle design editor, laid out as the four stages of the job (intent →
 * geometry → proof → cost, navigable from the section bar), with the
 * corner's hardpoints and live kinematics. Every
 * committed edit re-solves in the Web Worker and redraws the views, charts
 * and fitted numbers without a server round trip; saving stores a new
 * revision against the revision the edit started from. The editor store
 * (AxleDesignStore, one per page) owns the design, the edit history and the save.
 */
@Component({
  selector: 'rw-axle-design-page',
  imports: [
    NumPipe,
    LocalTimePipe,
    RouterLink,
    MatButton,
    MatProgressBar,
    HardpointTable,
    HardpointImport,
    MatFormField,
    MatLabel,
    MatInput,
    SectionNav,
    GeometryDrawings,
    CornerSettings,
    CornerMounts,
    CostStage,
    LineChart,
    SafetyCaution,
    RigMeasurementsPanel,
    DesignProposals,
    SaveConflict,
    Linkage3dPanel,
    OutputCurvesPanel,
  ],
  templateUrl: './axle-design-page.html',
  styleUrl: './axle-design-page.scss',
  providers: [KinematicsClient, AxleDesignStore],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: {
    '(keydown)': 'shortcut($event)',
    '(window:beforeunload)': 'warnBeforeUnload($event)',
  },
})
export class AxleDesignPage {
  // Route parameters (the router binds them; a new id on the same page loads the new design).
  readonly teamId = input.required<string>();
  readonly vehicleId = input.required<string>();
  readonly designId = input.required<string>();

  private readonly access = inject(TeamAccess);
  private readonly engine = inject(KinematicsClient);
  protected readonly store = inject(AxleDesignStore);

  protected readonly state = this.store.state;
  protected readonly saved = this.store.saved;
  protected readonly revisions = this.store.revisions;
  protected readonly corner = this.store.corner;
  protected readonly canUndo = this.store.canUndo;
  protected readonly canRedo = this.store.canRedo;
  protected readonly changed = this.store.changed;
  /** The author of the revision shown, as the revision list names it (the record's last writer until the list is there). */
  protected readonly revisionAuthor = computed(() => revisionAuthor(this.saved(), this.revisions()));
  /** Who accepted the proposal that became the revision shown, when one did. */
  protected readonly acceptedBy = computed(() => {
    const d = this.saved();
    return (d && this.store.proposals().find((p) => p.status === 'accepted' && p.acceptedRevision === d.revision)?.decidedByName) || null;
  });
  readonly dirty = this.store.dirty;

  protected readonly sections = EDITOR_STAGES;

  protected readonly editable = computed(() => this.access.can('design:edit'));
  protected readonly canAccept = computed(() => this.access.can('design:accept'));
  protected readonly canPropose = computed(() => this.access.can('design:propose'));
  protected readonly canManage = computed(() => this.access.can('vehicle:manage'));
  protected readonly canSetTolerance = computed(() => this.access.can('members:manage'));

  // Sweep settings: the curves' travel range (remembered per design) and the pose on the sliders.
  protected readonly travel = linkedSignal<TravelRange>(() => storedTravel(this.designId()));
  protected readonly travelFrom = computed(() => this.travel().from);
  protected readonly travelTo = computed(() => this.travel().to);
  protected readonly travelStep = computed(() => this.travel().step);
  protected readonly poseTravel = signal(0);
  protected readonly poseRack = signal(0);
  /** The hardpoint picked in the 3D view or selected in the table (its table key). */
  protected readonly selectedPoint = signal<string | null>(null);

  protected readonly rackStroke = computed<[number, number] | null>(() => {
    const c = this.corner();
    return c?.steered && c.steering?.kind === 'rack' ? c.steering.rackStroke : null;
  });

  /** Rack positions of the curves: straight ahead, half stroke each way. */
  protected readonly rackPositions = computed(() => {
    const s = this.rackStroke();
    if (!s) return [0];
    return [0, s[0] / 2, s[1] / 2].filter((v, i, a) => a.indexOf(v) === i);
  });

  // Cautions beside the results: the track profile they are measured for (remembered per design), and the vehicle's data.
  protected readonly axle = computed(() => this.saved()?.axle ?? null);
  private readonly chosenProfile = linkedSignal<TrackProfileId | null>(() => storedProfile(this.designId()));
  protected readonly trackProfileId = computed<TrackProfileId>(() => this.chosenProfile() ?? DEFAULT_TRACK_PROFILE[this.axle() ?? 'front']);

  /** The analysis on screen and the request that produced it: the figures always carry their own inputs. */
  private readonly analysed = signal<{ readonly request: AnalysisRequest; readonly analysis: CornerAnalysis } | null>(null);
  protected readonly analysis = computed(() => this.analysed()?.analysis ?? null);
  /**
   * The travel range the figures on screen were fitted over: the solved sweep's first and last travel (not the
   * fields', and not the request's "to" when the step does not land on it).
   */
  protected readonly fittedRange = computed(() => {
    const a = this.analysed();
    if (!a) return null;
    const travels = a.analysis.curves[0]?.points.map((p) => p.travelMm) ?? [];
    return travels.length > 0 ? { from: Math.min(...travels), to: Math.max(...travels) } : a.request.travel;
  });
  protected readonly failure = signal<AnalysisFailure | null>(null);
  /** The latest change could not be solved: what is shown belongs to the last geometry and settings that solved. */
  protected readonly outOfDate = computed(() => this.failure() !== null && this.analysed() !== null);
  protected readonly failureText = computed(() => {
    const f = this.failure();
    return f ? failureWords(f, this.units()) : '';
  });
  protected readonly units = inject(DISPLAY_UNITS);
  protected readonly lengthUnit = computed(() => unitLabel('length', this.units()));
  protected readonly solving = signal(false);

  protected readonly saveMessage = signal('');
  protected readonly importing = signal(false);

  protected readonly axleWords = computed(() => {
    const a = this.analysis();
    const d = this.saved();
    return a && d ? rollSteerWords(a.rollSteerCoefficient, d.axle) : '';
  });

  /**
   * Toe change from ride height per rack position: steering shifts the whole
   * curve by the steer angle, so each curve starts from its own toe at zero
   * travel and only the bump steer shows.
   */
  protected readonly toeSeries = computed<LineSeries[]>(() =>
    (this.analysis()?.curves ?? []).map((c) => {
      const atRide = c.points.find((p) => p.travelMm === 0)?.toeDeg ?? c.points[0]?.toeDeg ?? 0;
      return {
        name: `Rack ${this.length(c.rackMm)} ${this.lengthUnit()}`,
        points: c.points.map((p) => ({ x: this.len(p.travelMm), y: p.toeDeg - atRide })),
      };
    }),
  );

  protected readonly camberSeries = computed<LineSeries[]>(() =>
    (this.analysis()?.curves ?? []).map((c) => ({
      name: `Rack ${this.length(c.rackMm)} ${this.lengthUnit()}`,
      points: c.points.map((p) => ({ x: this.len(p.travelMm), y: p.camberDeg })),
    })),
  );

  /** A stored length (mm) as a number in the user's unit. */
  private len(mm: number): number {
    return inDisplayUnits(mm, 'length', this.units());
  }

  /** A stored length (mm) as text in the user's unit, without the unit. */
  protected length(mm: number): string {
    return formatNum(mm, { kind: 'length' }, this.units());
  }

  /** Axle steer change from zero roll per rack position (the steer angle itself is set by the rack). */
  protected readonly rollSeries = computed<LineSeries[]>(() =>
    (this.analysis()?.roll ?? []).map((c) => {
      const atZero = c.points.find((p) => p.rollDeg === 0)?.axleSteerDeg ?? 0;
      return {
        name: `Rack ${this.length(c.rackMm)} ${this.lengthUnit()}`,
        points: c.points.map((p) => ({ x: p.rollDeg, y: p.axleSteerDeg - atZero })),
      };
    }),
  );

  protected readonly toeDescription = computed(() => {
    const first = this.analysis()?.curves[0];
    const u = this.units();
    return first
      ? `Bump steer at rack ${this.length(first.rackMm)} ${this.lengthUnit()}: ${formatNum(first.bumpSteerDegPerM, { kind: 'bumpSteer' }, u)} ${unitLabel('bumpSteer', u)} of toe-in per ${u === 'imperial' ? 'inch' : 'metre'} of bump.`
      : '';
  });

  constructor() {
    this.store.follow(computed(() => ({ teamId: this.teamId(), vehicleId: this.vehicleId(), designId: this.designId() })));
    // Re-solve whenever the corner or the sweep settings change.
    effect(() => {
      const corner = this.corner();
      const { from, to, step } = this.travel();
      const rackMm = this.rackPositions();
      const pose = { travelMm: this.poseTravel(), rackMm: this.rackStroke() ? this.poseRack() : 0 };
      const axle = this.axle();
      const profile = this.trackProfileId();
      const vehicleData = this.store.vehicleData();
      if (!corner) return;
      // The cautions are measured over the curves' travel range (the corner's own), with the profile's bump height.
      const cautions = axle ? { axle, trackProfile: { id: profile, travelMm: [from, to] as [number, number] }, vehicleData } : undefined;
      untracked(() => this.solve(corner, { from, to, step }, rackMm, pose, cautions));
    });
  }

  protected chooseProfile(id: TrackProfileId): void {
    this.chosenProfile.set(id);
    globalThis.localStorage?.setItem(profileStorageKey(this.designId()), id);
  }

  private async solve(
    corner: Corner,
    travel: TravelRange,
    rackMm: number[],
    pose: { travelMm: number; rackMm: number },
    cautions: AnalysisRequest['cautions'],
  ): Promise<void> {
    this.solving.set(true);
    try {
      const request: AnalysisRequest = { corner, travel, rackMm, roll: ROLL_RANGE, pose, ...(cautions ? { cautions } : {}) };
      const analysis = await this.engine.analyse(request);
      this.analysed.set({ request, analysis });
      this.failure.set(null);
      this.solving.set(false);
    } catch (error) {
      if (error instanceof AnalysisSuperseded) return;
      this.failure.set(error instanceof AnalysisError ? error.failure : { code: 'engine_error', message: String(error) });
      this.solving.set(false);
    }
  }

  // ---- editing ----

  protected edit(e: PointEdit): void {
    if (this.editable()) this.store.editPoint(e.key, e.value);
  }

  protected pasteMany(points: ReadonlyMap<string, Vec3>): void {
    if (this.editable()) this.store.editPoints(points);
  }

  protected applyImport(points: ReadonlyMap<string, Vec3>): void {
    this.pasteMany(points);
    this.importing.set(false);
    this.store.notice.set(`Imported ${points.size} point(s). Save to keep them as a new revision.`);
  }

  protected undo(): void {
    this.store.undo();
  }

  protected redo(): void {
    this.store.redo();
  }

  /** Closing or reloading the tab with unsaved edits asks first (the browser words the question). */
  protected warnBeforeUnload(event: BeforeUnloadEvent): void {
    if (this.dirty()) event.preventDefault();
  }

  protected shortcut(event: KeyboardEvent): void {
    if (!(event.ctrlKey || event.metaKey) || !this.editable()) return;
    // In a text field the browser's own undo edits the typed text; elsewhere the keys undo committed edits.
    if (event.target instanceof HTMLInputElement && event.target.type === 'text') return;
    if (event.target instanceof HTMLTextAreaElement) return;
    const key = event.key.toLowerCase();
    if (key === 'z' && !event.shiftKey) {
      event.preventDefault();
      this.undo();
    } else if (key === 'y' || (key === 'z' && event.shiftKey)) {
      event.preventDefault();
      this.redo();
    }
  }

  protected setTravel(next: TravelRange): void {
    this.travel.set(next);
    this.poseTravel.set(Math.min(next.to, Math.max(next.from, this.poseTravel())));
    globalThis.localStorage?.setItem(travelStorageKey(this.designId()), `${next.from},${next.to},${next.step}`);
  }

  // ---- saving ----

  protected async save(): Promise<void> {
    if (await this.store.save(this.saveMessage())) this.saveMessage.set('');
  }

  protected async keepMine(): Promise<void> {
    if (await this.store.keepMine(this.saveMessage())) this.saveMessage.set('');
  }

  // ---- export ----

  private exportTitle(): string {
    const s = this.saved()!;
    return `${s.name}, ${s.axle} axle, revision ${s.revision}${this.dirty() ? ' with unsaved edits' : ''}`;
  }

  protected exportCsv(): void {
    const c = this.corner();
    if (c) downloadText(hardpointCsv(c, this.exportTitle()), fileNameFor(`${this.saved()!.name} hardpoints`, 'csv'));
  }

  protected exportJson(): void {
    const c = this.corner();
    if (c) downloadText(hardpointJson(c, this.exportTitle()), fileNameFor(`${this.saved()!.name} corner`, 'json'), 'application/json');
  }

  /** An engine failure in the user's words. */
  protected plain(f: AnalysisFailure): string {
    return failureWords(f, this.units());
  }

  protected textFrom(event: Event): string {
    return (event.target as HTMLInputElement).value;
  }
}
