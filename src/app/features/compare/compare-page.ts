import { ChangeDetectionStrategy, Component, computed, inject, OnInit, signal } from '@angular/core';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { firstValueFrom } from 'rxjs';
import { apiProblem } from '../../core/http/api-error';
import { LineChart } from '../../charts/line-chart';
import { LineSeries } from '../../charts/chart-types';
import { AnalysisError, KinematicsClient } from '../../workers/kinematics-client';
import type { CornerAnalysis } from '../../workers/analysis-types';
import { AxleDesign, AxleDesignSummary, FeaturesApi } from '../features-api';
import { routeParam } from '../route-params';
import { rollSteerWords } from '../roll-steer-words';
import { SafetyCaution } from '../safety-caution';

interface Compared {
  readonly design: AxleDesign;
  readonly analysis: CornerAnalysis | null;
  readonly error: string | null;
}

interface FigureRow {
  readonly label: string;
  readonly unit: string;
  readonly digits: number;
  readonly values: readonly (number | null)[];
  readonly words?: readonly string[];
}

const MAX_COMPARED = 4;
const TRAVEL = { from: -25, to: 25, step: 2.5 };
const ROLL = { from: -3, to: 3, step: 0.25 };

/**
 * Compare two to four axle designs of a vehicle: key kinematic figures in
 * one table (cells that differ from the first design highlighted) and their
 * toe, camber and roll-steer curves overlaid. Solved in the Web Worker.
 */
@Component({
  selector: 'rw-compare-page',
  imports: [RouterLink, MatButton, MatProgressBar, LineChart, SafetyCaution],
  templateUrl: './compare-page.html',
  styleUrl: './compare-page.scss',
  providers: [KinematicsClient],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ComparePage implements OnInit {
  private readonly route = inject(ActivatedRoute);
  private readonly router = inject(Router);
  private readonly api = inject(FeaturesApi);
  private readonly engine = inject(KinematicsClient);

  protected readonly teamId = routeParam(this.route, 'teamId');
  protected readonly vehicleId = routeParam(this.route, 'vehicleId');
  protected readonly maxCompared = MAX_COMPARED;

  protected readonly designs = signal<readonly AxleDesignSummary[] | null>(null);
  protected readonly loadError = signal<string | null>(null);
  protected readonly chosen = signal<readonly string[]>([]);
  protected readonly running = signal(false);
  protected readonly compared = signal<readonly Compared[]>([]);
  protected readonly travel = TRAVEL;

  protected readonly choiceProblem = computed(() => {
    const n = this.chosen().length;
    return n < 2 ? 'Choose at least two designs.' : n > MAX_COMPARED ? `Choose at most ${MAX_COMPARED} designs.` : null;
  });

  protected readonly figures = computed<FigureRow[]>(() => {
    const list = this.compared();
    const a = (pick: (x: CornerAnalysis) => number) => list.map((c) => (c.analysis ? pick(c.analysis) : null));
    const rack0 = (x: CornerAnalysis) => x.curves.find((k) => k.rackMm === 0) ?? x.curves[0]!;
    return [
      { label: 'Revision', unit: '', digits: 0, values: list.map((c) => c.design.revision) },
      {
        label: 'Roll steer coefficient ε',
        unit: 'deg/deg',
        digits: 4,
        values: a((x) => x.rollSteerCoefficient),
        words: list.map((c) => (c.analysis ? rollSteerWords(c.analysis.rollSteerCoefficient, c.design.axle) : '')),
      },
      { label: 'Roll camber coefficient', unit: 'deg/deg', digits: 3, values: a((x) => x.rollCamberDegPerDeg) },
      { label: 'Bump steer, rack 0', unit: 'deg/m', digits: 3, values: a((x) => rack0(x).bumpSteerDegPerM) },
      { label: 'Toe curvature, rack 0', unit: 'deg/m²', digits: 2, values: a((x) => rack0(x).curvatureDegPerM2) },
      { label: 'Largest toe deviation from linear, rack 0', unit: 'deg', digits: 4, values: a((x) => rack0(x).maxDeviationDeg) },
      { label: 'Camber gain, rack 0', unit: 'deg/m', digits: 2, values: a((x) => rack0(x).camberGainDegPerM) },
    ];
  });

  private overlay(pick: (x: CornerAnalysis) => { x: number; y: number }[]): LineSeries[] {
    return this.compared()
      .filter((c) => c.analysis)
      .map((c) => ({ name: `${c.design.name} (rev. ${c.design.revision})`, points: pick(c.analysis!) }));
  }

  protected readonly toeOverlay = computed(() =>
    this.overlay((x) => {
      const c = x.curves.find((k) => k.rackMm === 0) ?? x.curves[0]!;
      const ride = c.points.find((p) => p.travelMm === 0)?.toeDeg ?? 0;
      return c.points.map((p) => ({ x: p.travelMm, y: p.toeDeg - ride }));
    }),
  );
  protected readonly camberOverlay = computed(() =>
    this.overlay((x) => (x.curves.find((k) => k.rackMm === 0) ?? x.curves[0]!).points.map((p) => ({ x: p.travelMm, y: p.camberDeg }))),
  );
  protected readonly rollOverlay = computed(() =>
    this.overlay((x) => {
      const r = x.roll.find((k) => k.rackMm === 0) ?? x.roll[0]!;
      const zero = r.points.find((p) => p.rollDeg === 0)?.axleSteerDeg ?? 0;
      return r.points.map((p) => ({ x: p.rollDeg, y: p.axleSteerDeg - zero }));
    }),
  );

  ngOnInit(): void {
    const fromUrl = (this.route.snapshot.queryParamMap.get('designs') ?? '').split(',').filter(Boolean);
    this.chosen.set(fromUrl.slice(0, MAX_COMPARED));
    void this.load(fromUrl.length >= 2);
  }

  private async load(runNow: boolean): Promise<void> {
    try {
      this.designs.set(await firstValueFrom(this.api.axleDesigns(this.teamId, this.vehicleId)));
      if (runNow) await this.compare();
    } catch (error) {
      this.loadError.set(apiProblem(error).message);
    }
  }

  protected toggle(id: string, on: boolean): void {
    this.chosen.update((c) => (on ? [...c.filter((x) => x !== id), id] : c.filter((x) => x !== id)));
  }

  protected async compare(): Promise<void> {
    if (this.choiceProblem() || this.running()) return;
    this.running.set(true);
    void this.router.navigate([], { relativeTo: this.route, queryParams: { designs: this.chosen().join(',') }, replaceUrl: true });
    const out: Compared[] = [];
    for (const id of this.chosen()) {
      try {
        const design = await firstValueFrom(this.api.axleDesign(this.teamId, id));
        const stroke = design.corner.steered && design.corner.steering?.kind === 'rack' ? design.corner.steering.rackStroke : null;
        try {
          const analysis = await this.engine.analyse({
            corner: design.corner,
            travel: TRAVEL,
            rackMm: stroke ? [0, stroke[0] / 2, stroke[1] / 2] : [0],
            roll: ROLL,
            pose: { travelMm: 0, rackMm: 0 },
          });
          out.push({ design, analysis, error: null });
        } catch (error) {
          out.push({ design, analysis: null, error: error instanceof AnalysisError ? error.message : String(error) });
        }
      } catch (error) {
        this.loadError.set(apiProblem(error).message);
      }
    }
    this.compared.set(out);
    this.running.set(false);
  }

  protected fmt(v: number | null, digits: number): string {
    return v === null || !Number.isFinite(v) ? '–' : v.toFixed(digits);
  }

  /** True where a value differs from the first design's at the shown precision. */
  protected differs(row: FigureRow, i: number): boolean {
    const first = row.values[0];
    const v = row.values[i];
    return i > 0 && first !== null && first !== undefined && v !== null && v !== undefined && this.fmt(v, row.digits) !== this.fmt(first, row.digits);
  }

  protected checked(event: Event): boolean {
    return (event.target as HTMLInputElement).checked;
  }
}
