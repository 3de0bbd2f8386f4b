import { ChangeDetectionStrategy, Component, computed, effect, inject, input, linkedSignal, signal, untracked } from '@angular/core';
import { Router, RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatRadioButton, MatRadioGroup } from '@angular/material/radio';
import { MatChipGrid, MatChipInput, MatChipRemove, MatChipRow, type MatChipInputEvent } from '@angular/material/chips';
import { firstValueFrom } from 'rxjs';
import { TRACK_PROFILE_IDS, trackProfiles, type TrackProfileId } from '../../../../shared/tracks/profiles';
import { MAX_STUDY_RACKS, MAX_STUDY_SAMPLES, type StudyRequest } from '../../../../shared/study/schema';
import { apiProblem } from '../../core/http/api-error';
import { TeamAccess } from '../../core/teams/team-access';
import { browserTimeZone, formatLocalTime } from '../../core/time/local-time';
import { etaWords, STATUS_WORDS, StudiesApi, type StudyView } from './studies-api';
import { inputValue } from '../../core/forms/dom-events';
import { rxResource } from '@angular/core/rxjs-interop';
import { catchError, EMPTY, expand, map, of, switchMap, timer } from 'rxjs';
import { loadState } from '../../core/http/load-state';
import type { AxleName } from '../../../../shared/schema/axle';
import type { Corner } from '../../../../shared/schema/corner';
import { hardpointRows } from '../../../../shared/io/hardpoint-points';
import { FIXED_POINTS } from '../../../../shared/study/schema';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { formatNum } from '../../core/format/num';
import { fromDisplayUnits, unitLabel } from '../../core/format/quantities';
import { ErrorState } from '../../core/forms/error-state';
import { ChipGridErrorState } from '../../core/forms/chip-grid-error-state';
import { parseDecimal } from '../axle-design/hardpoint-io';
import { FeaturesApi } from '../features-api';
import { ConfigurationsApi } from '../configurations/configurations-api';

interface ToleranceRow {
  point: string;
  axis: 'x' | 'y' | 'z' | 'sphere';
  plusMinusMm: number;
  distribution: 'normal' | 'uniform';
}

interface FactorRow {
  point: string;
  axis: 'x' | 'y' | 'z';
  fromMm: number;
  toMm: number;
  levels: number;
}

/** A corner point a tolerance or a sweep may name: its key in the request, its name as the hardpoint table writes it. */
interface PointChoice {
  readonly key: string;
  readonly name: string;
}

/** The point a new row starts on: the body end of the link that sets toe (tie rod or toe link), else the first point. */
function toePoint(corner: Corner | null, points: readonly PointChoice[]): string {
  const key = corner?.type === 'five-link' ? `link${corner.toeLink}Inner` : 'tieRodInner';
  return points.some((p) => p.key === key) ? key : (points[0]?.key ?? key);
}

/** Rows on a point the corner has: a row on a point it lacks (another corner type) moves to `fallback`. */
function onCornerPoints<R extends { point: string }>(rows: readonly R[], points: readonly PointChoice[], fallback: string): R[] {
  if (points.length === 0) return [...rows];
  return rows.map((r) => (points.some((p) => p.key === r.point) ? r : { ...r, point: fallback }));
}

/** The linkage points of the corner a study is of (the wheel axis points excepted, as the server requires), by their hardpoint-table names. */
function pointChoices(corner: Corner): PointChoice[] {
  return hardpointRows(corner)
    .filter((r) => r.key.startsWith('points.'))
    .map((r) => ({ key: r.key.slice('points.'.length), name: r.name }))
    .filter((p) => !FIXED_POINTS.includes(p.key));
}

/** Limits of the request's lengths, mm (shared/study/schema.ts), for messages in the user's unit before anything is sent. */
const BAND_MAX_MM = 50;
const SETUP_MAX_MM = 10;

const isActive = (s: StudyView): boolean => s.status === 'queued' || s.status === 'running';

/**
 * `/teams/:teamId/studies[?axleDesignId=…|?configurationId=…]`: the team's
 * tolerance studies and design sweeps with their progress, and a new study
 * of the axle design or configuration the page was opened from.
 */
@Component({
  selector: 'rw-studies-page',
  imports: [
    RouterLink, MatButton, MatIcon, MatProgressBar, MatFormField, MatLabel, MatHint, MatError, MatSuffix, MatInput, MatSelect, MatOption, MatRadioGroup, MatRadioButton, ErrorState,
    MatChipGrid, MatChipRow, MatChipInput, MatChipRemove, ChipGridErrorState,
  ],
  templateUrl: './studies-page.html',
  styleUrl: './studies.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudiesPage {
  protected readonly value = inputValue;
  protected readonly toleranceAxes: readonly ToleranceRow['axis'][] = ['x', 'y', 'z', 'sphere'];
  protected readonly factorAxes: readonly FactorRow['axis'][] = ['x', 'y', 'z'];
  protected readonly bounds = [{ key: 'fromMm', label: 'From' }, { key: 'toMm', label: 'To' }] as const;
  private readonly router = inject(Router);
  private readonly api = inject(StudiesApi);
  protected readonly access = inject(TeamAccess);
  private readonly features = inject(FeaturesApi);
  private readonly configurations = inject(ConfigurationsApi);
  /** The user's unit system: every length field is typed and shown in it; the request stays in mm. */
  private readonly units = inject(DISPLAY_UNITS);
  protected readonly lengthUnit = computed(() => unitLabel('length', this.units()));

  readonly teamId = input.required<string>();
  /** `?axleDesignId=` or `?configurationId=`: what a new study is of. */
  readonly axleDesignId = input<string | undefined>(undefined);
  readonly configurationId = input<string | undefined>(undefined);
  protected readonly hasTarget = computed(() => !!(this.axleDesignId() || this.configurationId()));
  protected readonly canRun = this.access.permission('study:run');
  /** The team's studies; while any is queued or running, polled every two seconds (a failed poll keeps the list shown). */
  private readonly studies = rxResource({
    params: () => this.teamId(),
    stream: ({ params: teamId }) => {
      const list = () => this.api.list(teamId).pipe(map((r): readonly StudyView[] => r.studies));
      return list().pipe(
        expand((studies) => (studies.some(isActive) ? timer(2000).pipe(switchMap(() => list().pipe(catchError(() => of(studies))))) : EMPTY)),
      );
    },
  });
  protected readonly state = loadState(this.studies);
  protected readonly statusWords = STATUS_WORDS;
  protected readonly eta = etaWords;
  /** The corner the new study is of (the axle design, or the configuration's design of the chosen axle at its revision): its points' names. */
  private readonly corner = rxResource({
    params: () => ({ teamId: this.teamId(), axleDesignId: this.axleDesignId(), configurationId: this.configurationId(), axle: this.axle() }),
    stream: ({ params: p }) => {
      if (p.axleDesignId) return this.features.axleDesign(p.teamId, p.axleDesignId).pipe(map((d): Corner | null => d.corner));
      if (!p.configurationId) return of<Corner | null>(null);
      return this.configurations.get(p.teamId, p.configurationId).pipe(
        switchMap((c) => this.configurations.designRevision(p.teamId, c[p.axle].designId, c[p.axle].revision)),
        map((r): Corner | null => r.corner),
      );
    },
  });
  protected readonly cornerState = loadState(this.corner);
  protected readonly points = computed<readonly PointChoice[]>(() => {
    const c = this.cornerState();
    return c.status === 'ready' && c.value ? pointChoices(c.value) : [];
  });
  protected readonly profiles = TRACK_PROFILE_IDS.map((id) => trackProfiles[id]);
  protected readonly maxSamples = MAX_STUDY_SAMPLES;
  private readonly timeZone = browserTimeZone();

  // ---- the form ----
  protected readonly kind = signal<'tolerance' | 'sweep'>('tolerance');
  protected readonly label = signal('');
  protected readonly axle = signal<AxleName>('front');
  protected readonly profile = signal<TrackProfileId | ''>('');
  protected readonly samples = signal(2000);
  protected readonly seed = signal<number | null>(null);
  /** The first point a row starts on, for the loaded corner. */
  protected readonly defaultPoint = computed(() => {
    const c = this.cornerState();
    return toePoint(c.status === 'ready' ? c.value : null, this.points());
  });
  /** The tolerance rows; a row on a point the loaded corner lacks moves to its toe-link point. */
  protected readonly tolerances = linkedSignal<readonly PointChoice[], ToleranceRow[]>({
    source: this.points,
    computation: (points, previous) =>
      onCornerPoints(previous?.value ?? [{ point: 'tieRodInner', axis: 'z', plusMinusMm: 0.5, distribution: 'normal' }], points, untracked(this.defaultPoint)),
  });
  protected readonly normalSigmas = signal(3);
  protected readonly shimMm = signal<number | null>(null);
  /** Length fields whose typed text was refused, by field ('tolerance-0', 'fromMm-1', 'shim', 'racks'…): the message beside the field. */
  protected readonly lengthErrors = signal<ReadonlyMap<string, string>>(new Map());
  protected readonly adjusterMm = signal<number | null>(null);
  protected readonly racksMm = signal<readonly number[]>([0]);
  protected readonly design = signal<'full-factorial' | 'latin-hypercube'>('latin-hypercube');
  /** The swept coordinates; as the tolerance rows, always on points the loaded corner has. */
  protected readonly factors = linkedSignal<readonly PointChoice[], FactorRow[]>({
    source: this.points,
    computation: (points, previous) => onCornerPoints(previous?.value ?? [{ point: 'tieRodInner', axis: 'z', fromMm: 0, toMm: 10, levels: 5 }], points, untracked(this.defaultPoint)),
  });
  protected readonly direction = signal<'more-understeer' | 'less-understeer'>('more-understeer');
  protected readonly formError = signal<string | null>(null);
  protected readonly saving = signal(false);
  protected readonly variantCount = computed(() => (this.design() === 'full-factorial' ? this.factors().reduce((a, f) => a * Math.max(2, f.levels), 1) : this.samples()));

  constructor() {
    effect(() => {
      const teamId = this.teamId();
      untracked(() => void firstValueFrom(this.access.load(teamId)).catch(() => undefined));
    });
  }

  protected load(): void {
    this.studies.reload();
  }

  protected loadCorner(): void {
    this.corner.reload();
  }

  protected localTime(iso: string): string {
    return formatLocalTime(iso, this.timeZone);
  }

  protected percent(s: StudyView): number {
    return s.progress.totalSamples > 0 ? (100 * s.progress.doneSamples) / s.progress.totalSamples : 0;
  }

  protected num(event: Event): number {
    return Number(inputValue(event));
  }

  protected optionalNum(event: Event): number | null {
    const v = inputValue(event).trim();
    return v === '' ? null : Number(v);
  }

  /** A stored length (mm) as its field shows it and it is typed: in the user's unit, 8 significant figures (as the hardpoint table). */
  protected shown(mm: number | null): string {
    return formatNum(mm, { kind: 'length', sig: 8, missing: '' }, this.units());
  }

  /** A value typed in the user's unit, in mm (1 in = 25.4 mm). */
  private mmOf(typed: number): number {
    return fromDisplayUnits(typed, 'length', this.units());
  }

  private setLengthError(field: string, message: string | null): void {
    const next = new Map(this.lengthErrors());
    if (message === null) next.delete(field);
    else next.set(field, message);
    this.lengthErrors.set(next);
  }

  protected lengthError(field: string): string | undefined {
    return this.lengthErrors().get(field);
  }

  /**
   * Reads a length field's text in the user's unit: the value in mm, or null
   * after putting the problem beside the field in the user's words and unit.
   * `limits` are the request's, in mm; a field may be left empty only when `optional`.
   */
  private readLength(field: string, what: string, event: Event, limits: { min?: number; above?: number; max?: number }, optional = false): number | null | undefined {
    const text = inputValue(event).trim().replace(',', '.');
    const unit = this.lengthUnit();
    const write = (mm: number) => `${formatNum(mm, { kind: 'length' }, this.units())} ${unit}`;
    if (text === '') {
      this.setLengthError(field, optional ? null : `${what}: enter a length in ${unit}.`);
      return optional ? undefined : null;
    }
    const typed = Number(text);
    let problem: string | null = null;
    if (!Number.isFinite(typed)) problem = `${what}: "${text}" is not a number of ${unit}.`;
    else {
      const mm = this.mmOf(typed);
      if (limits.above !== undefined && mm <= limits.above) problem = `${what} must be more than ${write(limits.above)}.`;
      else if (limits.min !== undefined && mm < limits.min) problem = `${what} must be at least ${write(limits.min)}.`;
      else if (limits.max !== undefined && mm > limits.max) problem = `${what} must be at most ${write(limits.max)}.`;
    }
    this.setLengthError(field, problem);
    return problem ? null : this.mmOf(typed);
  }

  protected commitBand(i: number, event: Event): void {
    const mm = this.readLength(`tolerance-${i}`, `Tolerance ${i + 1}`, event, { above: 0, max: BAND_MAX_MM });
    if (typeof mm === 'number') this.setTolerance(i, { plusMinusMm: mm });
  }

  protected commitBound(i: number, which: 'fromMm' | 'toMm', event: Event): void {
    const mm = this.readLength(`${which}-${i}`, `${which === 'fromMm' ? 'From' : 'To'} of coordinate ${i + 1}`, event, {});
    if (typeof mm === 'number') this.setFactor(i, { [which]: mm });
  }

  protected commitSetup(which: 'shim' | 'adjuster', event: Event): void {
    const mm = this.readLength(which, which === 'shim' ? 'Camber shim thickness' : 'Toe adjuster step', event, { min: 0, max: SETUP_MAX_MM }, true);
    if (mm === null) return;
    (which === 'shim' ? this.shimMm : this.adjusterMm).set(mm ?? null);
  }

  /**
   * Adds the rack positions typed into the chip field (on Enter or on leaving it). Each chip is one number; a
   * comma is always a decimal comma ("2,5" is 2.5), so only spaces and semicolons part several typed at once.
   * Text that does not read is left in the field with the problem beside it, and nothing is added.
   */
  protected addRacks(event: MatChipInputEvent): void {
    const unit = this.lengthUnit();
    const parts = event.value.split(/[;\s]+/).filter((t) => t !== '');
    if (parts.length === 0) {
      if (this.racksMm().length > 0) this.setLengthError('racks', null);
      return;
    }
    const bad = parts.find((t) => parseDecimal(t) === null);
    const added = parts.map((t) => this.mmOf(parseDecimal(t) ?? NaN));
    const next = [...this.racksMm(), ...added];
    const twice = added.find((mm, i) => next.indexOf(mm) < this.racksMm().length + i);
    let problem: string | null = null;
    if (bad !== undefined) {
      problem = bad.includes(',')
        ? `Rack positions: "${bad}" is not one number of ${unit}. A comma is read as a decimal comma (2,5 is 2.5): enter one position at a time, or part them with spaces or semicolons.`
        : `Rack positions: "${bad}" is not a number of ${unit}.`;
    } else if (next.length > MAX_STUDY_RACKS) problem = `Rack positions: at most ${MAX_STUDY_RACKS}; remove one before adding another.`;
    else if (twice !== undefined) problem = `Rack positions: ${this.shown(twice)} ${unit} is already in the list.`;
    this.setLengthError('racks', problem);
    if (problem) return;
    this.racksMm.set(next);
    event.chipInput.clear();
  }

  protected removeRack(i: number): void {
    const next = this.racksMm().filter((_, k) => k !== i);
    this.racksMm.set(next);
    this.setLengthError('racks', next.length === 0 ? `Rack positions: enter at least one, in ${this.lengthUnit()}.` : null);
  }

  protected setTolerance(i: number, patch: Partial<ToleranceRow>): void {
    this.tolerances.update((rows) => rows.map((r, k) => (k === i ? { ...r, ...patch } : r)));
  }

  /** `key` when the loaded corner has that point (or is not loaded yet), else the corner's toe-link point. */
  private pointOr(key: string): string {
    const points = this.points();
    return points.length === 0 || points.some((p) => p.key === key) ? key : this.defaultPoint();
  }

  protected addTolerance(): void {
    this.tolerances.update((rows) => [...rows, { point: this.pointOr('lowerFront'), axis: 'sphere', plusMinusMm: 0.5, distribution: 'normal' }]);
  }

  protected removeTolerance(i: number): void {
    this.tolerances.update((rows) => rows.filter((_, k) => k !== i));
    this.shiftErrors(['tolerance'], i);
  }

  /** After row `i` of a table is removed, its fields' messages go and the later rows' move up with them. */
  private shiftErrors(prefixes: readonly string[], i: number): void {
    const next = new Map<string, string>();
    for (const [field, message] of this.lengthErrors()) {
      const m = /^(.+)-(\d+)$/.exec(field);
      if (!m || !prefixes.includes(m[1]!)) next.set(field, message);
      else if (Number(m[2]) > i) next.set(`${m[1]}-${Number(m[2]) - 1}`, message);
      else if (Number(m[2]) < i) next.set(field, message);
    }
    this.lengthErrors.set(next);
  }

  protected setFactor(i: number, patch: Partial<FactorRow>): void {
    this.factors.update((rows) => rows.map((r, k) => (k === i ? { ...r, ...patch } : r)));
  }

  protected addFactor(): void {
    this.factors.update((rows) => [...rows, { point: this.pointOr('tieRodOuter'), axis: 'z', fromMm: 0, toMm: 10, levels: 5 }]);
  }

  protected removeFactor(i: number): void {
    this.factors.update((rows) => rows.filter((_, k) => k !== i));
    this.shiftErrors(['fromMm', 'toMm'], i);
  }

  /** The request body of docs/api.md from the form. */
  protected request(): StudyRequest {
    const axleDesignId = this.axleDesignId();
    const target = axleDesignId ? { axleDesignId } : { configurationId: this.configurationId() ?? '', axle: this.axle() };
    const racks = [...this.racksMm()];
    const common = {
      target,
      ...(this.label().trim() ? { label: this.label().trim() } : {}),
      ...(this.seed() !== null ? { seed: this.seed()! } : {}),
      ...(this.profile() ? { trackProfile: this.profile() as TrackProfileId } : {}),
      analysis: { travelPoints: 11, rackMm: racks.length ? racks : [0], rollDeg: 2 },
    };
    if (this.kind() === 'tolerance') {
      return {
        ...common,
        kind: 'tolerance',
        samples: this.samples(),
        tolerances: this.tolerances(),
        normalSigmas: this.normalSigmas(),
        sides: 'both',
        setup: { ...(this.shimMm() !== null ? { camberShimMm: this.shimMm()! } : {}), ...(this.adjusterMm() !== null ? { toeAdjusterStepMm: this.adjusterMm()! } : {}) },
      };
    }
    return {
      ...common,
      kind: 'sweep',
      design: this.design(),
      ...(this.design() === 'latin-hypercube' ? { samples: this.samples() } : {}),
      factors: this.factors(),
      balanceDirection: this.direction(),
    };
  }

  protected async start(): Promise<void> {
    this.formError.set(null);
    if (this.lengthErrors().size > 0) {
      this.formError.set(`Correct the fields marked beside them first: ${[...this.lengthErrors().values()].join(' ')}`);
      return;
    }
    this.saving.set(true);
    try {
      const { study } = await firstValueFrom(this.api.start(this.teamId(), this.request()));
      await this.router.navigate(['/teams', this.teamId(), 'studies', study.id]);
    } catch (error) {
      const p = apiProblem(error);
      this.formError.set(p.message);
    } finally {
      this.saving.set(false);
    }
  }
}
