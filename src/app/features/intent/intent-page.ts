import { ChangeDetectionStrategy, Component, computed, inject, OnInit, signal } from '@angular/core';
import { ActivatedRoute, RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { firstValueFrom } from 'rxjs';
import type { SolveResult } from '../../../../shared/intent/index';
import { trackProfiles, type TrackProfileId } from '../../../../shared/intent/profiles';
import { innerName, outerName } from '../../../../shared/schema/steering-link';
import { vehicleSchema } from '../../../../shared/schema/vehicle';
import { apiProblem } from '../../core/http/api-error';
import { TeamAccess } from '../../core/teams/team-access';
import { LineChart } from '../../charts/line-chart';
import { ChartMark, LineSeries } from '../../charts/chart-types';
import { AnalysisError, AnalysisSuperseded } from '../../workers/kinematics-client';
import { IntentClient } from '../../workers/intent-client';
import { AxleDesign, FeaturesApi } from '../features-api';
import { routeParam } from '../route-params';
import { rollSteerWords } from '../roll-steer-words';
import { SafetyCaution } from '../safety-caution';
import { parseDecimal } from '../axle-design/hardpoint-io';
import { pointName } from '../axle-design/hardpoint-model';
import { CautionList } from './caution-list';
import { BumpCostView } from '../bump-cost';

export type TargetKind = 'epsilon' | 'toePerRoll' | 'understeer' | 'zeroBump';

interface MovableRow {
  readonly name: string;
  readonly label: string;
  readonly current: number;
  /** rack.z bounds are offsets from the current height; all others absolute. */
  readonly offset: boolean;
}

interface MovableState {
  readonly on: boolean;
  readonly min: string;
  readonly max: string;
}

const DEFAULT_HALF_RANGE_MM = 20;

/**
 * Intent panel: what an axle should do in roll, what may move and within
 * which package, on which kind of track; runs the back-solver in a Web
 * Worker with progress, shows the verified result with its family, the
 * workshop numbers and the cautions beside it, and proposes the geometry as
 * a draft revision for a designer to accept.
 */
@Component({
  selector: 'rw-intent-page',
  imports: [RouterLink, MatButton, MatProgressBar, LineChart, SafetyCaution, CautionList, BumpCostView],
  templateUrl: './intent-page.html',
  styleUrl: './intent-page.scss',
  providers: [IntentClient],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class IntentPage implements OnInit {
  private readonly route = inject(ActivatedRoute);
  private readonly api = inject(FeaturesApi);
  private readonly access = inject(TeamAccess);
  private readonly solver = inject(IntentClient);

  protected readonly teamId = routeParam(this.route, 'teamId');
  protected readonly vehicleId = routeParam(this.route, 'vehicleId');
  protected readonly designId = routeParam(this.route, 'designId');

  protected readonly loadError = signal<string | null>(null);
  protected readonly design = signal<AxleDesign | null>(null);
  protected readonly vehicleData = signal<unknown | null>(null);
  protected readonly canPropose = computed(() => this.access.can('design:propose'));

  protected readonly targetKind = signal<TargetKind>('epsilon');
  protected readonly targetText = signal('');
  protected readonly profileId = signal<TrackProfileId>('smooth-circuit');
  protected readonly travelFromText = signal(String(trackProfiles['smooth-circuit'].travelMm[0]));
  protected readonly travelToText = signal(String(trackProfiles['smooth-circuit'].travelMm[1]));
  protected readonly bumpText = signal(String(trackProfiles['smooth-circuit'].bumpHeightMm));
  /** Optional bump-cost budget: RMS yaw-rate disturbance on the profile's road, % of the steady yaw rate (empty: none). */
  protected readonly budgetText = signal('');
  protected readonly movable = signal<Readonly<Record<string, MovableState>>>({});

  protected readonly profiles = Object.values(trackProfiles);

  protected readonly running = signal(false);
  protected readonly progress = signal(0);
  protected readonly progressMessage = signal('');
  protected readonly failure = signal<string | null>(null);
  protected readonly result = signal<SolveResult | null>(null);
  protected readonly proposeMessage = signal('');
  protected readonly proposing = signal(false);
  protected readonly proposed = signal<string | null>(null);
  protected readonly proposeError = signal<string | null>(null);

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

  /** Problems with the entries, in words; the solve runs only without any. */
  protected readonly problems = computed(() => {
    const out: string[] = [];
    const kind = this.targetKind();
    if (kind !== 'zeroBump' && parseDecimal(this.targetText()) === null) out.push('Target: enter a number.');
    if (kind === 'understeer' && !this.vehicleValid()) {
      out.push('An understeer-gradient target needs complete vehicle data (the vehicle page) to turn it into a roll steer coefficient.');
    }
    const on = this.movableRows().filter((r) => this.movable()[r.name]?.on);
    if (on.length === 0) out.push('Choose at least one coordinate that may move.');
    for (const r of on) {
      const s = this.movable()[r.name]!;
      const lo = parseDecimal(s.min);
      const hi = parseDecimal(s.max);
      if (lo === null || hi === null) out.push(`${r.label}: bounds must be numbers in mm.`);
      else if (!(lo < hi)) out.push(`${r.label}: the lower bound must be below the upper bound.`);
      else if (!r.offset && (r.current < lo || r.current > hi)) out.push(`${r.label}: the bounds must include the current ${r.current} mm.`);
    }
    if (on.some((r) => r.name === 'rack.z') && on.some((r) => r.name.endsWith('Inner.z'))) {
      out.push('Rack height and the inner point height move the same point: choose one of them.');
    }
    const from = parseDecimal(this.travelFromText());
    const to = parseDecimal(this.travelToText());
    if (from === null || to === null || !(from < 0 && to > 0)) out.push('Travel range: from a droop below 0 to a bump above 0 mm.');
    const bump = parseDecimal(this.bumpText());
    if (bump === null || bump <= 0) out.push('Single-wheel bump height: a positive number of mm.');
    if (this.budgetText().trim() !== '') {
      const budget = parseDecimal(this.budgetText());
      if (budget === null || budget <= 0) out.push('Bump-cost budget: a positive percentage, or leave it empty.');
      else if (!this.vehicleValid()) out.push('Bump-cost budget: needs the vehicle data (masses, springs, dampers and tyres).');
    }
    return out;
  });

  protected readonly axle = computed(() => this.design()?.axle ?? 'rear');

  protected readonly targetWords = computed(() => {
    const v = parseDecimal(this.targetText());
    if (v === null) return '';
    if (this.targetKind() === 'epsilon') return rollSteerWords(v, this.axle());
    if (this.targetKind() === 'toePerRoll') return rollSteerWords(-v, this.axle());
    return '';
  });

  // ---- result charts ----

  protected readonly familyChart = computed(() => {
    const r = this.result();
    if (!r || r.family.length === 0) return null;
    const names = Object.keys(r.family[0]!.coordinates);
    if (names.length === 0) return null;
    const xName = r.familyParameter && names.includes(r.familyParameter) ? r.familyParameter : names[0]!;
    const yName = names.find((n) => n !== xName) ?? null;
    const yOf = (m: (typeof r.family)[number]) => (yName ? m.coordinates[yName]! : m.objectiveRmsDeg);
    const series: LineSeries[] = [
      { name: 'Solution family', points: r.family.map((m) => ({ x: m.coordinates[xName]!, y: yOf(m) })).sort((a, b) => a.x - b.x) },
    ];
    const chosen = r.family.find((m) => m.chosen);
    const marks: ChartMark[] = chosen ? [{ x: chosen.coordinates[xName]!, y: yOf(chosen), label: 'Chosen' }] : [];
    return {
      series,
      marks,
      x: { label: xName, unit: 'mm' },
      y: yName ? { label: yName, unit: 'mm' } : { label: 'RMS toe deviation', unit: 'deg' },
    };
  });

  /**
   * Balance gained against bump cost: with a vehicle that runs the ride model, the primary coordinate
   * across its bounds (x: yaw-rate disturbance on the profile's road, % of the steady yaw rate);
   * otherwise the family members against their toe change over the single-wheel bump.
   */
  protected readonly tradeOffChart = computed(() => {
    const r = this.result();
    if (!r) return null;
    if (r.tradeOff.length > 0) {
      const useUndersteer = r.tradeOff.every((t) => t.understeerChangeDegPerG !== null);
      const y = (t: (typeof r.tradeOff)[number]) => (useUndersteer ? t.understeerChangeDegPerG! : t.rollSteerCoefficient);
      const points = r.tradeOff.map((t) => ({ x: t.yawDisturbancePct, y: y(t) })).sort((a, b) => a.x - b.x);
      const chosen = r.family.find((m) => m.chosen);
      const chosenY = chosen ? (useUndersteer ? chosen.understeerChangeDegPerG : chosen.rollSteerCoefficient) : null;
      return {
        series: [{ name: `${r.primaryCoordinate} across its bounds`, points }],
        marks: chosen?.bumpCost && chosenY !== null ? [{ x: chosen.bumpCost.yawDisturbancePct, y: chosenY, label: 'Chosen' }] : [],
        x: { label: `Yaw-rate disturbance on ${r.bumpCost?.roadInWords ?? 'the profile road'}, % of steady yaw rate`, unit: '%' },
        y: useUndersteer ? { label: 'Understeer change', unit: 'deg/g' } : { label: 'Roll steer coefficient ε', unit: 'deg/deg' },
      };
    }
    const members = r.family.filter((m) => m.bumpToeChangeDeg !== null);
    if (members.length === 0) return null;
    const useUndersteer = members.every((m) => m.understeerChangeDegPerG !== null);
    const yOf = (m: (typeof members)[number]) => (useUndersteer ? m.understeerChangeDegPerG! : m.rollSteerCoefficient);
    const points = members.map((m) => ({ x: Math.abs(m.bumpToeChangeDeg!), y: yOf(m) })).sort((a, b) => a.x - b.x);
    const chosen = members.find((m) => m.chosen);
    return {
      series: [{ name: 'Family members', points }],
      marks: chosen ? [{ x: Math.abs(chosen.bumpToeChangeDeg!), y: yOf(chosen), label: 'Chosen' }] : [],
      x: { label: 'Toe change over the single-wheel bump', unit: 'deg' },
      y: useUndersteer ? { label: 'Understeer change', unit: 'deg/g' } : { label: 'Roll steer coefficient ε', unit: 'deg/deg' },
    };
  });

  /** The result's cautions; its safety notice is the page's own caution below. */
  protected readonly resultCautions = computed(() => (this.result()?.cautions ?? []).filter((c) => c.code !== 'safety-notice'));

  protected readonly toeChart = computed<LineSeries[]>(() => {
    const r = this.result();
    if (!r) return [];
    const racks = [...new Set(r.achieved.toeCurve.map((p) => p.rackMm))];
    return racks.map((rack) => ({
      name: `Proposed, rack ${rack} mm`,
      points: r.achieved.toeCurve.filter((p) => p.rackMm === rack).map((p) => ({ x: p.travelMm, y: p.toeDeg })),
    }));
  });

  ngOnInit(): void {
    void this.load();
  }

  private async load(): Promise<void> {
    try {
      const [design] = await Promise.all([
        firstValueFrom(this.api.axleDesign(this.teamId, this.designId)),
        firstValueFrom(this.access.load(this.teamId)),
      ]);
      this.design.set(design);
      this.initMovable();
      try {
        const vehicle = await firstValueFrom(this.api.vehicle(this.teamId, this.vehicleId));
        this.vehicleData.set(vehicle.data);
      } catch {
        this.vehicleData.set(null);
      }
    } catch (error) {
      this.loadError.set(apiProblem(error).message);
    }
  }

  private initMovable(): void {
    const state: Record<string, MovableState> = {};
    for (const r of this.movableRows()) {
      const on = r.name.endsWith('Inner.z') || r.name.endsWith('Outer.z');
      const lo = r.offset ? -DEFAULT_HALF_RANGE_MM : r.current - DEFAULT_HALF_RANGE_MM;
      const hi = r.offset ? DEFAULT_HALF_RANGE_MM : r.current + DEFAULT_HALF_RANGE_MM;
      state[r.name] = { on, min: String(Number(lo.toPrecision(10))), max: String(Number(hi.toPrecision(10))) };
    }
    this.movable.set(state);
  }

  protected setMovable(name: string, patch: Partial<MovableState>): void {
    this.movable.update((m) => ({ ...m, [name]: { ...m[name]!, ...patch } }));
  }

  protected chooseProfile(id: string): void {
    const p = trackProfiles[id as TrackProfileId];
    if (!p) return;
    this.profileId.set(p.id);
    this.travelFromText.set(String(p.travelMm[0]));
    this.travelToText.set(String(p.travelMm[1]));
    this.bumpText.set(String(p.bumpHeightMm));
  }

  /** The intent document of shared/schema/intent.ts built from the entries. */
  intentDocument(): Record<string, unknown> {
    const d = this.design()!;
    const value = parseDecimal(this.targetText()) ?? 0;
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
      bounds[r.name] = [parseDecimal(s.min)!, parseDecimal(s.max)!];
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
        travelMm: [parseDecimal(this.travelFromText())!, parseDecimal(this.travelToText())!],
        bumpHeightMm: parseDecimal(this.bumpText())!,
      },
      ...(this.vehicleValid() ? { vehicle: this.vehicleData() } : {}),
      ...(this.budgetText().trim() !== '' ? { options: { bumpYawBudgetPct: parseDecimal(this.budgetText())! } } : {}),
    };
  }

  protected async run(): Promise<void> {
    if (this.problems().length > 0 || this.running()) return;
    this.running.set(true);
    this.failure.set(null);
    this.proposed.set(null);
    this.progress.set(0);
    this.progressMessage.set('starting');
    try {
      const result = await this.solver.solve(this.intentDocument(), (f, m) => {
        this.progress.set(Math.round(f * 100));
        this.progressMessage.set(m);
      });
      this.result.set(result);
    } catch (error) {
      if (error instanceof AnalysisSuperseded) return;
      this.failure.set(error instanceof AnalysisError ? error.failure.message : String(error));
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
    if (!r || !d || this.proposing()) return;
    this.proposing.set(true);
    this.proposeError.set(null);
    try {
      const p = await firstValueFrom(
        this.api.propose(this.teamId, this.designId, {
          corner: r.corner,
          baseRevision: d.revision,
          message: this.proposeMessage().trim() || `Intent: ${r.target.label}, ε ${r.achieved.rollSteerCoefficient.toFixed(4)}`,
          origin: {
            kind: 'intent',
            target: r.target,
            achievedRollSteerCoefficient: r.achieved.rollSteerCoefficient,
            understeerChangeDegPerG: r.understeerChangeDegPerG,
            trackProfile: r.trackProfile.id,
            engineVersion: r.engineVersion,
            cautions: r.cautions.filter((c) => c.code !== 'safety-notice'),
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

  protected fmt(v: number | null | undefined, digits = 3): string {
    return v === null || v === undefined || !Number.isFinite(v) ? '–' : v.toFixed(digits);
  }

  protected words(eps: number): string {
    return rollSteerWords(eps, this.axle());
  }

  protected text(event: Event): string {
    return (event.target as HTMLInputElement).value;
  }

  protected checked(event: Event): boolean {
    return (event.target as HTMLInputElement).checked;
  }
}
