import { ChangeDetectionStrategy, Component, computed, inject, input, ViewEncapsulation } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { defer, map, Observable, of, switchMap } from 'rxjs';
import type { BalanceResponse } from '../../../../shared/balance/api';
import type { Caution } from '../../../../shared/cautions/cautions';
import { vehicleSchema } from '../../../../shared/schema/vehicle';
import { ENGINE_VERSION } from '../../../../shared/version';
import { loadState, type LoadState } from '../../core/http/load-state';
import { BarChart } from '../../charts/bar-chart';
import { LineChart } from '../../charts/line-chart';
import { BarGroup, LineSeries } from '../../charts/chart-types';
import { AnalysisError, KinematicsClient } from '../../workers/kinematics-client';
import { failureWords } from '../../workers/failure-words';
import type { CornerAnalysis } from '../../workers/analysis-types';
import { HardpointTable } from '../axle-design/hardpoint-table';
import { AxleDesign, FeaturesApi, revisionAuthor, VehicleRecord } from '../features-api';
import { CautionList } from '../intent/caution-list';
import { rollSteerWords } from '../../../../shared/balance/roll-steer-words';
import { SafetyCaution } from '../safety-caution';
import { BumpCostView } from '../bump-cost';
import { DEFAULT_TRACK_PROFILE } from '../../../../shared/tracks/profiles';
import { DISPLAY_UNITS, NumPipe } from '../../core/format/num-pipe';
import { formatNum } from '../../core/format/num';
import { inDisplayUnits, type QuantityKind, unitLabel } from '../../core/format/quantities';
import { LocalTimePipe } from '../../core/time/local-time';
import { cornerInputRows } from '../../../../shared/io/corner-inputs';

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
  // The report's other parts load beside the design, each through its own resource and load state.
  private readonly vehicleResource = rxResource({
    params: () => ({ teamId: this.teamId(), vehicleId: this.vehicleId() }),
    stream: ({ params: p }) => this.api.vehicle(p.teamId, p.vehicleId),
  });
  /** The vehicle: its name, the ride data for the bump cost, and the balance. */
  protected readonly vehicleState = loadState(this.vehicleResource);
  protected readonly vehicle = computed(() => ready(this.vehicleState()));

  private readonly revisionList = rxResource({
    params: () => ({ teamId: this.teamId(), designId: this.designId() }),
    stream: ({ params: p }) => this.api.axleDesignRevisions(p.teamId, p.designId),
  });
  protected readonly revisionsState = loadState(this.revisionList);
  protected readonly revisions = computed(() => ready(this.revisionsState()) ?? []);

  private readonly proposalList = rxResource({
    params: () => ({ teamId: this.teamId(), designId: this.designId() }),
    stream: ({ params: p }) => this.api.proposals(p.teamId, p.designId),
  });
  protected readonly proposalsState = loadState(this.proposalList);
  /** The accepted intent proposal that produced this revision, if one did. */
  protected readonly source = computed(() => {
    const d = this.design();
    const list = ready(this.proposalsState());
    return (d && list?.find((p) => p.status === 'accepted' && p.acceptedRevision === d.revision)) || null;
  });

  /** The design's kinematics in the Web Worker, once the vehicle's ride data (for the bump cost) is known or known to be missing. */
  private readonly analysisResource = rxResource({
    params: () => {
      const design = this.design();
      const vehicle = this.vehicleState();
      if (!design || vehicle.status === 'loading') return undefined;
      return { design, vehicleData: vehicle.status === 'ready' ? (vehicle.value.data) : null };
    },
    stream: ({ params: p }) => defer(() => this.analyse(p.design, p.vehicleData)),
  });
  protected readonly analysisState = loadState(this.analysisResource);
  protected readonly analysis = computed(() => ready(this.analysisState()));
  /** Why the kinematics could not be solved, in the user's words and units. */
  protected readonly analysisError = computed(() => {
    const s = this.analysisState();
    if (s.status !== 'error') return null;
    const e = this.analysisResource.error();
    return e instanceof AnalysisError ? failureWords(e.failure, this.units()) : s.message;
  });

  /** The vehicle's understeer budget with this design, and a note saying what the other axle was. */
  private readonly budgetResource = rxResource({
    params: () => {
      const design = this.design();
      const vehicle = this.vehicle();
      return design && vehicle ? { teamId: this.teamId(), vehicleId: this.vehicleId(), design, vehicle } : undefined;
    },
    stream: ({ params: p }) => this.balanceWith(p.teamId, p.vehicleId, p.design, p.vehicle),
  });
  protected readonly budgetState = loadState(this.budgetResource);
  protected readonly balance = computed(() => ready(this.budgetState())?.result ?? null);

  /** The author of the revision reported, as its revision list names it (the record's last writer until the list is there). */
  protected readonly revisionAuthor = computed(() => revisionAuthor(this.design(), this.revisions()));

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
    return Array.isArray(o?.cautions) ? o.cautions : [];
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

  /** The design's kinematics over the report's travel and roll, with the cautions on the axle's default track profile. */
  private analyse(design: AxleDesign, vehicleData: unknown): Promise<CornerAnalysis> {
    const stroke = design.corner.steered && design.corner.steering?.kind === 'rack' ? design.corner.steering.rackStroke : null;
    const cautions = { axle: design.axle, trackProfile: { id: DEFAULT_TRACK_PROFILE[design.axle] }, vehicleData };
    return this.engine.analyse({ corner: design.corner, travel: TRAVEL, rackMm: stroke ? [0, stroke[0] / 2, stroke[1] / 2] : [0], roll: ROLL, pose: { travelMm: 0, rackMm: 0 }, cautions });
  }

  /** The vehicle with this design on its axle and the first design of the other axle (or the vehicle page's values without one). */
  private balanceWith(teamId: string, vehicleId: string, design: AxleDesign, vehicle: VehicleRecord): Observable<{ result: BalanceResponse | null; note: string }> {
    if (!vehicleSchema.safeParse(vehicle.data).success) return of({ result: null, note: 'The vehicle data is incomplete, so no understeer budget is given.' });
    const otherAxle = design.axle === 'front' ? 'rear' : 'front';
    return this.api.axleDesigns(teamId, vehicleId).pipe(
      switchMap((list) => {
        const other = list.find((d) => d.axle === otherAxle);
        return other ? this.api.axleDesign(teamId, other.id).pipe(map((d) => ({ name: other.name, corner: d.corner }))) : of(null);
      }),
      switchMap((other) => {
        const corners = design.axle === 'front' ? { frontCorner: design.corner, rearCorner: other?.corner } : { frontCorner: other?.corner, rearCorner: design.corner };
        const request = { vehicle: vehicle.data, ...Object.fromEntries(Object.entries(corners).filter(([, c]) => c)) };
        const note = `With the ${otherAxle} axle design ${other ? `"${other.name}"` : 'values of the vehicle page'}.`;
        return this.api.balance<BalanceResponse>(request).pipe(map((response) => ({ result: response.result, note })));
      }),
    );
  }

  /** The corner's steering, attachments and compliance (rigid where no rate is given), in the user's units, each group headed once. */
  protected readonly inputRows = computed(() => {
    const d = this.design();
    const units = this.units();
    return (d ? cornerInputRows(d.corner) : []).map((r, i, all) => {
      const rigid = typeof r.value !== 'string' && 'rigid' in r.value;
      const value =
        typeof r.value === 'string' ? r.value : 'rigid' in r.value ? 'rigid' : r.value.map((x) => formatNum(x, r.kind ? { kind: r.kind, sig: 6, sign: 'minus' } : { sig: 6, sign: 'minus' }, units)).join(', ');
      return { group: all[i - 1]?.group === r.group ? null : r.group, label: r.label, value, unit: r.kind && !rigid ? this.unit(r.kind) : '' };
    });
  });

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

/** The value of a ready load state, else null. */
function ready<T>(s: LoadState<T>): T | null {
  return s.status === 'ready' ? s.value : null;
}
