import { BumpCostView } from '../bump-cost';
import type { BumpCost } from '../../../../shared/ride/cost';
import { RigMeasurementsPanel } from '../rig/rig-measurements-panel';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked, viewChild } from '@angular/core';
import { RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatDialog } from '@angular/material/dialog';
import { ReviewGateDialog, type ReviewGateDialogData } from './review-gate-dialog';
import { LatestPreviewDialog, type LatestPreviewDialogData } from './latest-preview-dialog';
import { firstValueFrom } from 'rxjs';
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
import { ActionSpec, actionsFor, CHART_REFS, type DifferenceGroup, differenceGroups, inputWords, type KeyFigure, keyFigures, problemText, resultWords, STATUS_WORDS } from './review-words';
import { browserTimeZone, formatLocalTime } from '../../core/time/local-time';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { displayDecimals, inDisplayUnits, type QuantityKind, unitLabel } from '../../core/format/quantities';
import { StatusChip } from './status-chip';
import { NumPipe } from '../../core/format/num-pipe';
import { routeKey } from '../route-params';
import type { AxleName } from '../../../../shared/schema/axle';
import { MatCheckbox } from '@angular/material/checkbox';
import { PageSection, SectionNav } from '../../core/layout/section-nav';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';

type Load<T> = { kind: 'loading' } | { kind: 'error'; message: string } | { kind: 'ready'; value: T };

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
    // Loads on arrival and again when the router reuses this page for other route parameters.
    effect(() => {
      routeKey(this.teamId(), this.configurationId());
      untracked(() => {
        void this.loadAll();
      });
    });
  }

  protected localTime(iso: string): string {
    return formatLocalTime(iso, this.timeZone);
  }
  protected readonly profiles = Object.values(trackProfiles);
  protected readonly statusWords = STATUS_WORDS;

  protected readonly config = signal<Load<Configuration>>({ kind: 'loading' });
  protected readonly results = signal<Load<ResultsAnswer>>({ kind: 'loading' });
  protected readonly cautions = signal<Load<readonly AxleCautions[]>>({ kind: 'loading' });
  protected readonly history = signal<readonly TransitionRow[]>([]);
  protected readonly revisions = signal<readonly ConfigurationRevision[]>([]);
  protected readonly approvals = signal<readonly ApprovalSummary[]>([]);
  protected readonly approval = signal<Load<ApprovalDetail> | null>(null);
  protected readonly others = signal<readonly Configuration[]>([]);
  protected readonly designs = signal<readonly AxleDesignSummary[]>([]);

  protected readonly current = computed(() => {
    const c = this.config();
    return c.kind === 'ready' ? c.value : null;
  });
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
    return r.kind === 'ready' ? keyFigures(r.value.results).map((f) => this.inUnits(f)) : [];
  });
  protected readonly budgetGroups = computed<BarGroup[]>(() => {
    const r = this.results();
    if (r.kind !== 'ready') return [];
    const b = r.value.results.balance.understeerBudget;
    return BUDGET_TERMS.map(([key, label]) => ({ label, values: [b[key]] }));
  });
  protected readonly yawGain = computed<LineSeries[]>(() => {
    const r = this.results();
    if (r.kind !== 'ready') return [];
    const rows = r.value.results.balance.gains.rows;
    const units = this.units();
    return [{ name: 'Yaw-rate gain', points: rows.filter((g) => g.yawRateGainPerS !== null).map((g) => ({ x: inDisplayUnits(g.speedKph, 'speed', units), y: g.yawRateGainPerS! })) }];
  });
  protected readonly speedUnit = computed(() => unitLabel('speed', this.units()));
  protected readonly refOptions = computed<RefOption[]>(() => {
    const out: RefOption[] = [{ ref: 'budget', label: 'Understeer budget' }];
    for (const [name, label] of Object.entries(CHART_REFS)) out.push({ ref: `chart:${name}`, label });
    const c = this.cautions();
    if (c.kind === 'ready') {
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
    if (!a || a.kind !== 'ready') return [];
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
    if (!a || a.kind !== 'ready' || 'error' in a.value.recompute) return [];
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
  protected readonly compareB = signal('');
  protected readonly compareBRevision = signal('');
  protected readonly comparison = signal<Load<CompareAnswer> | null>(null);
  protected readonly compareChoices = computed(() => this.others());
  /** The comparison's changed inputs and results, labelled, in the user's units, grouped by kind. */
  protected readonly compareTables = computed(() => {
    const k = this.comparison();
    if (!k || k.kind !== 'ready') return [];
    const units = this.units();
    return [
      { caption: 'Changed inputs', head: 'Input', testId: 'compare-inputs', count: k.value.inputs.length, none: 'No input differs.', groups: differenceGroups(k.value.inputs, inputWords, units) },
      { caption: 'Changed results', head: 'Result', testId: 'compare-results', count: k.value.results.length, none: 'No result differs.', groups: differenceGroups(k.value.results, resultWords, units) },
    ];
  });

  protected async loadAll(): Promise<void> {
    this.config.set({ kind: 'loading' });
    try {
      const [c] = await Promise.all([firstValueFrom(this.api.get(this.teamId(), this.configurationId())), firstValueFrom(this.access.load(this.teamId())).catch(() => null)]);
      this.config.set({ kind: 'ready', value: c });
      this.compareB.set(c.id);
      void this.loadResults(c);
      void this.loadSide(c);
    } catch (error) {
      this.config.set({ kind: 'error', message: apiProblem(error).message });
    }
  }

  /** History, revisions, approvals and the team's other configurations (for compare). */
  private async loadSide(c: Configuration): Promise<void> {
    const [history, revisions, approvals, others, designs] = await Promise.all([
      firstValueFrom(this.api.history(this.teamId(), c.id)).catch(() => []),
      firstValueFrom(this.api.revisions(this.teamId(), c.id)).catch(() => []),
      firstValueFrom(this.api.approvals(this.teamId(), c.id)).catch(() => []),
      firstValueFrom(this.api.list(this.teamId())).catch(() => []),
      firstValueFrom(this.features.axleDesigns(this.teamId(), c.vehicle.id)).catch(() => []),
    ]);
    this.history.set(history);
    this.revisions.set(revisions);
    this.approvals.set(approvals);
    this.others.set(others.some((o) => o.id === c.id) ? others : [c, ...others]);
    this.designs.set(designs);
    if (approvals[0]) void this.showApproval(approvals[0].id);
    else this.approval.set(null);
  }

  private async loadResults(c: Configuration): Promise<void> {
    this.results.set({ kind: 'loading' });
    this.cautions.set({ kind: 'loading' });
    try {
      this.results.set({ kind: 'ready', value: await firstValueFrom(this.api.results(this.teamId(), c.id)) });
    } catch (error) {
      this.results.set({ kind: 'error', message: problemText(error) });
    }
    await this.loadCautions(c);
  }

  /** The cautions of both corners on the configuration's track profile, measured in the browser's kinematics worker. */
  private async loadCautions(c: Configuration): Promise<void> {
    try {
      const [vehicle, front, rear] = await Promise.all([
        firstValueFrom(this.api.vehicleRevision(this.teamId(), c.vehicle.id, c.vehicle.revision)),
        firstValueFrom(this.api.designRevision(this.teamId(), c.front.designId, c.front.revision)),
        firstValueFrom(this.api.designRevision(this.teamId(), c.rear.designId, c.rear.revision)),
      ]);
      const p = trackProfiles[c.trackProfile];
      const [from, to] = p.travelMm;
      const out: AxleCautions[] = [];
      for (const [axle, corner] of [['front', front.corner], ['rear', rear.corner]] as const) {
        try {
          const a = await this.engine.analyse({
            corner,
            travel: { from, to, step: (to - from) / 20 },
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
      this.cautions.set({ kind: 'ready', value: out });
    } catch (error) {
      this.cautions.set({ kind: 'error', message: problemText(error) });
    }
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
  /** The approval shown in the snapshot section. */
  protected readonly approvalId = signal<string | null>(null);

  protected async showApproval(id: string): Promise<void> {
    this.approvalId.set(id);
    this.approval.set({ kind: 'loading' });
    try {
      this.approval.set({ kind: 'ready', value: await firstValueFrom(this.api.approval(this.teamId(), this.configurationId(), id)) });
    } catch (error) {
      this.approval.set({ kind: 'error', message: problemText(error) });
    }
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
      this.config.set({ kind: 'ready', value: after });
      this.stepMessage.set('');
      this.stepNotice.set(`${a.label}: done. The configuration is now ${STATUS_WORDS[after.status].label.toLowerCase()}.`);
      await this.loadSide(after);
    } catch (error) {
      const p = apiProblem(error);
      this.stepError.set(p.code === 'own_revision' ? `${p.message}.` : problemText(error));
      if (p.code === 'stale_revision' || p.code === 'invalid_transition') void this.reloadConfig();
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

  private async reloadConfig(): Promise<void> {
    try {
      const c = await firstValueFrom(this.api.get(this.teamId(), this.configurationId()));
      this.config.set({ kind: 'ready', value: c });
    } catch {
      /* the error shown stays */
    }
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
      this.config.set({ kind: 'ready', value: after });
      this.revising.set(false);
      this.stepNotice.set(`Saved as revision ${after.revision}; the configuration is a draft again.`);
      void this.loadResults(after);
      await this.loadSide(after);
    } catch (error) {
      this.reviseError.set(problemText(error));
      if (apiProblem(error).code === 'stale_revision') void this.reloadConfig();
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
      this.config.set({ kind: 'ready', value: after });
      this.stepNotice.set(archived ? 'Archived: hidden from the list (shown with “Show archived”), kept with its history and approvals.' : 'Restored to the list.');
    } catch (error) {
      this.stepError.set(problemText(error));
    } finally {
      this.stepBusy.set(false);
    }
  }

  protected async compare(): Promise<void> {
    const c = this.current();
    if (!c) return;
    const b = this.compareB() || c.id;
    this.comparison.set({ kind: 'loading' });
    try {
      const value = await firstValueFrom(
        this.api.compare(
          this.teamId(),
          { id: c.id, ...(this.compareARevision() ? { revision: Number(this.compareARevision()) } : {}) },
          { id: b, ...(this.compareBRevision() ? { revision: Number(this.compareBRevision()) } : {}) },
        ),
      );
      this.comparison.set({ kind: 'ready', value });
    } catch (error) {
      this.comparison.set({ kind: 'error', message: problemText(error) });
    }
  }

  /** Compares one of this configuration's revisions with its current one. */
  protected compareRevision(revision: number): void {
    const c = this.current();
    if (!c) return;
    this.compareARevision.set(String(revision));
    this.compareB.set(c.id);
    this.compareBRevision.set('');
    void this.compare();
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

  protected value(event: Event): string {
    return (event.target as HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement).value;
  }

}
