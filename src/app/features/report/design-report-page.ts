import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked, ViewEncapsulation } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { firstValueFrom } from 'rxjs';
import type { BalanceResponse } from '../../../../shared/balance/api';
import type { Caution } from '../../../../shared/cautions/cautions';
import { vehicleSchema } from '../../../../shared/schema/vehicle';
import { ENGINE_VERSION } from '../../../../shared/version';
import { apiProblem } from '../../core/http/api-error';
import { loadState } from '../../core/http/load-state';
import { BarChart } from '../../charts/bar-chart';
import { LineChart } from '../../charts/line-chart';
import { BarGroup, LineSeries } from '../../charts/chart-types';
import { AnalysisError, KinematicsClient } from '../../workers/kinematics-client';
import type { CornerAnalysis } from '../../workers/analysis-types';
import { HardpointTable } from '../axle-design/hardpoint-table';
import { AxleDesign, FeaturesApi, Proposal, RevisionRow, VehicleRecord } from '../features-api';
import { CautionList } from '../intent/caution-list';
import { rollSteerWords } from '../../../../shared/balance/roll-steer-words';
import { SafetyCaution } from '../safety-caution';
import { BumpCostView } from '../bump-cost';
import { DEFAULT_TRACK_PROFILE } from '../../../../shared/tracks/profiles';
import { DISPLAY_UNITS, NumPipe } from '../../core/format/num-pipe';
import { formatNum } from '../../core/format/num';
import { inDisplayUnits, type QuantityKind, unitLabel } from '../../core/format/quantities';
import { LocalTimePipe } from '../../core/time/local-time';

const TRAVEL = { from: -25, to: 25, step: 2.5 };
const ROLL = { from: -3, to: 3, step: 0.25 };

/**
 * Printable report of one axle design revision: inputs (hardpoints, link
 * lengths), kinematic curves and figures, the understeer budget of the
 * vehicle with this design, cautions from the intent solve that proposed the
 * geometry (when there was one), the revision history and the safety
 * caution. Laid out for print (the print stylesheet drops the app's chrome).
 */
@Component({
  selector: 'rw-design-report-page',
  imports: [NumPipe, LocalTimePipe, RouterLink, MatButton, HardpointTable, LineChart, BarChart, CautionList, SafetyCaution, BumpCostView],
  templateUrl: './design-report-page.html',
  styleUrl: './design-report-page.scss',
  // The print stylesheet reaches the app shell (hides the top bar when printing).
  // eslint-disable-next-line @angular-eslint/use-component-view-encapsulation
  encapsulation: ViewEncapsulation.None,
  providers: [KinematicsClient],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DesignReportPage {
  private readonly api = inject(FeaturesApi);
  private readonly engine = inject(KinematicsClient);

  readonly teamId = input.required<string>();
  readonly vehicleId = input.required<string>();
  readonly designId = input.required<string>();
  protected readonly engineVersion = ENGINE_VERSION;
  protected readonly printedAt = new Date().toISOString();
  /** The user's unit system (SI or inch/pound): the report's figures and curves follow it. */
  protected readonly units = inject(DISPLAY_UNITS);
  protected readonly travel = TRAVEL;

  private readonly loaded = rxResource({
    params: () => ({ teamId: this.teamId(), designId: this.designId() }),
    stream: ({ params: p }) => this.api.axleDesign(p.teamId, p.designId),
  });
  /** The design revision the report is about. */
  protected readonly state = loadState(this.loaded);
  protected readonly design = computed(() => {
    const s = this.state();
    return s.status === 'ready' ? s.value : null;
  });
  protected readonly vehicle = signal<VehicleRecord | null>(null);
  protected readonly revisions = signal<readonly RevisionRow[]>([]);
  protected readonly analysis = signal<CornerAnalysis | null>(null);
  protected readonly analysisError = signal<string | null>(null);
  protected readonly balance = signal<BalanceResponse | null>(null);
  protected readonly balanceNote = signal<string | null>(null);
  protected readonly source = signal<Proposal | null>(null);

  /** The author of the revision reported, as its revision list names it (the record's last writer until the list is there). */
  protected readonly revisionAuthor = computed(() => {
    const d = this.design();
    if (!d) return null;
    const row = this.revisions().find((r) => r.revision === d.revision);
    return row ? row.authorName : d.updatedByName;
  });

  protected readonly words = computed(() => {
    const a = this.analysis();
    const d = this.design();
    return a && d ? rollSteerWords(a.rollSteerCoefficient, d.axle) : '';
  });

  /** The ride model's bump cost on the axle's default track profile, beside the roll steer. */
  protected readonly bumpCost = computed(() => {
    const c = this.analysis()?.cautions;
    return c && c.ok ? { cost: c.bumpCost, unavailable: c.bumpCostUnavailable } : c && !c.ok ? { cost: null, unavailable: c.failure.message } : null;
  });

  protected readonly cautions = computed<Caution[]>(() => {
    const o = this.source()?.origin as { cautions?: Caution[] } | null | undefined;
    return Array.isArray(o?.cautions) ? o!.cautions : [];
  });

  protected readonly toe = computed<LineSeries[]>(() =>
    (this.analysis()?.curves ?? []).map((c) => {
      const ride = c.points.find((p) => p.travelMm === 0)?.toeDeg ?? 0;
      return { name: this.rackName(c.rackMm), points: c.points.map((p) => ({ x: inDisplayUnits(p.travelMm, 'length', this.units()), y: p.toeDeg - ride })) };
    }),
  );
  protected readonly camber = computed<LineSeries[]>(() =>
    (this.analysis()?.curves ?? []).map((c) => ({
      name: this.rackName(c.rackMm),
      points: c.points.map((p) => ({ x: inDisplayUnits(p.travelMm, 'length', this.units()), y: p.camberDeg })),
    })),
  );
  protected readonly roll = computed<LineSeries[]>(() =>
    (this.analysis()?.roll ?? []).map((c) => {
      const zero = c.points.find((p) => p.rollDeg === 0)?.axleSteerDeg ?? 0;
      return { name: this.rackName(c.rackMm), points: c.points.map((p) => ({ x: p.rollDeg, y: p.axleSteerDeg - zero })) };
    }),
  );
  protected readonly budget = computed<BarGroup[]>(() => {
    const b = this.balance()?.understeerBudget;
    if (!b) return [];
    return (
      [
        ['Tyres', b.tyres],
        ['Load transfer', b.loadTransfer],
        ['Roll steer', b.rollSteer],
        ['Roll camber', b.rollCamber],
        ['Compliance steer', b.complianceSteer],
        ['Aligning torque', b.alignTorque],
        ['Total', b.total],
      ] as const
    ).map(([label, v]) => ({ label, values: [v] }));
  });

  constructor() {
    // Each loaded design (on arrival, and when the router reuses this page for another one) is solved and reported.
    effect(() => {
      const design = this.design();
      if (design) {
        untracked(() => {
          void this.analyse(design);
        });
      }
    });
  }

  /** The design's kinematics (in the Web Worker), its revisions and source proposal, and the vehicle's balance with it. */
  private async analyse(design: AxleDesign): Promise<void> {
    const stroke = design.corner.steered && design.corner.steering?.kind === 'rack' ? design.corner.steering.rackStroke : null;
    // The bump cost beside the roll steer needs the vehicle's ride data (masses, springs, dampers, tyres).
    const vehicleData = await firstValueFrom(this.api.vehicle(this.teamId(), this.vehicleId()))
      .then((v) => v.data as unknown)
      .catch(() => null);
    const cautions = { axle: design.axle, trackProfile: { id: DEFAULT_TRACK_PROFILE[design.axle] }, vehicleData };
    const kinematics = this.engine
      .analyse({ corner: design.corner, travel: TRAVEL, rackMm: stroke ? [0, stroke[0] / 2, stroke[1] / 2] : [0], roll: ROLL, pose: { travelMm: 0, rackMm: 0 }, cautions })
      .then((a) => this.analysis.set(a))
      .catch((e) => this.analysisError.set(e instanceof AnalysisError ? e.message : String(e)));
    const others = Promise.all([
      firstValueFrom(this.api.axleDesignRevisions(this.teamId(), this.designId())).then((r) => this.revisions.set(r)),
      firstValueFrom(this.api.proposals(this.teamId(), this.designId())).then((list) =>
        this.source.set(list.find((p) => p.status === 'accepted' && p.acceptedRevision === design.revision) ?? null),
      ),
      this.loadBalance(design),
    ]).catch((e) => this.balanceNote.set(apiProblem(e).message));
    await Promise.all([kinematics, others]);
  }

  /** The vehicle with this design on its axle and the first design of the other axle. */
  private async loadBalance(design: AxleDesign): Promise<void> {
    const vehicle = await firstValueFrom(this.api.vehicle(this.teamId(), this.vehicleId()));
    this.vehicle.set(vehicle);
    if (!vehicleSchema.safeParse(vehicle.data).success) {
      this.balanceNote.set('The vehicle data is incomplete, so no understeer budget is given.');
      return;
    }
    const list = await firstValueFrom(this.api.axleDesigns(this.teamId(), this.vehicleId()));
    const otherAxle = design.axle === 'front' ? 'rear' : 'front';
    const other = list.find((d) => d.axle === otherAxle);
    const otherCorner = other ? (await firstValueFrom(this.api.axleDesign(this.teamId(), other.id))).corner : undefined;
    const corners = design.axle === 'front' ? { frontCorner: design.corner, rearCorner: otherCorner } : { frontCorner: otherCorner, rearCorner: design.corner };
    const request = { vehicle: vehicle.data, ...Object.fromEntries(Object.entries(corners).filter(([, c]) => c)) };
    const response = await firstValueFrom(this.api.balance<BalanceResponse>(request));
    this.balance.set(response.result);
    this.balanceNote.set(`With the ${otherAxle} axle design ${other ? `"${other.name}"` : 'values of the vehicle page'}.`);
  }

  protected unit(kind: QuantityKind): string {
    return unitLabel(kind, this.units());
  }

  private rackName(rackMm: number): string {
    return `Rack ${formatNum(rackMm, { kind: 'length' }, this.units())} ${this.unit('length')}`;
  }

  protected print(): void {
    globalThis.print();
  }

}
