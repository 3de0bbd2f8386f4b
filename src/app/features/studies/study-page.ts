import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatOption, MatSelect } from '@angular/material/select';
import { firstValueFrom } from 'rxjs';
import type { OutputResult, StudyResult, VariantPoint } from '../../../../shared/study/index';
import { BarChart } from '../../charts/bar-chart';
import { LineChart } from '../../charts/line-chart';
import { formatNumber, type BarGroup, type LineSeries } from '../../charts/chart-types';
import { downloadText, fileNameFor } from '../../charts/csv';
import { apiProblem } from '../../core/http/api-error';
import { browserTimeZone, formatLocalTime } from '../../core/time/local-time';
import { TeamAccess } from '../../core/teams/team-access';
import { SafetyCaution } from '../safety-caution';
import { etaWords, STATUS_WORDS, StudiesApi, type StudyView } from './studies-api';
import { DISPLAY_UNITS, NumPipe } from '../../core/format/num-pipe';
import { formatNum } from '../../core/format/num';
import { inDisplayUnits, unitLabel } from '../../core/format/quantities';
import { studyFormat, studyLabel, studyUnit, studyValue } from '../../../../shared/study/units';
import { rxResource } from '@angular/core/rxjs-interop';
import { EMPTY, expand, map, switchMap, timer } from 'rxjs';
import { loadState, resourceProblem } from '../../core/http/load-state';
import { StudyAttach } from './study-attach';

const isActive = (s: StudyView): boolean => s.status === 'queued' || s.status === 'running';

/** A variant's bump cost; results stored before the ride-model bump cost carry the toe change as costDeg. */
export const costOf = (v: VariantPoint): number => v.cost ?? (v as { costDeg?: number }).costDeg ?? NaN;

const LEVEL_WORDS = { info: 'Notice', warning: 'Warning', critical: 'Critical' } as const;

/**
 * `/teams/:teamId/studies/:studyId`: a study's progress (with the time
 * left), cancel, and its results: histograms with P5 / P50 / P95, the
 * tornado of the tolerances, the probability of breaching each caution
 * threshold, and for a design sweep the Pareto front of balance gained
 * against bump cost with each variant openable as a proposal; CSV export.
 */
@Component({
  selector: 'rw-study-page',
  imports: [NumPipe, RouterLink, MatButton, MatIcon, MatProgressBar, MatFormField, MatLabel, MatSelect, MatOption, BarChart, LineChart, SafetyCaution, StudyAttach],
  templateUrl: './study-page.html',
  styleUrl: './studies.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudyPage {
  private readonly api = inject(StudiesApi);
  private readonly access = inject(TeamAccess);
  protected readonly canRun = this.access.permission('study:run');
  readonly teamId = input.required<string>();
  readonly studyId = input.required<string>();
  /** The study; while it is queued or running, polled every 1.5 s for its progress. */
  private readonly studyResource = rxResource({
    params: () => ({ teamId: this.teamId(), studyId: this.studyId() }),
    stream: ({ params: p }) => {
      const get = () => this.api.get(p.teamId, p.studyId).pipe(map((r): StudyView => r.study));
      return get().pipe(expand((study) => (isActive(study) ? timer(1500).pipe(switchMap(get)) : EMPTY)));
    },
  });
  protected readonly state = loadState(this.studyResource);
  /** The study was deleted or has expired (410): nothing to try again. */
  protected readonly gone = computed(() => this.studyResource.status() === 'error' && resourceProblem(this.studyResource.error()).status === 410);
  protected readonly statusWords = STATUS_WORDS;
  protected readonly levelWords = LEVEL_WORDS;
  protected readonly pct = (p: number) => `${formatNumber(100 * p, 3)} %`;
  private readonly timeZone = browserTimeZone();
  protected readonly busy = signal(false);
  protected readonly actionError = signal<string | null>(null);
  protected readonly actionNote = signal<string | null>(null);
  protected readonly chosen = signal<string>('');
  /** The user's unit system: every figure, axis and threshold of the results follows it. */
  protected readonly units = inject(DISPLAY_UNITS);
  protected readonly studyFormat = studyFormat;
  protected readonly studyUnit = studyUnit;
  protected readonly lengthUnit = computed(() => unitLabel('length', this.units()));
  /** A study label in the user's units (the figures an output's label carries: bump height, rack, speed, corner radius). */
  protected readonly words = (label: string) => studyLabel(label, this.units());

  protected readonly study = computed(() => {
    const s = this.state();
    return s.status === 'ready' ? s.value : null;
  });
  protected readonly result = computed<StudyResult | null>(() => this.study()?.result ?? null);
  protected readonly running = computed(() => {
    const st = this.study()?.status;
    return st === 'queued' || st === 'running';
  });
  protected readonly percent = computed(() => {
    const s = this.study();
    return s && s.progress.totalSamples > 0 ? (100 * s.progress.doneSamples) / s.progress.totalSamples : 0;
  });
  protected readonly eta = computed(() => etaWords(this.study()?.etaSeconds ?? null));

  /** The output shown in the charts (default: the bump cost for a sweep, roll steer for a tolerance study). */
  protected readonly output = computed<OutputResult | null>(() => {
    const r = this.result();
    if (!r) return null;
    return r.outputs.find((o) => o.key === this.chosen()) ?? r.outputs.find((o) => o.key === 'rollSteerCoefficient') ?? r.outputs[0] ?? null;
  });

  protected readonly histogram = computed<BarGroup[]>(() => {
    const o = this.output();
    if (!o) return [];
    const h = o.histogram;
    const units = this.units();
    return h.counts.map((c, i) => ({ label: formatNumber(studyValue(h.from + (i + 0.5) * h.width, o.unit, units), 3), values: [c] }));
  });

  /**
   * The ten largest, each named as the hardpoint table names its point, with the coordinate and the side.
   * The chart turns long names and cuts them to fit, so the coordinate and side come first
   * ("z left: Tie rod, inner end (rack)" for "Tie rod, inner end (rack), z (left)"): bars stay told apart.
   */
  protected readonly tornado = computed<BarGroup[]>(() =>
    (this.output()?.tornado ?? []).slice(0, 10).map((t) => {
      const m = /^(.*), ([xyz])(?: \((left|right)\))?$/.exec(t.label);
      return { label: m ? `${m[2]}${m[3] ? ` ${m[3]}` : ''}: ${m[1]}` : t.label, values: [t.src] };
    }),
  );

  protected readonly breaches = computed(() => (this.result()?.outputs ?? []).flatMap((o) => o.breaches.map((b) => ({ output: o, ...b }))));

  protected readonly pareto = computed<LineSeries[]>(() => {
    const sw = this.result()?.sweep;
    if (!sw) return [];
    return [
      { name: 'Variants', style: 'points', points: sw.scatter.map((v) => ({ x: costOf(v), y: v.gainDegPerG })) },
      { name: 'Pareto front', points: sw.pareto.map((v) => ({ x: costOf(v), y: v.gainDegPerG })) },
    ];
  });

  /** The Pareto chart's cost axis: the ride model's yaw disturbance on the profile's road, or the toe change over the bump. */
  protected readonly costAxis = computed(() => {
    const r = this.result();
    const sw = r?.sweep;
    if (!r || !sw) return { label: 'Bump cost', unit: '' };
    return sw.costOutput === 'bumpYawDisturbancePct'
      ? { label: `Bump cost (yaw-rate disturbance, ${studyLabel(r.bumpCost.roadInWords, this.units())})`, unit: '%' }
      : { label: 'Bump cost (toe change over the bump)', unit: 'deg' };
  });

  protected readonly costOf = costOf;

  protected readonly mainEffects = computed<LineSeries[]>(() => {
    const sw = this.result()?.sweep;
    const o = this.output();
    if (!sw || !o) return [];
    const units = this.units();
    const names = new Map(this.result()?.factors.map((f) => [f.key, f.label]));
    return sw.mainEffects.map((m) => ({
      name: names.get(m.factor) ?? m.factor,
      points: m.at.flatMap((x, i) => {
        const y = m.means[o.key]?.[i];
        return y === null || y === undefined ? [] : [{ x: inDisplayUnits(x - m.at[0]!, 'length', units), y: studyValue(y, o.unit, units) }];
      }),
    }));
  });

  constructor() {
    effect(() => {
      const teamId = this.teamId();
      untracked(() => void firstValueFrom(this.access.load(teamId)).catch(() => undefined));
    });
  }

  protected load(): void {
    this.studyResource.reload();
  }

  protected localTime(iso: string): string {
    return formatLocalTime(iso, this.timeZone);
  }

  protected async cancel(): Promise<void> {
    this.busy.set(true);
    this.actionError.set(null);
    try {
      const { study } = await firstValueFrom(this.api.cancel(this.teamId(), this.studyId()));
      this.studyResource.set(study);
    } catch (error) {
      this.actionError.set(apiProblem(error).message);
    } finally {
      this.busy.set(false);
    }
  }

  protected async exportCsv(): Promise<void> {
    this.actionError.set(null);
    try {
      const text = await firstValueFrom(this.api.csv(this.teamId(), this.studyId(), this.units()));
      downloadText(text, fileNameFor(this.study()?.label || 'rollwise-study', 'csv'));
    } catch (error) {
      this.actionError.set(apiProblem(error).message);
    }
  }

  protected async openVariant(index: number): Promise<void> {
    this.busy.set(true);
    this.actionError.set(null);
    this.actionNote.set(null);
    try {
      await firstValueFrom(this.api.openVariant(this.teamId(), this.studyId(), index));
      this.actionNote.set(`Variant ${index} is open as a proposal on the axle design.`);
    } catch (error) {
      this.actionError.set(apiProblem(error).message);
    } finally {
      this.busy.set(false);
    }
  }

  /** A caution threshold in the user's units. */
  protected breachWords(b: { absolute: boolean; threshold: number }, unit: string): string {
    const units = this.units();
    return `${b.absolute ? '|value|' : 'value'} ≥ ${formatNum(b.threshold, studyFormat(unit), units)} ${studyUnit(unit, units)}`.trimEnd();
  }

  /** The P5 / P50 / P95 line of the chosen output, in the user's units (the histogram's description and caption). */
  protected percentileWords(o: OutputResult): string {
    const units = this.units();
    const f = studyFormat(o.unit);
    const u = studyUnit(o.unit, units);
    return `P5 ${formatNum(o.p5, f, units)} ${u}, P50 ${formatNum(o.p50, f, units)} ${u}, P95 ${formatNum(o.p95, f, units)} ${u}; nominal ${formatNum(o.nominal, f, units)} ${u}`;
  }
}
