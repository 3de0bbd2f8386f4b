import { RigMeasurementsPanel } from '../rig/rig-measurements-panel';
import { ChangeDetectionStrategy, Component, computed, effect, inject, OnInit, signal, untracked } from '@angular/core';
import { DatePipe } from '@angular/common';
import { ActivatedRoute, RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { firstValueFrom } from 'rxjs';
import type { Corner, Vec3 } from '../../../../shared/schema/corner';
import { DEFAULT_TRACK_PROFILE, trackProfiles, type TrackProfileId } from '../../../../shared/intent/profiles';
import { apiProblem } from '../../core/http/api-error';
import { TeamAccess } from '../../core/teams/team-access';
import { LineChart } from '../../charts/line-chart';
import { LineSeries } from '../../charts/chart-types';
import { downloadText, fileNameFor } from '../../charts/csv';
import { AnalysisError, AnalysisSuperseded, KinematicsClient } from '../../workers/kinematics-client';
import type { AnalysisFailure, AnalysisRequest, CornerAnalysis } from '../../workers/analysis-types';
import { AxleDesign, FeaturesApi, Proposal, RevisionRow } from '../features-api';
import { routeParam } from '../route-params';
import { rollSteerWords } from '../roll-steer-words';
import { SafetyCaution } from '../safety-caution';
import { EditHistory } from './edit-history';
import { HardpointImport } from './hardpoint-import';
import { hardpointCsv, hardpointJson } from './hardpoint-io';
import { changedPoints, getPoint, pointName, withPoint, withPoints } from './hardpoint-model';
import { HardpointTable, PointEdit } from './hardpoint-table';
import { LinkageViews } from './linkage-views';
import { BumpCostView } from '../bump-cost';
import { CornerCautions } from './corner-cautions';
import { TrackProfileSelect } from './track-profile-select';

interface Conflict {
  readonly theirs: AxleDesign;
  readonly rows: readonly { key: string; name: string; theirs: Vec3 | undefined; yours: Vec3 | undefined }[];
}

type LoadState = { readonly kind: 'loading' } | { readonly kind: 'error'; readonly message: string } | { readonly kind: 'ready' };

const ROLL_RANGE = { from: -3, to: 3, step: 0.25 };

function travelStorageKey(designId: string): string {
  return `rollwise.travel.${designId}`;
}

function profileStorageKey(designId: string): string {
  return `rollwise.cautionProfile.${designId}`;
}

/**
 * Axle design editor: the corner's hardpoints with live kinematics. Every
 * committed edit re-solves in the Web Worker and redraws the views, charts
 * and fitted numbers without a server round trip; saving stores a new
 * revision against the revision the edit started from.
 */
@Component({
  selector: 'rw-axle-design-page',
  imports: [DatePipe, RouterLink, MatButton, MatProgressBar, HardpointTable, HardpointImport, LinkageViews, LineChart, SafetyCaution, CornerCautions, BumpCostView, TrackProfileSelect, RigMeasurementsPanel],
  templateUrl: './axle-design-page.html',
  styleUrl: './axle-design-page.scss',
  providers: [KinematicsClient],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: {
    '(keydown)': 'shortcut($event)',
    '(window:beforeunload)': 'warnBeforeUnload($event)',
  },
})
export class AxleDesignPage implements OnInit {
  private readonly route = inject(ActivatedRoute);
  private readonly api = inject(FeaturesApi);
  private readonly access = inject(TeamAccess);
  private readonly engine = inject(KinematicsClient);

  protected readonly teamId = routeParam(this.route, 'teamId');
  protected readonly vehicleId = routeParam(this.route, 'vehicleId');
  protected readonly designId = routeParam(this.route, 'designId');

  protected readonly state = signal<LoadState>({ kind: 'loading' });
  protected readonly saved = signal<AxleDesign | null>(null);
  protected readonly revisions = signal<readonly RevisionRow[]>([]);
  private history: EditHistory<Corner> | null = null;
  private readonly historyVersion = signal(0);

  protected readonly editable = computed(() => this.access.can('design:edit'));
  protected readonly canAccept = computed(() => this.access.can('design:accept'));
  protected readonly canPropose = computed(() => this.access.can('design:propose'));
  protected readonly canManage = computed(() => this.access.can('vehicle:manage'));
  protected readonly canSetTolerance = computed(() => this.access.can('members:manage'));
  protected readonly proposals = signal<readonly Proposal[]>([]);
  protected readonly openProposals = computed(() => this.proposals().filter((p) => p.status === 'open'));
  protected readonly deciding = signal(false);
  protected readonly proposalError = signal<string | null>(null);

  protected readonly corner = computed<Corner | null>(() => {
    this.historyVersion();
    return this.history?.present() ?? null;
  });
  protected readonly canUndo = computed(() => (this.historyVersion(), this.history?.canUndo() ?? false));
  protected readonly canRedo = computed(() => (this.historyVersion(), this.history?.canRedo() ?? false));

  protected readonly changed = computed(() => {
    const c = this.corner();
    const s = this.saved();
    return c && s ? changedPoints(c, s.corner) : [];
  });
  readonly dirty = computed(() => this.changed().length > 0);

  // Sweep settings.
  protected readonly travelFrom = signal(-25);
  protected readonly travelTo = signal(25);
  protected readonly travelStep = signal(2.5);
  protected readonly poseTravel = signal(0);
  protected readonly poseRack = signal(0);
  protected readonly settingsError = signal<string | null>(null);

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

  // Cautions beside the results: the track profile they are measured for, and the vehicle's data (tyres, loads, roll).
  protected readonly axle = computed(() => this.saved()?.axle ?? null);
  private readonly chosenProfile = signal<TrackProfileId | null>(null);
  protected readonly trackProfileId = computed<TrackProfileId>(() => this.chosenProfile() ?? DEFAULT_TRACK_PROFILE[this.axle() ?? 'front']);
  private readonly vehicleData = signal<unknown>(null);

  protected readonly analysis = signal<CornerAnalysis | null>(null);
  protected readonly failure = signal<AnalysisFailure | null>(null);
  protected readonly solving = signal(false);

  protected readonly saving = signal(false);
  protected readonly saveMessage = signal('');
  protected readonly saveError = signal<string | null>(null);
  protected readonly savedNotice = signal<string | null>(null);
  protected readonly conflict = signal<Conflict | null>(null);
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
        name: `Rack ${c.rackMm} mm`,
        points: c.points.map((p) => ({ x: p.travelMm, y: p.toeDeg - atRide })),
      };
    }),
  );

  protected readonly camberSeries = computed<LineSeries[]>(() =>
    (this.analysis()?.curves ?? []).map((c) => ({
      name: `Rack ${c.rackMm} mm`,
      points: c.points.map((p) => ({ x: p.travelMm, y: p.camberDeg })),
    })),
  );

  /** Axle steer change from zero roll per rack position (the steer angle itself is set by the rack). */
  protected readonly rollSeries = computed<LineSeries[]>(() =>
    (this.analysis()?.roll ?? []).map((c) => {
      const atZero = c.points.find((p) => p.rollDeg === 0)?.axleSteerDeg ?? 0;
      return {
        name: `Rack ${c.rackMm} mm`,
        points: c.points.map((p) => ({ x: p.rollDeg, y: p.axleSteerDeg - atZero })),
      };
    }),
  );

  protected readonly toeDescription = computed(() => {
    const first = this.analysis()?.curves[0];
    return first ? `Bump steer at rack ${first.rackMm} mm: ${first.bumpSteerDegPerM.toFixed(3)} deg/m toe-in per metre of bump.` : '';
  });

  constructor() {
    // Re-solve whenever the corner or the sweep settings change.
    effect(() => {
      const corner = this.corner();
      const from = this.travelFrom();
      const to = this.travelTo();
      const step = this.travelStep();
      const rackMm = this.rackPositions();
      const pose = { travelMm: this.poseTravel(), rackMm: this.rackStroke() ? this.poseRack() : 0 };
      const axle = this.axle();
      const profile = this.trackProfileId();
      const vehicleData = this.vehicleData();
      if (!corner) return;
      // The cautions are measured over the curves' travel range (the corner's own), with the profile's bump height.
      const cautions = axle ? { axle, trackProfile: { id: profile, travelMm: [from, to] as [number, number] }, vehicleData } : undefined;
      untracked(() => this.solve(corner, { from, to, step }, rackMm, pose, cautions));
    });
  }

  ngOnInit(): void {
    const stored = globalThis.localStorage?.getItem(travelStorageKey(this.designId));
    if (stored) {
      const [from, to, step] = stored.split(',').map(Number);
      if ([from, to, step].every(Number.isFinite) && from! < to! && step! > 0) {
        this.travelFrom.set(from!);
        this.travelTo.set(to!);
        this.travelStep.set(step!);
      }
    }
    const profile = globalThis.localStorage?.getItem(profileStorageKey(this.designId));
    if (profile && profile in trackProfiles) this.chosenProfile.set(profile as TrackProfileId);
    void this.load();
  }

  protected chooseProfile(id: TrackProfileId): void {
    this.chosenProfile.set(id);
    globalThis.localStorage?.setItem(profileStorageKey(this.designId), id);
  }

  private async load(): Promise<void> {
    this.state.set({ kind: 'loading' });
    try {
      const [design, vehicle] = await Promise.all([
        firstValueFrom(this.api.axleDesign(this.teamId, this.designId)),
        // The cautions use the vehicle's tyres and loads where it can be read; without it they use the product defaults.
        firstValueFrom(this.api.vehicle(this.teamId, this.vehicleId)).catch(() => null),
        firstValueFrom(this.access.load(this.teamId)),
      ]);
      this.vehicleData.set(vehicle?.data ?? null);
      this.adopt(design);
      this.state.set({ kind: 'ready' });
      void this.loadRevisions();
    } catch (error) {
      this.state.set({ kind: 'error', message: apiProblem(error).message });
    }
  }

  private async loadRevisions(): Promise<void> {
    try {
      this.revisions.set(await firstValueFrom(this.api.axleDesignRevisions(this.teamId, this.designId)));
    } catch {
      this.revisions.set([]);
    }
    try {
      this.proposals.set(await firstValueFrom(this.api.proposals(this.teamId, this.designId)));
    } catch {
      this.proposals.set([]);
    }
  }

  /** Accepts (a new revision from the proposed corner) or rejects an engineer's proposal. */
  protected async decide(proposal: Proposal, decision: 'accept' | 'reject'): Promise<void> {
    if (this.deciding() || (decision === 'accept' && this.dirty())) return;
    this.deciding.set(true);
    this.proposalError.set(null);
    try {
      await firstValueFrom(this.api.decideProposal(this.teamId, this.designId, proposal.id, decision));
      const design = await firstValueFrom(this.api.axleDesign(this.teamId, this.designId));
      if (decision === 'accept') {
        this.adopt(design);
        this.savedNotice.set(`Accepted the proposal from ${proposal.authorName ?? 'an engineer'}: now revision ${design.revision}.`);
      } else {
        this.savedNotice.set('Proposal rejected; the design is unchanged.');
      }
      await this.loadRevisions();
    } catch (error) {
      this.proposalError.set(apiProblem(error).message);
    } finally {
      this.deciding.set(false);
    }
  }

  protected proposalSummary(p: Proposal): string {
    const o = p.origin as { achievedRollSteerCoefficient?: number; understeerChangeDegPerG?: number | null } | null;
    const parts: string[] = [];
    if (o && typeof o.achievedRollSteerCoefficient === 'number') parts.push(`ε ${o.achievedRollSteerCoefficient.toFixed(4)} deg/deg`);
    if (o && typeof o.understeerChangeDegPerG === 'number') parts.push(`understeer change ${o.understeerChangeDegPerG.toFixed(3)} deg/g`);
    return parts.join(', ');
  }

  private adopt(design: AxleDesign): void {
    this.saved.set(design);
    this.history = new EditHistory<Corner>(design.corner);
    this.historyVersion.update((v) => v + 1);
  }

  private async solve(
    corner: Corner,
    travel: { from: number; to: number; step: number },
    rackMm: number[],
    pose: { travelMm: number; rackMm: number },
    cautions: AnalysisRequest['cautions'],
  ): Promise<void> {
    this.solving.set(true);
    try {
      const analysis = await this.engine.analyse({ corner, travel, rackMm, roll: ROLL_RANGE, pose, ...(cautions ? { cautions } : {}) });
      this.analysis.set(analysis);
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
    const c = this.corner();
    if (!c || !this.editable() || !this.history) return;
    this.history.commit(withPoint(c, e.key, e.value));
    this.savedNotice.set(null);
  }

  protected pasteMany(points: ReadonlyMap<string, Vec3>): void {
    const c = this.corner();
    if (!c || !this.editable() || !this.history) return;
    this.history.commit(withPoints(c, points));
    this.savedNotice.set(null);
  }

  protected applyImport(points: ReadonlyMap<string, Vec3>): void {
    this.pasteMany(points);
    this.importing.set(false);
    this.savedNotice.set(`Imported ${points.size} point(s). Save to keep them as a new revision.`);
  }

  protected undo(): void {
    this.history?.undo();
  }

  protected redo(): void {
    this.history?.redo();
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

  protected setTravel(which: 'from' | 'to' | 'step', text: string): void {
    const v = Number(text);
    const next = { from: this.travelFrom(), to: this.travelTo(), step: this.travelStep(), [which]: v };
    if (!Number.isFinite(v) || next.from >= next.to || next.step <= 0 || (next.to - next.from) / next.step > 400) {
      this.settingsError.set('Travel range: "from" below "to", a positive step, and at most 400 steps.');
      return;
    }
    this.settingsError.set(null);
    this.travelFrom.set(next.from);
    this.travelTo.set(next.to);
    this.travelStep.set(next.step);
    this.poseTravel.set(Math.min(next.to, Math.max(next.from, this.poseTravel())));
    globalThis.localStorage?.setItem(travelStorageKey(this.designId), `${next.from},${next.to},${next.step}`);
  }

  // ---- saving ----

  protected async save(): Promise<void> {
    const c = this.corner();
    const s = this.saved();
    if (!c || !s || this.saving()) return;
    await this.saveOver(c, s.revision);
  }

  private async saveOver(corner: Corner, baseRevision: number): Promise<void> {
    this.saving.set(true);
    this.saveError.set(null);
    try {
      const result = await firstValueFrom(
        this.api.saveCorner(this.teamId, this.designId, corner, baseRevision, this.saveMessage().trim() || undefined),
      );
      this.saved.set(result);
      this.conflict.set(null);
      this.saveMessage.set('');
      this.savedNotice.set(`Saved as revision ${result.revision}.`);
      void this.loadRevisions();
    } catch (error) {
      const problem = apiProblem(error);
      if (problem.status === 409) await this.showConflict(problem.details);
      else this.saveError.set(problem.message);
    } finally {
      this.saving.set(false);
    }
  }

  private async showConflict(details: unknown): Promise<void> {
    let theirs: AxleDesign | null = null;
    const current = (details as { current?: unknown } | undefined)?.current;
    if (current && typeof current === 'object' && 'corner' in current && 'revision' in current) theirs = current as AxleDesign;
    if (!theirs) {
      try {
        theirs = await firstValueFrom(this.api.axleDesign(this.teamId, this.designId));
      } catch (error) {
        this.saveError.set(`Someone else saved first, and their version could not be loaded: ${apiProblem(error).message}`);
        return;
      }
    }
    const yours = this.corner()!;
    const keys = [...new Set([...changedPoints(yours, theirs.corner), ...changedPoints(theirs.corner, yours)])];
    this.conflict.set({
      theirs,
      rows: keys.map((key) => ({ key, name: pointName(key, yours), theirs: getPoint(theirs!.corner, key), yours: getPoint(yours, key) })),
    });
  }

  protected async keepMine(): Promise<void> {
    const conflict = this.conflict();
    const c = this.corner();
    if (!conflict || !c) return;
    await this.saveOver(c, conflict.theirs.revision);
  }

  protected takeTheirs(): void {
    const conflict = this.conflict();
    if (!conflict || !this.history) return;
    this.saved.set(conflict.theirs);
    this.history.commit(conflict.theirs.corner);
    this.conflict.set(null);
    this.savedNotice.set(`Showing revision ${conflict.theirs.revision}; your version is one undo step back.`);
    void this.loadRevisions();
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

  protected readonly cautionList = computed(() => {
    const c = this.analysis()?.cautions;
    return c && c.ok ? c.list : null;
  });
  /** The ride model's bump cost beside the roll steer (null until the cautions are measured). */
  protected readonly bumpCost = computed(() => {
    const c = this.analysis()?.cautions;
    return c && c.ok ? { cost: c.bumpCost, unavailable: c.bumpCostUnavailable } : null;
  });
  protected readonly cautionFailure = computed(() => {
    const c = this.analysis()?.cautions;
    return c && !c.ok ? c.failure : null;
  });

  /** How the cautions were measured, in words (beside the profile selector). */
  protected readonly cautionBasis = computed(() => {
    const c = this.analysis()?.cautions;
    if (!c) return '';
    const p = c.profile;
    const where = `over ${p.travelMm[0]} to ${p.travelMm[1]} mm of travel (the curves' range) with a ${p.bumpHeightMm} mm single-wheel bump, on ISO 8608 class ${p.roadClass} at ${p.speedKph} km/h`;
    if (!c.ok) return `Measured ${where}.`;
    const racks = c.racksMm.length > 1 ? `, at rack ${c.racksMm.join(', ')} mm` : '';
    const vehicle = c.vehicleUsed ? "the vehicle's tyres, loads and roll" : `product default tyre figures (${c.vehicleNote ?? 'no vehicle'})`;
    return `Measured ${where}${racks}, with ${vehicle}; thresholds are the product defaults for ${p.label.toLowerCase()}.`;
  });

  protected fmt(v: number | undefined, digits = 3): string {
    return v === undefined || !Number.isFinite(v) ? '–' : v.toFixed(digits);
  }

  protected vec(v: Vec3 | undefined): string {
    return v ? v.map((n) => String(Number(n.toPrecision(8)))).join(', ') : '(none)';
  }

  protected numberFrom(event: Event): number {
    return Number((event.target as HTMLInputElement).value);
  }

  protected textFrom(event: Event): string {
    return (event.target as HTMLInputElement).value;
  }
}
