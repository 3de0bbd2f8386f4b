import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { Router, RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatRadioButton, MatRadioGroup } from '@angular/material/radio';
import { firstValueFrom } from 'rxjs';
import { TRACK_PROFILE_IDS, trackProfiles, type TrackProfileId } from '../../../../shared/tracks/profiles';
import { MAX_STUDY_SAMPLES, type StudyRequest } from '../../../../shared/study/schema';
import { apiProblem } from '../../core/http/api-error';
import { TeamAccess } from '../../core/teams/team-access';
import { browserTimeZone, formatLocalTime } from '../../core/time/local-time';
import { etaWords, STATUS_WORDS, StudiesApi, type StudyView } from './studies-api';
import { inputValue } from '../../core/forms/dom-events';
import { rxResource } from '@angular/core/rxjs-interop';
import { catchError, EMPTY, expand, map, of, switchMap, timer } from 'rxjs';
import { loadState } from '../../core/http/load-state';
import type { AxleName } from '../../../../shared/schema/axle';

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

/** Every corner point a tolerance or a sweep may name (the wheel axis points excepted); the server checks them against the corner's type. */
const POINT_NAMES = [
  'lowerFront', 'lowerRear', 'lowerOuter', 'upperFront', 'upperRear', 'upperOuter', 'tieRodInner', 'tieRodOuter', 'strutTop', 'strutLower',
  'link1Inner', 'link1Outer', 'link2Inner', 'link2Outer', 'link3Inner', 'link3Outer', 'link4Inner', 'link4Outer', 'link5Inner', 'link5Outer',
];

const isActive = (s: StudyView): boolean => s.status === 'queued' || s.status === 'running';

/**
 * `/teams/:teamId/studies[?axleDesignId=…|?configurationId=…]`: the team's
 * tolerance studies and design sweeps with their progress, and a new study
 * of the axle design or configuration the page was opened from.
 */
@Component({
  selector: 'rw-studies-page',
  imports: [RouterLink, MatButton, MatIcon, MatProgressBar, MatFormField, MatLabel, MatHint, MatInput, MatSelect, MatOption, MatRadioGroup, MatRadioButton],
  templateUrl: './studies-page.html',
  styleUrl: './studies.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudiesPage {
  protected readonly value = inputValue;
  protected readonly toleranceAxes: readonly ToleranceRow['axis'][] = ['x', 'y', 'z', 'sphere'];
  protected readonly factorAxes: readonly FactorRow['axis'][] = ['x', 'y', 'z'];
  private readonly router = inject(Router);
  private readonly api = inject(StudiesApi);
  protected readonly access = inject(TeamAccess);

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
  protected readonly pointNames = POINT_NAMES;
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
  protected readonly tolerances = signal<ToleranceRow[]>([{ point: 'tieRodInner', axis: 'z', plusMinusMm: 0.5, distribution: 'normal' }]);
  protected readonly normalSigmas = signal(3);
  protected readonly shimMm = signal<number | null>(null);
  protected readonly adjusterMm = signal<number | null>(null);
  protected readonly racks = signal('0');
  protected readonly design = signal<'full-factorial' | 'latin-hypercube'>('latin-hypercube');
  protected readonly factors = signal<FactorRow[]>([{ point: 'tieRodInner', axis: 'z', fromMm: 0, toMm: 10, levels: 5 }]);
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

  protected setTolerance(i: number, patch: Partial<ToleranceRow>): void {
    this.tolerances.update((rows) => rows.map((r, k) => (k === i ? { ...r, ...patch } : r)));
  }

  protected addTolerance(): void {
    this.tolerances.update((rows) => [...rows, { point: 'lowerFront', axis: 'sphere', plusMinusMm: 0.5, distribution: 'normal' }]);
  }

  protected removeTolerance(i: number): void {
    this.tolerances.update((rows) => rows.filter((_, k) => k !== i));
  }

  protected setFactor(i: number, patch: Partial<FactorRow>): void {
    this.factors.update((rows) => rows.map((r, k) => (k === i ? { ...r, ...patch } : r)));
  }

  protected addFactor(): void {
    this.factors.update((rows) => [...rows, { point: 'tieRodOuter', axis: 'z', fromMm: 0, toMm: 10, levels: 5 }]);
  }

  protected removeFactor(i: number): void {
    this.factors.update((rows) => rows.filter((_, k) => k !== i));
  }

  /** The request body of docs/api.md from the form. */
  protected request(): StudyRequest {
    const axleDesignId = this.axleDesignId();
    const target = axleDesignId ? { axleDesignId } : { configurationId: this.configurationId() ?? '', axle: this.axle() };
    const racks = this.racks().split(',').map((r) => Number(r.trim())).filter((r) => r.toString() !== 'NaN');
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
