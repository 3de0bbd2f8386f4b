import { ChangeDetectionStrategy, Component, computed, effect, inject, input, linkedSignal, signal, untracked } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatCheckbox } from '@angular/material/checkbox';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatRadioButton, MatRadioGroup } from '@angular/material/radio';
import { MatOption, MatSelect } from '@angular/material/select';
import { catchError, firstValueFrom, forkJoin, map, of, switchMap } from 'rxjs';
import type { ProposalDetails, SolveResult } from '../../../../shared/intent/index';
import { trackProfiles, type TrackProfileId } from '../../../../shared/tracks/profiles';
import { innerName, outerName } from '../../../../shared/schema/steering-link';
import { intentSchema } from '../../../../shared/schema/intent';
import { vehicleSchema } from '../../../../shared/schema/vehicle';
import { issueWords, wordNumber, type FigureWords } from '../../../../shared/schema/issue-words';
import { apiProblem } from '../../core/http/api-error';
import { loadState } from '../../core/http/load-state';
import { TeamAccess } from '../../core/teams/team-access';
import { IntentCharts } from './intent-charts';
import { AnalysisError, AnalysisSuperseded } from '../../workers/kinematics-client';
import { IntentClient } from '../../workers/intent-client';
import { failureWords } from '../../workers/failure-words';
import { AxleDesign, FeaturesApi } from '../features-api';
import { rollSteerWords } from '../../../../shared/balance/roll-steer-words';
import { SafetyCaution } from '../safety-caution';
import { parseDecimal } from '../axle-design/hardpoint-io';
import { pointName } from '../axle-design/hardpoint-model';
import { CautionList } from './caution-list';
import { BumpCostView } from '../bump-cost';
import { NumPipe, DISPLAY_UNITS } from '../../core/format/num-pipe';
import { formatNum } from '../../core/format/num';
import { fromDisplayUnits, inDisplayUnits, unitLabel, type QuantityKind } from '../../core/format/quantities';
import { RigApi, type RigMeasurementDetail } from '../rig/rig-api';

/** Rig files drawn over the toe curves at most (the newest). */
const RIG_OVERLAYS = 3;

export type TargetKind = 'epsilon' | 'toePerRoll' | 'understeer' | 'zeroBump';

interface MovableRow {
  readonly name: string;
  readonly label: string;
  /** Current value, mm. */
  readonly current: number;
  /** rack.z bounds are offsets from the current height; all others absolute. */
  readonly offset: boolean;
}

interface MovableState {
  readonly on: boolean;
  /** Bounds as typed, in the user's length unit. */
  readonly min: string;
  readonly max: string;
}

/** The target as asked, kept with the result it produced. */
interface AskedTarget {
  readonly kind: TargetKind;
  readonly value: number | null;
}

/** A solve result and the entries that produced it. */
interface Solved {
  readonly result: SolveResult;
  /** The solve's inputs (the intent without its workshop options), to tell when the entries have moved on. */
  readonly key: string;
  readonly asked: AskedTarget;
}

/** Where an entry's problems are shown: beside its field. */
type FieldKey = 'target' | 'movable' | `bound:${string}` | 'travel' | 'bump' | 'budget' | 'shim' | 'pitch' | 'reach' | 'stack' | 'general';

const DEFAULT_HALF_RANGE_MM = 20;
const WORKSHOP_OPTION_KEYS = ['shimThicknessMm', 'threadPitchMm', 'adjuster', 'adjusterReachMm', 'shimStackMaxMm'] as const;
const OPTION_FIELDS: Readonly<Record<string, FieldKey>> = {
  bumpYawBudgetPct: 'budget',
  shimThicknessMm: 'shim',
  threadPitchMm: 'pitch',
  adjusterReachMm: 'reach',
  shimStackMaxMm: 'stack',
};
/** Workshop defaults (the intent schema's), mm. */
const WORKSHOP_DEFAULTS_MM = { shim: 1, pitch: 1.5, reach: 5, stack: 10 } as const;


/**
 * Intent panel: what an axle should do in roll, what may move and within
 * which package, on which kind of track; runs the back-solver in a Web
 * Worker with progress, shows the verified result beside the target asked
 * (marked out of date as soon as an entry changes), lets the user pick any
 * member of the solution family and works it out for the workshop (curves
 * over the current ones, shims and adjuster with the user's shim and thread,
 * as-built ε, sensitivities), with the cautions beside it, and proposes the
 * geometry as a draft revision for a designer to accept. Every number is in
 * the user's unit system.
 */
@Component({
  selector: 'rw-intent-page',
  imports: [
    NumPipe,
    RouterLink,
    MatButton,
    MatProgressBar,
    MatCheckbox,
    MatFormField,
    MatLabel,
    MatInput,
    MatRadioGroup,
    MatRadioButton,
    MatSelect,
    MatOption,
    IntentCharts,
    SafetyCaution,
    CautionList,
    BumpCostView,
  ],
  templateUrl: './intent-page.html',
  styleUrl: './intent-page.scss',
  providers: [IntentClient],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class IntentPage {
  private readonly api = inject(FeaturesApi);
  private readonly access = inject(TeamAccess);
  private readonly solver = inject(IntentClient);
  private readonly rig = inject(RigApi);
  protected readonly units = inject(DISPLAY_UNITS);

  readonly teamId = input.required<string>();
  readonly vehicleId = input.required<string>();
  readonly designId = input.required<string>();

  /**
   * The axle design, the team's permissions and the vehicle's data (null where the vehicle cannot be read:
   * the understeer target then waits for it), loaded again when the router reuses this page.
   */
  private readonly loaded = rxResource({
    params: () => ({ teamId: this.teamId(), vehicleId: this.vehicleId(), designId: this.designId() }),
    stream: ({ params: p }) =>
      forkJoin({ design: this.api.axleDesign(p.teamId, p.designId), access: this.access.load(p.teamId) }).pipe(
        switchMap(({ design }) =>
          this.api.vehicle(p.teamId, p.vehicleId).pipe(
            map((v): unknown => v.data),
            catchError(() => of(null)),
            map((vehicle) => ({ design, vehicle })),
          ),
        ),
      ),
  });
  protected readonly state = loadState(this.loaded);
  protected readonly design = computed<AxleDesign | null>(() => {
    const s = this.state();
    return s.status === 'ready' ? s.value.design : null;
  });
  protected readonly vehicleData = computed<unknown>(() => {
    const s = this.state();
    return s.status === 'ready' ? s.value.vehicle : null;
  });
  protected readonly canPropose = computed(() => this.access.can('design:propose'));

  /** The user's length unit ("mm" or "in"). */
  protected readonly lengthUnit = computed(() => unitLabel('length', this.units()));

  protected readonly targetKind = signal<TargetKind>('epsilon');
  protected readonly targetText = signal('');
  protected readonly profileId = signal<TrackProfileId>('smooth-circuit');
  protected readonly travelFromText = signal('');
  protected readonly travelToText = signal('');
  protected readonly bumpText = signal('');
  /** Optional bump-cost budget: RMS yaw-rate disturbance on the profile's road, % of the steady yaw rate (empty: none). */
  protected readonly budgetText = signal('');
  protected readonly movable = signal<Readonly<Record<string, MovableState>>>({});
  // Workshop: the user's shims and thread, in the user's length unit.
  protected readonly shimText = signal('');
  protected readonly pitchText = signal('');
  protected readonly adjusterKind = signal<'single-thread' | 'turnbuckle'>('single-thread');
  protected readonly reachText = signal('');
  protected readonly stackText = signal('');

  protected readonly profiles = Object.values(trackProfiles);

  protected readonly running = signal(false);
  protected readonly progress = signal(0);
  protected readonly progressMessage = signal('');
  /** Why the last solve did not finish, with the target it was asked for. */
  protected readonly failure = signal<{ message: string; asked: AskedTarget } | null>(null);
  protected readonly solved = signal<Solved | null>(null);
  protected readonly proposeMessage = signal('');
  protected readonly proposing = signal(false);
  protected readonly proposed = signal<string | null>(null);
  protected readonly proposeError = signal<string | null>(null);

  /** Rig measurements of this revision at rack 0 (the current geometry as built), drawn over the toe curves. */
  protected readonly rigFiles = signal<readonly RigMeasurementDetail[]>([]);

  protected readonly vehicleValid = computed(() => vehicleSchema.safeParse(this.vehicleData()).success);

  protected readonly movableRows = computed<MovableRow[]>(() => {
    const d = this.design();
    if (!d) return [];
    const c = d.corner;
    const inner = innerName(c);
    const outer = outerName(c);
    const p = c.points as Record<string, [number, number, number]>;
    const rows: MovableRow[] = [
      { name: `${inner}.z`, label: `${pointName(`points.${inner}`, c)}: height z`, current: p[inner]![2], offset: false },
      { name: `${outer}.z`, label: `${pointName(`points.${outer}`, c)}: height z`, current: p[outer]![2], offset: false },
      { name: `${inner}.y`, label: `${pointName(`points.${inner}`, c)}: lateral y`, current: p[inner]![1], offset: false },
      { name: `${outer}.x`, label: `${pointName(`points.${outer}`, c)}: fore-aft x`, current: p[outer]![0], offset: false },
    ];
    if (c.steered && c.type !== 'five-link') rows.push({ name: 'rack.z', label: 'Rack height change (both sides)', current: 0, offset: true });
    return rows;
  });

  /** Coordinate names in words, for messages and tables. */
  protected readonly coordinateLabels = computed<Readonly<Partial<Record<string, string>>>>(() => Object.fromEntries(this.movableRows().map((r) => [r.name, r.label])));

  // ---- the entries as an intent document, checked by the shared intent schema ----

  /** A length typed in the user's unit, in mm (NaN when it is not a number, so the schema says so). */
  private mm(text: string): number {
    const v = parseDecimal(text);
    if (v === null) return NaN;
    return fromDisplayUnits(v, 'length', this.units());
  }

  private number(text: string): number {
    return parseDecimal(text) ?? NaN;
  }

  /** The intent document of shared/schema/intent.ts built from the entries (workshop options included). */
  intentDocument(): Record<string, unknown> {
    const d = this.design()!;
    const value = this.number(this.targetText());
    const kind = this.targetKind();
    const target =
      kind === 'epsilon'
        ? { rollSteerCoefficient: value }
        : kind === 'toePerRoll'
          ? { rollSteerCoefficient: -value }
          : kind === 'understeer'
            ? { understeerChangeDegPerG: value }
            : { zeroBumpSteer: true };
    const on = this.movableRows().filter((r) => this.movable()[r.name]?.on);
    const bounds: Record<string, [number, number]> = {};
    for (const r of on) {
      const s = this.movable()[r.name]!;
      bounds[r.name] = [this.mm(s.min), this.mm(s.max)];
    }
    return {
      formatVersion: 1,
      corner: d.corner,
      axle: d.axle,
      target,
      movable: on.map((r) => r.name),
      bounds,
      trackProfile: {
        id: this.profileId(),
        travelMm: [this.mm(this.travelFromText()), this.mm(this.travelToText())],
        bumpHeightMm: this.mm(this.bumpText()),
      },
      ...(this.vehicleValid() ? { vehicle: this.vehicleData() } : {}),
      options: {
        ...(this.budgetText().trim() !== '' ? { bumpYawBudgetPct: this.number(this.budgetText()) } : {}),
        shimThicknessMm: this.mm(this.shimText()),
        threadPitchMm: this.mm(this.pitchText()),
        adjuster: this.adjusterKind(),
        adjusterReachMm: this.mm(this.reachText()),
        shimStackMaxMm: this.mm(this.stackText()),
      },
    };
  }

  private readonly document = computed(() => (this.design() ? this.intentDocument() : null));

  /** The solve's inputs without the workshop options (those only change the workshop numbers). */
  private readonly solveKey = computed(() => {
    const doc = this.document();
    if (!doc) return '';
    const options = { ...(doc['options'] as Record<string, unknown>) };
    for (const k of WORKSHOP_OPTION_KEYS) delete options[k];
    return JSON.stringify({ ...doc, options });
  });

  /**
   * Every problem with the entries, beside the field it concerns, all at once. The rules are the
   * shared intent schema's (the same the server and the solver apply), in the user's words; bounds
   * that leave out the current geometry are the form's own advice.
   */
  protected readonly fieldErrors = computed<Readonly<Partial<Record<FieldKey, string[]>>>>(() => {
    const doc = this.document();
    if (!doc) return {};
    const out: Partial<Record<FieldKey, string[]>> = {};
    const add = (k: FieldKey, m: string) => (out[k] = [...(out[k] ?? []), m]);
    const on = this.movableRows().filter((r) => this.movable()[r.name]?.on);
    if (on.length === 0) add('movable', 'choose at least one coordinate that may move');
    for (const r of on) {
      const s = this.movable()[r.name]!;
      const lo = this.mm(s.min);
      const hi = this.mm(s.max);
      if (!r.offset && lo < hi && (r.current < lo || r.current > hi)) add(`bound:${r.name}`, `the bounds must include the current ${formatNum(r.current, { kind: 'length' }, this.units())} ${this.lengthUnit()}`);
    }
    const checked = intentSchema.safeParse(doc);
    if (checked.success) return out;
    const labels: Record<string, string> = { 'rack.z': 'the rack height' };
    for (const r of this.movableRows()) labels[r.name] = r.label;
    for (const issue of checked.error.issues) {
      if (issue.path[0] === 'movable' && on.length === 0) continue;
      add(this.fieldOf(issue.path, doc), issueWords(issue, doc, labels, this.figureWords));
    }
    return out;
  });

  /** A figure of an entry problem in the user's units (lengths in inches for an inch/pound user). */
  private readonly figureWords: FigureWords = (v, unit) =>
    unit === 'mm' ? { value: wordNumber(inDisplayUnits(v, 'length', this.units())), unit: this.lengthUnit() } : { value: wordNumber(v), unit };

  private fieldOf(path: ReadonlyArray<PropertyKey>, doc: Record<string, unknown>): FieldKey {
    const [a, b] = path;
    if (a === 'target') return 'target';
    if (a === 'bounds' && typeof b === 'string') return `bound:${b}`;
    if (a === 'movable') return typeof b === 'number' ? `bound:${(doc['movable'] as string[])[b]}` : 'movable';
    if (a === 'trackProfile') return b === 'bumpHeightMm' ? 'bump' : 'travel';
    if (a === 'options' && typeof b === 'string') return OPTION_FIELDS[b] ?? 'general';
    return 'general';
  }

  protected errorsOf(key: FieldKey): readonly string[] {
    return this.fieldErrors()[key] ?? [];
  }

  protected boundErrors(name: string): readonly string[] {
    return this.errorsOf(`bound:${name}`);
  }

  protected sensitivityOf(d: ProposalDetails, name: string): number | null {
    return d.sensitivity[name] ?? null;
  }

  /** Problems that keep the solve from running (the workshop entries only hold back the workshop numbers). */
  protected readonly blocking = computed(() =>
    Object.entries(this.fieldErrors())
      .filter(([k]) => !['shim', 'pitch', 'reach', 'stack'].includes(k))
      .reduce((n, [, m]) => n + (m?.length ?? 0), 0),
  );
  protected readonly workshopBlocked = computed(() => ['shim', 'pitch', 'reach', 'stack'].some((k) => (this.fieldErrors()[k as FieldKey]?.length ?? 0) > 0));

  protected readonly axle = computed(() => this.design()?.axle ?? 'rear');

  /** What the typed target means on this axle ("roll understeer"), beside the field. */
  protected readonly targetWords = computed(() => {
    const v = parseDecimal(this.targetText());
    if (v === null) return '';
    if (this.targetKind() === 'epsilon') return rollSteerWords(v, this.axle());
    if (this.targetKind() === 'toePerRoll') return rollSteerWords(-v, this.axle());
    return '';
  });

  /** The target asked for, in words: "ε = 0.02 deg/deg (roll understeer)". */
  protected askedWords(t: AskedTarget): string {
    if (t.kind === 'zeroBump') return 'zero bump steer';
    if (t.value === null) return '';
    const n = formatNum(t.value, { sig: 4 });
    if (t.kind === 'epsilon') return `ε = ${n} deg/deg (${rollSteerWords(t.value, this.axle())})`;
    if (t.kind === 'toePerRoll') return `${n} deg of outside-wheel toe-in per deg of roll (${rollSteerWords(-t.value, this.axle())})`;
    return `${n} deg/g of understeer-gradient change`;
  }

  // ---- the result, and whether it still belongs to the entries ----

  protected readonly result = computed(() => this.solved()?.result ?? null);
  /** The entries changed since the result was solved: it is shown marked out of date. */
  protected readonly outOfDate = computed(() => {
    const s = this.solved();
    return s !== null && s.key !== this.solveKey();
  });

  /** Members the user may choose from: the family, or (infeasible) the closest geometry alone. */
  protected readonly members = computed(() => {
    const r = this.result();
    if (!r) return [];
    if (r.family.length > 0) return r.family.map((m, i) => ({ index: i, coordinates: m.coordinates, solverPick: m.chosen, member: m }));
    return [{ index: 0, coordinates: Object.fromEntries(r.coordinates.map((c) => [c.name, c.proposedMm])), solverPick: true, member: null }];
  });
  /** The member shown and worked out: the solver's pick until the user picks another. */
  protected readonly selected = linkedSignal(() => Math.max(0, this.members().findIndex((m) => m.solverPick)));
  protected readonly selectedMember = computed(() => this.members()[this.selected()] ?? null);

  /** The workshop entries as the intent carries them (they change the workshop numbers, never the solve). */
  private readonly workshopKey = computed(() => {
    const options = (this.document()?.['options'] ?? {}) as Record<string, unknown>;
    return JSON.stringify(WORKSHOP_OPTION_KEYS.map((k) => options[k]));
  });
  /** The solve, the member, the workshop entries and the unit system (of its cautions' words) a worked-out member belongs to (other entries only make the result out of date). */
  private readonly detailsKey = computed(() => {
    const m = this.selectedMember();
    return m ? JSON.stringify({ solve: this.solved()?.key, member: m.coordinates, workshop: this.workshopKey(), units: this.units() }) : '';
  });
  private readonly detailsState = signal<{ key: string; value: ProposalDetails } | { key: string; error: string } | null>(null);
  /** The chosen member worked out, when it belongs to the entries on screen. */
  protected readonly details = computed(() => {
    const d = this.detailsState();
    return d && 'value' in d && d.key === this.detailsKey() ? d.value : null;
  });
  protected readonly detailsError = computed(() => {
    const d = this.detailsState();
    return d && 'error' in d && d.key === this.detailsKey() ? d.error : null;
  });

  // ---- result charts (every length in the user's unit) ----

  protected unit(kind: QuantityKind): string {
    return unitLabel(kind, this.units());
  }

  /** The chosen member's own cautions; its safety notice is the page's own caution below. */
  protected readonly memberCautions = computed(() => (this.details()?.cautions ?? []).filter((c) => c.code !== 'safety-notice'));

  constructor() {
    // The entries start from each design loaded (on arrival, and when the router reuses this page), with its rig files.
    effect(() => {
      const design = this.design();
      if (!design) return;
      untracked(() => {
        this.solved.set(null);
        this.failure.set(null);
        this.detailsState.set(null);
        this.initEntries();
        void this.loadRig(design);
      });
    });
    // Works out the chosen member whenever it, the result or the workshop entries change.
    effect(() => {
      const key = this.detailsKey();
      const member = this.selectedMember();
      const doc = this.document();
      if (!key || !member || !doc || this.outOfDate() || this.workshopBlocked()) return;
      untracked(() => void this.workOut(key, doc, member.coordinates));
    });
    // Entries typed in one unit system follow a change of the user's choice.
    let shownIn = untracked(this.units);
    effect(() => {
      const now = this.units();
      if (now !== shownIn) untracked(() => this.convertEntries(shownIn, now));
      shownIn = now;
    });
  }

  private async workOut(key: string, doc: Record<string, unknown>, member: Readonly<Record<string, number>>): Promise<void> {
    try {
      const value = await this.solver.details(doc, member, untracked(this.units));
      this.detailsState.set({ key, value });
    } catch (error) {
      if (error instanceof AnalysisSuperseded) return;
      this.detailsState.set({ key, error: error instanceof AnalysisError ? failureWords(error.failure, this.units()) : String(error) });
    }
  }

  /** The newest rig files measured on this revision at rack 0; none when there are none or they cannot be read. */
  private async loadRig(design: AxleDesign): Promise<void> {
    try {
      const list = await firstValueFrom(this.rig.list(this.teamId(), { designId: design.id }));
      const mine = list
        .filter((m) => m.designId === design.id && m.designRevision === design.revision && m.rackMm === 0)
        .sort((a, b) => b.createdAt.localeCompare(a.createdAt))
        .slice(0, RIG_OVERLAYS);
      this.rigFiles.set(await Promise.all(mine.map((m) => firstValueFrom(this.rig.get(this.teamId(), m.id)))));
    } catch {
      this.rigFiles.set([]);
    }
  }

  /** A length in mm as an entry text in the user's unit. */
  private lengthText(mm: number): string {
    return formatNum(mm, { sig: 7, kind: 'length' }, this.units());
  }

  private initEntries(): void {
    const state: Record<string, MovableState> = {};
    for (const r of this.movableRows()) {
      const on = r.name.endsWith('Inner.z') || r.name.endsWith('Outer.z');
      const lo = r.offset ? -DEFAULT_HALF_RANGE_MM : r.current - DEFAULT_HALF_RANGE_MM;
      const hi = r.offset ? DEFAULT_HALF_RANGE_MM : r.current + DEFAULT_HALF_RANGE_MM;
      state[r.name] = { on, min: this.lengthText(lo), max: this.lengthText(hi) };
    }
    this.movable.set(state);
    this.chooseProfile(this.profileId());
    this.shimText.set(this.lengthText(WORKSHOP_DEFAULTS_MM.shim));
    this.pitchText.set(this.lengthText(WORKSHOP_DEFAULTS_MM.pitch));
    this.reachText.set(this.lengthText(WORKSHOP_DEFAULTS_MM.reach));
    this.stackText.set(this.lengthText(WORKSHOP_DEFAULTS_MM.stack));
  }

  /** Rewrites every length entry from one unit system to the other. */
  private convertEntries(from: 'si' | 'imperial', to: 'si' | 'imperial'): void {
    const convert = (text: string) => {
      const v = parseDecimal(text);
      if (v === null) return text;
      const mm = fromDisplayUnits(v, 'length', from);
      return formatNum(mm, { sig: 7, kind: 'length' }, to);
    };
    this.movable.update((m) => Object.fromEntries(Object.entries(m).map(([k, s]) => [k, { ...s, min: convert(s.min), max: convert(s.max) }])));
    for (const s of [this.travelFromText, this.travelToText, this.bumpText, this.shimText, this.pitchText, this.reachText, this.stackText]) s.set(convert(s()));
  }

  protected setMovable(name: string, patch: Partial<MovableState>): void {
    this.movable.update((m) => ({ ...m, [name]: { ...m[name]!, ...patch } }));
  }

  protected chooseProfile(id: string): void {
    const p = trackProfiles[id as TrackProfileId];
    if (!p) return;
    this.profileId.set(p.id);
    this.travelFromText.set(this.lengthText(p.travelMm[0]));
    this.travelToText.set(this.lengthText(p.travelMm[1]));
    this.bumpText.set(this.lengthText(p.bumpHeightMm));
  }

  protected async run(): Promise<void> {
    if (this.blocking() > 0 || this.running()) return;
    const asked: AskedTarget = { kind: this.targetKind(), value: parseDecimal(this.targetText()) };
    const key = this.solveKey();
    // The result on screen belongs to the entries before: it goes as the new solve starts.
    this.solved.set(null);
    this.detailsState.set(null);
    this.running.set(true);
    this.failure.set(null);
    this.proposed.set(null);
    this.proposeError.set(null);
    this.progress.set(0);
    this.progressMessage.set('starting');
    try {
      const result = await this.solver.solve(
        this.intentDocument(),
        (f, m) => {
          this.progress.set(Math.round(f * 100));
          this.progressMessage.set(m);
        },
        this.units(),
      );
      this.solved.set({ result, key, asked });
    } catch (error) {
      if (error instanceof AnalysisSuperseded) return;
      this.failure.set({ message: error instanceof AnalysisError ? failureWords(error.failure, this.units()) : String(error), asked });
    } finally {
      this.running.set(false);
    }
  }

  protected cancel(): void {
    this.solver.cancel();
  }

  protected async propose(): Promise<void> {
    const r = this.result();
    const d = this.design();
    const member = this.details();
    const m = this.selectedMember();
    if (!r || !d || !member || !m || this.outOfDate() || this.proposing()) return;
    this.proposing.set(true);
    this.proposeError.set(null);
    try {
      const p = await firstValueFrom(
        this.api.propose(this.teamId(), this.designId(), {
          corner: member.corner,
          baseRevision: d.revision,
          message: this.proposeMessage().trim() || `Intent: ${r.target.label}, ε ${formatNum(member.rollSteerCoefficient, { decimals: 4 })}`,
          origin: {
            kind: 'intent',
            target: r.target,
            achievedRollSteerCoefficient: member.rollSteerCoefficient,
            understeerChangeDegPerG: member.understeerChangeDegPerG,
            trackProfile: r.trackProfile.id,
            engineVersion: r.engineVersion,
            member: m.solverPick ? 'solver-pick' : 'chosen-by-user',
            // The chosen member's own cautions, measured on its geometry.
            cautions: member.cautions.filter((c) => c.code !== 'safety-notice'),
          },
        }),
      );
      this.proposed.set(`Proposed as a draft on revision ${p.baseRevision}. A designer can accept it in the axle design editor.`);
    } catch (error) {
      this.proposeError.set(apiProblem(error).message);
    } finally {
      this.proposing.set(false);
    }
  }

  protected words(eps: number): string {
    return rollSteerWords(eps, this.axle());
  }

  /** dε per unit length of a coordinate in the user's unit (per mm or per inch). */
  protected perLength(perMm: number | null): number | null {
    if (perMm === null) return null;
    return this.units() === 'imperial' ? perMm * 25.4 : perMm;
  }

  protected text(event: Event): string {
    return (event.target as HTMLInputElement).value;
  }
}
