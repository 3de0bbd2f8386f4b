import { ChangeDetectionStrategy, Component, computed, effect, inject, input, linkedSignal, signal, untracked } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatCheckbox } from '@angular/material/checkbox';
import { firstValueFrom } from 'rxjs';
import { apiProblem } from '../../core/http/api-error';
import { loadState } from '../../core/http/load-state';
import { LineChart } from '../../charts/line-chart';
import { LineSeries } from '../../charts/chart-types';
import { AnalysisError, KinematicsClient } from '../../workers/kinematics-client';
import type { AnalysisFailure, CornerAnalysis } from '../../workers/analysis-types';
import { failureWords } from '../../workers/failure-words';
import { AxleDesign, FeaturesApi } from '../features-api';
import { rollSteerWords } from '../../../../shared/balance/roll-steer-words';
import { SafetyCaution } from '../safety-caution';
import { formatNum } from '../../core/format/num';
import { DISPLAY_UNITS, NumPipe } from '../../core/format/num-pipe';
import { inDisplayUnits, type QuantityKind, unitLabel } from '../../core/format/quantities';

interface Compared {
  readonly design: AxleDesign;
  readonly analysis: CornerAnalysis | null;
  /** Why the engine could not solve it: a solver failure (worded in the user's units when shown) or other text. */
  readonly error: AnalysisFailure | string | null;
}

/** One key figure of each compared design: labelled, in the user's units, rounded as its quantity is (core/format/quantities.ts). */
interface FigureRow {
  readonly label: string;
  readonly kind: QuantityKind;
  readonly values: readonly (number | null)[];
  readonly words?: readonly string[];
}

/** Figures of one kind (roll, bump steer, camber), shown under their own heading. */
interface FigureGroup {
  readonly title: string;
  readonly rows: readonly FigureRow[];
}

const MAX_COMPARED = 4;
const TRAVEL = { from: -25, to: 25, step: 2.5 };
const ROLL = { from: -3, to: 3, step: 0.25 };

/**
 * Compare two to four axle designs of a vehicle: key kinematic figures in
 * one table (cells that differ from the first design highlighted) and their
 * toe, camber and roll-steer curves overlaid. Solved in the Web Worker.
 */
/** The bump curve with the rack centred (the first swept when no position is centred). */
function rackCentred(x: CornerAnalysis): CornerAnalysis['curves'][number] {
  return x.curves.find((k) => k.rackMm === 0) ?? x.curves[0]!;
}

@Component({
  selector: 'rw-compare-page',
  imports: [NumPipe, RouterLink, MatButton, MatProgressBar, MatCheckbox, LineChart, SafetyCaution],
  templateUrl: './compare-page.html',
  styleUrl: './compare-page.scss',
  providers: [KinematicsClient],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ComparePage {
  private readonly route = inject(ActivatedRoute);
  private readonly router = inject(Router);
  private readonly api = inject(FeaturesApi);
  private readonly engine = inject(KinematicsClient);
  /** The user's unit system (SI or inch/pound). */
  protected readonly units = inject(DISPLAY_UNITS);

  readonly teamId = input.required<string>();
  readonly vehicleId = input.required<string>();
  /** `?designs=a,b`: the designs compared (kept in the address so a comparison can be shared). */
  readonly designs = input<string | undefined>(undefined);
  protected readonly maxCompared = MAX_COMPARED;

  private readonly designList = rxResource({
    params: () => ({ teamId: this.teamId(), vehicleId: this.vehicleId() }),
    stream: ({ params: p }) => this.api.axleDesigns(p.teamId, p.vehicleId),
  });
  /** The vehicle's axle designs to choose from. */
  protected readonly state = loadState(this.designList);
  /** Why a chosen design could not be read for the comparison. */
  protected readonly compareError = signal<string | null>(null);
  private readonly fromUrl = computed(() => (this.designs() ?? '').split(',').filter(Boolean), {
    equal: (a, b) => a.join(',') === b.join(','),
  });
  /** The designs ticked: those in the address (again for another vehicle), until the user changes the choice. */
  protected readonly chosen = linkedSignal<readonly string[]>(() => {
    this.vehicleId();
    return this.fromUrl().slice(0, MAX_COMPARED);
  });
  protected readonly running = signal(false);
  protected readonly compared = signal<readonly Compared[]>([]);
  protected readonly travel = TRAVEL;

  protected readonly choiceProblem = computed(() => {
    const n = this.chosen().length;
    return n < 2 ? 'Choose at least two designs.' : n > MAX_COMPARED ? `Choose at most ${MAX_COMPARED} designs.` : null;
  });

  protected readonly figureGroups = computed<FigureGroup[]>(() => {
    const list = this.compared();
    const a = (pick: (x: CornerAnalysis) => number) => list.map((c) => (c.analysis ? pick(c.analysis) : null));
    return [
      {
        title: 'In roll',
        rows: [
          {
            label: 'Roll steer coefficient ε',
            kind: 'rollSteer',
            values: a((x) => x.rollSteerCoefficient),
            words: list.map((c) => (c.analysis ? rollSteerWords(c.analysis.rollSteerCoefficient, c.design.axle) : '')),
          },
          { label: 'Roll camber coefficient', kind: 'rollSteer', values: a((x) => x.rollCamberDegPerDeg) },
        ],
      },
      {
        title: 'Toe over one-wheel bump (rack centred)',
        rows: [
          { label: 'Bump steer (toe-in per bump travel)', kind: 'bumpSteer', values: a((x) => rackCentred(x).bumpSteerDegPerM) },
          { label: 'Toe curvature', kind: 'curvature', values: a((x) => rackCentred(x).curvatureDegPerM2) },
          { label: 'Largest toe departure from a straight line', kind: 'angle', values: a((x) => rackCentred(x).maxDeviationDeg) },
        ],
      },
      {
        title: 'Camber over bump (rack centred)',
        rows: [{ label: 'Camber gain', kind: 'camberGain', values: a((x) => rackCentred(x).camberGainDegPerM) }],
      },
    ];
  });

  protected unitOf(kind: QuantityKind): string {
    return unitLabel(kind, this.units());
  }

  private overlay(pick: (x: CornerAnalysis) => { x: number; y: number }[]): LineSeries[] {
    return this.compared()
      .filter((c) => c.analysis)
      .map((c) => ({ name: `${c.design.name} (rev. ${c.design.revision})`, points: pick(c.analysis!) }));
  }

  protected readonly toeOverlay = computed(() =>
    this.overlay((x) => {
      const c = rackCentred(x);
      const ride = c.points.find((p) => p.travelMm === 0)?.toeDeg ?? 0;
      return c.points.map((p) => ({ x: inDisplayUnits(p.travelMm, 'length', this.units()), y: p.toeDeg - ride }));
    }),
  );
  protected readonly camberOverlay = computed(() =>
    this.overlay((x) =>
      rackCentred(x).points.map((p) => ({ x: inDisplayUnits(p.travelMm, 'length', this.units()), y: p.camberDeg })),
    ),
  );
  protected readonly rollOverlay = computed(() =>
    this.overlay((x) => {
      const r = x.roll.find((k) => k.rackMm === 0) ?? x.roll[0]!;
      const zero = r.points.find((p) => p.rollDeg === 0)?.axleSteerDeg ?? 0;
      return r.points.map((p) => ({ x: p.rollDeg, y: p.axleSteerDeg - zero }));
    }),
  );

  constructor() {
    // A shared address with two or more designs compares them once the vehicle's designs have loaded
    // (on arrival, and when the router reuses this page for other parameters).
    effect(() => {
      if (this.state().status !== 'ready' || this.fromUrl().length < 2) return;
      untracked(() => {
        void this.compare();
      });
    });
  }

  protected errorText(error: AnalysisFailure | string): string {
    return typeof error === 'string' ? error : failureWords(error, this.units());
  }

  protected toggle(id: string, on: boolean): void {
    this.chosen.update((c) => (on ? [...c.filter((x) => x !== id), id] : c.filter((x) => x !== id)));
  }

  protected async compare(): Promise<void> {
    if (this.choiceProblem() || this.running()) return;
    this.running.set(true);
    this.compareError.set(null);
    void this.router.navigate([], { relativeTo: this.route, queryParams: { designs: this.chosen().join(',') }, replaceUrl: true });
    const out: Compared[] = [];
    for (const id of this.chosen()) {
      try {
        const design = await firstValueFrom(this.api.axleDesign(this.teamId(), id));
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
          out.push({ design, analysis: null, error: error instanceof AnalysisError ? error.failure : String(error) });
        }
      } catch (error) {
        this.compareError.set(apiProblem(error).message);
      }
    }
    this.compared.set(out);
    this.running.set(false);
  }

  /** True where a value differs from the first design's as shown (in the user's units, at its quantity's precision). */
  protected differs(row: FigureRow, i: number): boolean {
    const first = row.values[0];
    const v = row.values[i];
    if (i === 0 || first === null || first === undefined || v === null || v === undefined) return false;
    return formatNum(v, { kind: row.kind }, this.units()) !== formatNum(first, { kind: row.kind }, this.units());
  }
}
