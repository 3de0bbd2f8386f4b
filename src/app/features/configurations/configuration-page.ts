import { BumpCostView } from '../bump-cost';
import type { BumpCost } from '../../../../shared/ride/cost';
import { RigMeasurementsPanel } from '../rig/rig-measurements-panel';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, linkedSignal, signal, untracked, viewChild } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatDialog } from '@angular/material/dialog';
import { ReviewGateDialog, type ReviewGateDialogData } from './review-gate-dialog';
import { LatestPreviewDialog, type LatestPreviewDialogData } from './latest-preview-dialog';
import { catchError, firstValueFrom, forkJoin, from, of } from 'rxjs';
import type { Caution } from '../../../../shared/cautions/cautions';
import { trackProfiles, type TrackProfileId } from '../../../../shared/tracks/profiles';
import { apiProblem } from '../../core/http/api-error';
import { TeamAccess } from '../../core/teams/team-access';
import { BarChart } from '../../charts/bar-chart';
import { LineChart } from '../../charts/line-chart';
import type { BarGroup, LineSeries } from '../../charts/chart-types';
import { AnalysisError, KinematicsClient } from '../../workers/kinematics-client';
import { CornerCautions } from '../axle-design/corner-cautions';
import { AxleDesignSummary, FeaturesApi } from '../features-api';
import { ConfigurationStudies } from '../studies/configuration-studies';
import { SafetyCaution } from '../safety-caution';
import {
  ApprovalDetail,
  ApprovalSummary,
  CompareAnswer,
  Configuration,
  ConfigurationChange,
  ConfigurationRevision,
  ConfigurationsApi,
  GateBody,
  ResultsAnswer,
  TransitionRow,
} from './configurations-api';
import { RefOption, ReviewComments } from './review-comments';
import { ActionSpec, actionsFor, CHART_REFS, type DifferenceGroup, differenceGroups, type KeyFigure, keyFigures, problemText, STATUS_WORDS } from './review-words';
import { inputWords, resultWords } from '../../../../shared/io/result-words';
import { browserTimeZone, formatLocalTime } from '../../core/time/local-time';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { displayDecimals, inDisplayUnits, type QuantityKind, unitLabel } from '../../core/format/quantities';
import { StatusChip } from './status-chip';
import { NumPipe } from '../../core/format/num-pipe';
import { loadState } from '../../core/http/load-state';
import { inputValue } from '../../core/forms/dom-events';
import type { AxleName } from '../../../../shared/schema/axle';
import { MatCheckbox } from '@angular/material/checkbox';
import { PageSection, SectionNav } from '../../core/layout/section-nav';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';

type AxleCautions =
  | { axle: AxleName; ok: true; list: readonly Caution[]; bumpCost?: BumpCost | null; bumpCostUnavailable?: string | null }
  | { axle: AxleName; ok: false; message: string };

const BUDGET_TERMS = [
  ['tyres', 'Tyres'],
  ['loadTransfer', 'Load transfer'],
  ['rollSteer', 'Roll steer'],
  ['rollCamber', 'Roll camber'],
  ['complianceSteer', 'Compliance steer'],
  ['alignTorque', 'Aligning torque'],
  ['total', 'Total'],
] as const;

/** A key figure frozen in an approval beside what the current engine gives for the same inputs. */
interface FrozenFigure {
  readonly path: string;
  readonly label: string;
  /** Unit in the user's system. */
  readonly unit: string;
  readonly kind: QuantityKind;
  /** Decimals in the user's system. */
  readonly digits: number;
  readonly frozen: number | null;
  readonly now: number | null;
  readonly change: number | null;
}

/**
 * `/teams/:teamId/configurations/:configurationId`: one configuration under
 * review. What it pins (the revisions), what the engines compute for it (ε
 * per axle, the understeer budget and its roll-steer term, bump steer) with
 * the cautions of its track profile beside them, the review steps the
 * caller's roles allow (the server refuses the rest, and any decision on
 * one's own work), the comment threads, the frozen approval snapshot beside
 * a recompute with the current engine, the history, and a comparison with
 * another revision or configuration.
 */
@Component({
  selector: 'rw-configuration-page',
  imports: [NumPipe, RouterLink, MatButton, MatProgressBar, MatFormField, MatLabel, MatInput, MatSelect, MatOption, MatCheckbox, SectionNav, BarChart, LineChart, SafetyCaution, CornerCautions, BumpCostView, StatusChip, ReviewComments, RigMeasurementsPanel, ConfigurationStudies],
  providers: [KinematicsClient],
  templateUrl: './configuration-page.html',
  styleUrl: './configuration-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ConfigurationPage {
  private readonly api = inject(ConfigurationsApi);
  private readonly features = inject(FeaturesApi);
  private readonly engine = inject(KinematicsClient);
  private readonly dialog = inject(MatDialog);
  protected readonly access = inject(TeamAccess);

  readonly teamId = input.required<string>();
  readonly configurationId = input.required<string>();
  protected readonly timeZone = browserTimeZone();
  constructor() {
    // The caller's permissions in the team, again when the router reuses this page for another team.
    effect(() => {
      const teamId = this.teamId();
      untracked(() => void firstValueFrom(this.access.load(teamId)).catch(() => null));
    });
  }

  protected localTime(iso: string): string {
    return formatLocalTime(iso, this.timeZone);
  }
  protected readonly profiles = Object.values(trackProfiles);
  protected readonly statusWords = STATUS_WORDS;

  /** The configuration; a review step, a new revision or archiving puts the answer in its place. */
  private readonly configResource = rxResource({
    params: () => ({ teamId: this.teamId(), configurationId: this.configurationId() }),
    stream: ({ params: p }) => this.api.get(p.teamId, p.configurationId),
  });
  protected readonly config = loadState(this.configResource);
  protected readonly current = computed(() => {
    const c = this.config();
    return c.status === 'ready' ? c.value : null;
  });
  /** The revision the results are of: they load again only when it changes (not on a review step). */
  private readonly revisionShown = computed(
    () => {
      const c = this.current();
      return c ? { teamId: this.teamId(), configuration: c } : undefined;
    },
    { equal: (a, b) => a?.teamId === b?.teamId && a?.configuration.id === b?.configuration.id && a?.configuration.revision === b?.configuration.revision },
  );
  /** What the engines compute for the revision, on the server. */
  private readonly resultsResource = rxResource({
    params: () => this.revisionShown(),
    stream: ({ params: p }) => this.api.results(p.teamId, p.configuration.id),
  });
  protected readonly results = loadState<ResultsAnswer>(this.resultsResource);
  /** The cautions of both corners on the revision's track profile, measured in the browser's kinematics worker. */
  private readonly cautionsResource = rxResource({
    params: () => this.revisionShown(),
    stream: ({ params: p }) => from(this.measureCautions(p.teamId, p.configuration)),
  });
  protected readonly cautions = loadState<readonly AxleCautions[]>(this.cautionsResource);
  /** History, revisions, approvals, the team's other configurations (for compare) and the vehicle's designs; again after each review step or revision. */
  private readonly stepShown = computed(
    () => {
      const c = this.current();
      return c ? { teamId: this.teamId(), configuration: c } : undefined;
    },
    {
      equal: (a, b) =>
        a?.teamId === b?.teamId && a?.configuration.id === b?.configuration.id && a?.configuration.revision === b?.configuration.revision && a?.configuration.status === b?.configuration.status,
    },
  );
  private readonly sideResource = rxResource({
    params: () => this.stepShown(),
    stream: ({ params: { teamId, configuration: c } }) =>
      forkJoin({
        history: this.api.history(teamId, c.id).pipe(catchError(() => of([] as TransitionRow[]))),
        revisions: this.api.revisions(teamId, c.id).pipe(catchError(() => of([] as ConfigurationRevision[]))),
        approvals: this.api.approvals(teamId, c.id).pipe(catchError(() => of([] as ApprovalSummary[]))),
        others: this.api.list(teamId).pipe(catchError(() => of([] as Configuration[]))),
        designs: this.features.axleDesigns(teamId, c.vehicle.id).pipe(catchError(() => of([] as AxleDesignSummary[]))),
      }),
  });
  private readonly side = computed(() => (this.sideResource.hasValue() ? this.sideResource.value() : null));
  protected readonly history = computed<readonly TransitionRow[]>(() => this.side()?.history ?? []);
  protected readonly revisions = computed<readonly ConfigurationRevision[]>(() => this.side()?.revisions ?? []);
  protected readonly approvals = computed<readonly ApprovalSummary[]>(() => this.side()?.approvals ?? []);
  protected readonly others = computed<readonly Configuration[]>(() => {
    const c = this.current();
    const others = this.side()?.others ?? [];
    return !c || others.some((o) => o.id === c.id) ? others : [c, ...others];
  });
  protected readonly designs = computed<readonly AxleDesignSummary[]>(() => this.side()?.designs ?? []);
  /** The approval shown in the snapshot section: the latest unless another is chosen. */
  protected readonly approvalId = linkedSignal<string | null>(() => this.approvals()[0]?.id ?? null);
  private readonly approvalResource = rxResource({
    params: () => {
      const id = this.approvalId();
      return id ? { teamId: this.teamId(), configurationId: this.configurationId(), id } : undefined;
    },
    stream: ({ params: p }) => this.api.approval(p.teamId, p.configurationId, p.id),
  });
  protected readonly approval = loadState<ApprovalDetail>(this.approvalResource);
  protected readonly profile = computed(() => {
    const c = this.current();
    return c ? trackProfiles[c.trackProfile] : null;
  });

  // ---- review steps ----
  protected readonly stepMessage = signal('');
  protected readonly stepBusy = signal(false);
  protected readonly stepError = signal<string | null>(null);
  protected readonly stepNotice = signal<string | null>(null);
  protected readonly actions = computed<ActionSpec[]>(() => {
    const c = this.current();
    if (!c || c.archived) return [];
    return actionsFor(c.status, (p) => this.access.permissions().has(p));
  });
  protected readonly canComment = computed(() => this.access.permissions().has('review:comment'));
  protected readonly canRevise = computed(() => this.access.permissions().has('vehicle:manage'));
  protected readonly canSetTolerance = computed(() => this.access.permissions().has('members:manage'));

  // ---- results ----
  /** The user's unit system (account setting): key figures, charts and the snapshot follow it. */
  protected readonly units = inject(DISPLAY_UNITS);
  /** A key figure's unit and decimals in the user's system (the value converts through the num pipe's kind). */
  private inUnits(f: KeyFigure): KeyFigure & { unit: string } {
    return { ...f, unit: unitLabel(f.kind, this.units()), digits: displayDecimals(f.kind, this.units(), f.digits) };
  }
  protected readonly figures = computed(() => {
    const r = this.results();
    return r.status === 'ready' ? keyFigures(r.value.results).map((f) => this.inUnits(f)) : [];
  });
  protected readonly budgetGroups = computed<BarGroup[]>(() => {
    const r = this.results();
    if (r.status !== 'ready') return [];
    const b = r.value.results.balance.understeerBudget;
    return BUDGET_TERMS.map(([key, label]) => ({ label, values: [b[key]] }));
  });
  protected readonly yawGain = computed<LineSeries[]>(() => {
    const r = this.results();
    if (r.status !== 'ready') return [];
    const rows = r.value.results.balance.gains.rows;
    const units = this.units();
    return [{ name: 'Yaw-rate gain', points: rows.filter((g) => g.yawRateGainPerS !== null).map((g) => ({ x: inDisplayUnits(g.speedKph, 'speed', units), y: g.yawRateGainPerS! })) }];
  });
  protected readonly speedUnit = computed(() => unitLabel('speed', this.units()));
  protected readonly lengthUnit = computed(() => unitLabel('length', this.units()));
  protected readonly refOptions = computed<RefOption[]>(() => {
    const out: RefOption[] = [{ ref: 'budget', label: 'Understeer budget' }];
    for (const [name, label] of Object.entries(CHART_REFS)) out.push({ ref: `chart:${name}`, label });
    const c = this.cautions();
    if (c.status === 'ready') {
      const seen = new Set<string>();
      for (const axle of c.value) {
        if (!axle.ok) continue;
        for (const x of axle.list) {
          if (x.code === 'safety-notice' || seen.has(x.code)) continue;
          seen.add(x.code);
          out.push({ ref: `caution:${x.code}`, label: `Caution: ${x.message.slice(0, 70)}${x.message.length > 70 ? '…' : ''}` });
        }
      }
    }
    for (const f of this.figures()) out.push({ ref: `figure:${f.path}`, label: `Figure: ${f.label}` });
    return out;
  });
  protected readonly commentTarget = signal('');
  private readonly commentsPanel = viewChild(ReviewComments);

  // ---- approval snapshot ----
  protected readonly frozenFigures = computed<FrozenFigure[]>(() => {
    const a = this.approval();
    if (a.status !== 'ready') return [];
    const diffs = 'differences' in a.value.recompute ? a.value.recompute.differences : [];
    return keyFigures(a.value.results).map((raw) => {
      const f = this.inUnits(raw);
      const d = diffs.find((x) => x.path === f.path);
      const now = d ? (typeof d.b === 'number' ? d.b : null) : 'error' in a.value.recompute ? null : f.value;
      const change = d && typeof d.change === 'number' ? inDisplayUnits(d.change, f.kind, this.units()) : now === null ? null : 0;
      return { path: f.path, label: f.label, unit: f.unit, kind: f.kind, digits: f.digits, frozen: f.value, now, change };
    });
  });

  /** The results a recompute of the frozen inputs gives differently, labelled, in the user's units, grouped by kind. */
  protected readonly recomputeGroups = computed<DifferenceGroup[]>(() => {
    const a = this.approval();
    if (a.status !== 'ready' || 'error' in a.value.recompute) return [];
    return differenceGroups(a.value.recompute.differences, resultWords, this.units());
  });

  // ---- revise ----
  protected readonly revising = signal(false);
  protected readonly reviseName = signal('');
  protected readonly reviseFront = signal('');
  protected readonly reviseRear = signal('');
  protected readonly reviseProfile = signal<TrackProfileId>('smooth-circuit');
  protected readonly reviseLatest = signal(false);
  protected readonly reviseMessage = signal('');
  protected readonly reviseError = signal<string | null>(null);
  protected readonly fronts = computed(() => this.designs().filter((d) => d.axle === 'front'));
  protected readonly rears = computed(() => this.designs().filter((d) => d.axle === 'rear'));

  // ---- compare ----
  protected readonly compareARevision = signal('');
  protected readonly compareB = linkedSignal(() => this.configurationId());
  protected readonly compareBRevision = signal('');
  /** The comparison asked for with "Compare" (none until then). */
  private readonly compareRequest = signal<{ a: { id: string; revision?: number }; b: { id: string; revision?: number } } | undefined>(undefined);
  private readonly comparisonResource = rxResource({
    params: () => {
      const r = this.compareRequest();
      return r ? { teamId: this.teamId(), ...r } : undefined;
    },
    stream: ({ params: p }) => this.api.compare(p.teamId, p.a, p.b),
  });
  protected readonly comparison = loadState<CompareAnswer>(this.comparisonResource);
  protected readonly compared = computed(() => this.compareRequest() !== undefined);
  protected readonly compareChoices = computed(() => this.others());
  /** The comparison's changed inputs and results, labelled, in the user's units, grouped by kind. */
  protected readonly compareTables = computed(() => {
    const k = this.comparison();
    if (k.status !== 'ready') return [];
    const units = this.units();
    return [
      { caption: 'Changed inputs', head: 'Input', testId: 'compare-inputs', count: k.value.inputs.length, none: 'No input differs.', groups: differenceGroups(k.value.inputs, inputWords, units) },
      { caption: 'Changed results', head: 'Result', testId: 'compare-results', count: k.value.results.length, none: 'No result differs.', groups: differenceGroups(k.value.results, resultWords, units) },
    ];
  });

  protected loadAll(): void {
    this.configResource.reload();
  }

  /** The cautions of both corners on the configuration's track profile; a corner that cannot be measured says why in its place. */
  private async measureCautions(teamId: string, c: Configuration): Promise<readonly AxleCautions[]> {
    const [vehicle, front, rear] = await Promise.all([
      firstValueFrom(this.api.vehicleRevision(teamId, c.vehicle.id, c.vehicle.revision)),
      firstValueFrom(this.api.designRevision(teamId, c.front.designId, c.front.revision)),
      firstValueFrom(this.api.designRevision(teamId, c.rear.designId, c.rear.revision)),
    ]);
    const p = trackProfiles[c.trackProfile];
    const [fromMm, toMm] = p.travelMm;
    const out: AxleCautions[] = [];
    for (const [axle, corner] of [['front', front.corner], ['rear', rear.corner]] as const) {
      try {
        const a = await this.engine.analyse({
          corner,
          travel: { from: fromMm, to: toMm, step: (toMm - fromMm) / 20 },
          rackMm: [0],
          roll: { from: -2, to: 2, step: 1 },
          pose: { travelMm: 0, rackMm: 0 },
          cautions: { axle, trackProfile: { id: c.trackProfile }, vehicleData: vehicle.data },
        });
        const k = a.cautions;
        out.push(
          k && k.ok
            ? { axle, ok: true, list: k.list, bumpCost: k.bumpCost, bumpCostUnavailable: k.bumpCostUnavailable }
            : { axle, ok: false, message: k && !k.ok ? k.failure.message : 'No cautions were measured.' },
        );
      } catch (error) {
        out.push({ axle, ok: false, message: error instanceof AnalysisError ? error.failure.message : String(error) });
      }
    }
    return out;
  }

  /** "On this page": the page's sections, in order (the approval snapshot once there is one). */
  protected readonly sections = computed<PageSection[]>(() => [
    { id: 'rw-inputs-title', label: 'What it pins' },
    { id: 'rw-review-title', label: 'Review' },
    { id: 'rw-results-title', label: 'Results' },
    { id: 'rw-rig-section', label: 'Rig measurements' },
    ...(this.approvals().length > 0 ? [{ id: 'rw-approval-title', label: 'Approval snapshot' }] : []),
    { id: 'rw-studies-title', label: 'Studies' },
    { id: 'rw-comments-title', label: 'Comments' },
    { id: 'rw-history-title', label: 'History' },
    { id: 'rw-compare-title', label: 'Compare' },
  ]);
  protected showApproval(id: string): void {
    this.approvalId.set(id);
  }

  protected async act(a: ActionSpec): Promise<void> {
    const c = this.current();
    if (!c || this.stepBusy()) return;
    const message = this.stepMessage().trim();
    if (a.needsMessage && !message) {
      this.stepError.set(`Say what needs rework (the message is required for “${a.label}”).`);
      return;
    }
    this.stepBusy.set(true);
    this.stepError.set(null);
    this.stepNotice.set(null);
    try {
      const gate = await this.gateFor(a, c);
      if (gate === null) return;
      const after = await firstValueFrom(this.api.act(this.teamId(), c.id, a.action, c.revision, message || undefined, gate));
      this.configResource.set(after);
      this.stepMessage.set('');
      this.stepNotice.set(`${a.label}: done. The configuration is now ${STATUS_WORDS[after.status].label.toLowerCase()}.`);
    } catch (error) {
      const p = apiProblem(error);
      this.stepError.set(p.code === 'own_revision' ? `${p.message}.` : problemText(error));
      if (p.code === 'stale_revision' || p.code === 'invalid_transition') this.configResource.reload();
    } finally {
      this.stepBusy.set(false);
    }
  }

  /**
   * The gate of a sign-off or of the move to validated, asked of the server (the Critical cautions it
   * measures, the rig evidence against the team's tolerance): the dialog collects a reason for each
   * Critical caution, or a waiver for each axle without evidence. `{}` when nothing is asked, null when
   * the reviewer cancelled.
   */
  private async gateFor(a: ActionSpec, c: Configuration): Promise<GateBody | null> {
    if (a.action !== 'approve' && a.action !== 'validate') return {};
    const gates = await firstValueFrom(this.api.gates(this.teamId(), c.id));
    const needed = a.action === 'approve' ? gates.critical.length > 0 : gates.rig.axles.some((x) => !x.satisfied);
    if (!needed) return {};
    const data: ReviewGateDialogData = { mode: a.action === 'approve' ? 'sign-off' : 'validate', configurationName: c.name, gates };
    const body = await firstValueFrom(this.dialog.open<ReviewGateDialog, ReviewGateDialogData, GateBody>(ReviewGateDialog, { data, width: '40rem', maxWidth: '95vw' }).afterClosed());
    return body ?? null;
  }

  /** "Comment" beside a result: the new comment points at it, and the keyboard focus moves to the comment box. */
  protected commentOn(ref: string): void {
    this.commentTarget.set(ref);
    queueMicrotask(() => this.commentsPanel()?.focus());
  }

  protected openRevise(): void {
    const c = this.current();
    if (!c) return;
    this.reviseName.set(c.name);
    this.reviseFront.set(c.front.designId);
    this.reviseRear.set(c.rear.designId);
    this.reviseProfile.set(c.trackProfile);
    this.reviseLatest.set(false);
    this.reviseMessage.set('');
    this.reviseError.set(null);
    this.revising.set(true);
  }

  protected async revise(): Promise<void> {
    const c = this.current();
    if (!c || this.stepBusy()) return;
    const name = this.reviseName().trim();
    const latest = this.reviseLatest();
    const change: { -readonly [K in keyof ConfigurationChange]: ConfigurationChange[K] } = { baseRevision: c.revision };
    if (!name) {
      this.reviseError.set('The name is required.');
      return;
    }
    if (name !== c.name) change.name = name;
    if (latest) change.vehicleId = c.vehicle.id;
    if (latest || this.reviseFront() !== c.front.designId) change.frontDesignId = this.reviseFront();
    if (latest || this.reviseRear() !== c.rear.designId) change.rearDesignId = this.reviseRear();
    if (this.reviseProfile() !== c.trackProfile) change.trackProfile = this.reviseProfile();
    if (Object.keys(change).length === 1) {
      this.reviseError.set('Change at least one thing: the name, a design, the track profile, or bring the revisions up to date.');
      return;
    }
    if (this.reviseMessage().trim()) change.message = this.reviseMessage().trim();
    this.stepBusy.set(true);
    this.reviseError.set(null);
    try {
      if (latest) {
        // Show what the latest revisions change before anything is saved; save exactly the revisions shown.
        const preview = await firstValueFrom(this.api.latestPreview(this.teamId(), c.id));
        const data: LatestPreviewDialogData = { configurationName: c.name, preview };
        const ok = await firstValueFrom(this.dialog.open<LatestPreviewDialog, LatestPreviewDialogData, boolean>(LatestPreviewDialog, { data, width: '52rem', maxWidth: '95vw' }).afterClosed());
        if (!ok) return;
        change.vehicleRevision = preview.latest.vehicleRevision;
        if (change.frontDesignId === preview.latest.frontDesignId) change.frontDesignRevision = preview.latest.frontDesignRevision;
        if (change.rearDesignId === preview.latest.rearDesignId) change.rearDesignRevision = preview.latest.rearDesignRevision;
      }
      const after = await firstValueFrom(this.api.revise(this.teamId(), c.id, change));
      this.configResource.set(after);
      this.revising.set(false);
      this.stepNotice.set(`Saved as revision ${after.revision}; the configuration is a draft again.`);
    } catch (error) {
      this.reviseError.set(problemText(error));
      if (apiProblem(error).code === 'stale_revision') this.configResource.reload();
    } finally {
      this.stepBusy.set(false);
    }
  }

  /** Archive (hidden from the list, kept with its history and approvals; never deleted) or restore. */
  protected async setArchived(archived: boolean): Promise<void> {
    const c = this.current();
    if (!c || this.stepBusy()) return;
    this.stepBusy.set(true);
    this.stepError.set(null);
    try {
      const after = await firstValueFrom(this.api.setArchived(this.teamId(), c.id, archived));
      this.configResource.set(after);
      this.stepNotice.set(archived ? 'Archived: hidden from the list (shown with “Show archived”), kept with its history and approvals.' : 'Restored to the list.');
    } catch (error) {
      this.stepError.set(problemText(error));
    } finally {
      this.stepBusy.set(false);
    }
  }

  protected compare(): void {
    const c = this.current();
    if (!c) return;
    const b = this.compareB() || c.id;
    this.compareRequest.set({
      a: { id: c.id, ...(this.compareARevision() ? { revision: Number(this.compareARevision()) } : {}) },
      b: { id: b, ...(this.compareBRevision() ? { revision: Number(this.compareBRevision()) } : {}) },
    });
  }

  /** Compares one of this configuration's revisions with its current one. */
  protected compareRevision(revision: number): void {
    const c = this.current();
    if (!c) return;
    this.compareARevision.set(String(revision));
    this.compareB.set(c.id);
    this.compareBRevision.set('');
    this.compare();
  }

  protected configName(id: string): string {
    return this.others().find((o) => o.id === id)?.name ?? 'another configuration';
  }

  protected profileLabel(id: string): string {
    return trackProfiles[id as TrackProfileId]?.label ?? id;
  }

  protected statusLabel(s: string): string {
    return STATUS_WORDS[s as keyof typeof STATUS_WORDS]?.label ?? s;
  }

  protected readonly value = inputValue;

}
