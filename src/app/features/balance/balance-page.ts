import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { firstValueFrom, forkJoin } from 'rxjs';
import type { AxleLink, BalanceResponse } from '../../../../shared/balance/api';
import type { BalanceResult } from '../../../../shared/balance/index';

/** One evaluated case (the baseline, or the variant of a comparison). */
type Evaluated = BalanceResult & { kinematicsLink: { front: AxleLink; rear: AxleLink } };
import type { Corner } from '../../../../shared/schema/corner';
import { vehicleSchema } from '../../../../shared/schema/vehicle';
import { apiProblem } from '../../core/http/api-error';
import { loadState } from '../../core/http/load-state';
import { BarChart } from '../../charts/bar-chart';
import { LineChart } from '../../charts/line-chart';
import { BarGroup, LineSeries } from '../../charts/chart-types';
import { AxleDesignSummary, FeaturesApi } from '../features-api';
import { SafetyCaution } from '../safety-caution';
import { NumPipe } from '../../core/format/num-pipe';

const BUDGET_LABELS: readonly [keyof BalanceResponse['understeerBudget'], string][] = [
  ['tyres', 'Tyres'],
  ['loadTransfer', 'Load transfer'],
  ['rollSteer', 'Roll steer'],
  ['rollCamber', 'Roll camber'],
  ['complianceSteer', 'Compliance steer'],
  ['alignTorque', 'Aligning torque'],
  ['total', 'Total'],
];

interface KeyFigure {
  readonly label: string;
  readonly unit: string;
  readonly baseline: number | null;
  readonly variant: number | null;
  readonly digits: number;
}

/**
 * Balance view: the vehicle with a baseline pair of axle designs and a
 * variant pair, evaluated by the balance model on the server (which reads
 * ε, roll camber, roll centres and motion ratios from the corners): the
 * understeer budget side by side, key figures with their change, the
 * sensitivity ranking, yaw-rate gain against speed, steer against lateral
 * acceleration and the step-steer response. Every chart has a table and CSV.
 */
@Component({
  selector: 'rw-balance-page',
  imports: [NumPipe, RouterLink, MatButton, MatProgressBar, BarChart, LineChart, SafetyCaution],
  templateUrl: './balance-page.html',
  styleUrl: './balance-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BalancePage {
  private readonly api = inject(FeaturesApi);

  readonly teamId = input.required<string>();
  readonly vehicleId = input.required<string>();

  /** The vehicle and its axle designs, loaded again when the router reuses this page for another vehicle. */
  private readonly loaded = rxResource({
    params: () => ({ teamId: this.teamId(), vehicleId: this.vehicleId() }),
    stream: ({ params: p }) =>
      forkJoin({ vehicle: this.api.vehicle(p.teamId, p.vehicleId), designs: this.api.axleDesigns(p.teamId, p.vehicleId) }),
  });
  protected readonly state = loadState(this.loaded);
  protected readonly vehicle = computed(() => {
    const s = this.state();
    return s.status === 'ready' ? s.value.vehicle : null;
  });
  protected readonly designs = computed<readonly AxleDesignSummary[]>(() => {
    const s = this.state();
    return s.status === 'ready' ? s.value.designs : [];
  });
  protected readonly fronts = computed(() => this.designs().filter((d) => d.axle === 'front'));
  protected readonly rears = computed(() => this.designs().filter((d) => d.axle === 'rear'));
  // The choices start from the loaded designs: baseline and variant on the first front design,
  // the baseline on the first rear design and the variant on the second.
  protected readonly baselineFront = linkedSignal(() => this.fronts()[0]?.id ?? '');
  protected readonly baselineRear = linkedSignal(() => this.rears()[0]?.id ?? '');
  protected readonly variantFront = linkedSignal(() => this.fronts()[0]?.id ?? '');
  protected readonly variantRear = linkedSignal(() => this.rears()[1]?.id ?? '');
  protected readonly speedKph = signal('80');
  protected readonly radiusM = signal('40');

  protected readonly running = signal(false);
  protected readonly failure = signal<string | null>(null);
  protected readonly result = signal<BalanceResponse | null>(null);

  protected readonly vehicleProblem = computed(() => {
    const v = this.vehicle();
    if (!v) return null;
    const r = vehicleSchema.safeParse(v.data);
    return r.success ? null : `The vehicle data is incomplete (${r.error.issues[0]?.path.join('.') || 'vehicle'}: ${r.error.issues[0]?.message}). Complete it on the vehicle page.`;
  });

  protected readonly hasVariant = computed(() => this.result()?.comparison != null);
  protected readonly seriesNames = computed(() => (this.hasVariant() ? ['Baseline', 'Variant'] : ['Baseline']));

  protected readonly budgetGroups = computed<BarGroup[]>(() => {
    const r = this.result();
    if (!r) return [];
    const v = r.comparison?.variant;
    return BUDGET_LABELS.map(([key, label]) => ({
      label,
      values: v ? [r.understeerBudget[key], v.understeerBudget[key]] : [r.understeerBudget[key]],
    }));
  });

  protected readonly keyFigures = computed<KeyFigure[]>(() => {
    const r = this.result();
    if (!r) return [];
    const v = r.comparison?.variant ?? null;
    const row = (label: string, unit: string, pick: (x: Evaluated) => number | null, digits = 3): KeyFigure => ({
      label,
      unit,
      baseline: pick(r),
      variant: v ? pick(v) : null,
      digits,
    });
    return [
      row('Understeer gradient K on-centre (speeds, gains, step steer)', 'deg/g', (x) => x.onCentreUndersteerGradientDegPerG),
      row(`Understeer gradient K at ${r.budgetLateralAccelerationG} g`, 'deg/g', (x) => x.understeerBudget.total),
      row('Roll steer term', 'deg/g', (x) => x.understeerBudget.rollSteer),
      row('Compliance steer term', 'deg/g', (x) => x.understeerBudget.complianceSteer),
      row('Roll gradient', 'deg/g', (x) => x.rollGradientDegPerG),
      row('Roll stiffness, front', 'N·m/deg', (x) => x.rollStiffnessNmPerDeg.front, 0),
      row('Roll stiffness, rear', 'N·m/deg', (x) => x.rollStiffnessNmPerDeg.rear, 0),
      row('Roll stiffness, front share', '%', (x) => x.rollStiffnessNmPerDeg.frontShare * 100, 1),
      row('Lateral load transfer, front', 'N/g', (x) => x.lateralLoadTransfer.frontNPerG, 0),
      row('Lateral load transfer, rear', 'N/g', (x) => x.lateralLoadTransfer.rearNPerG, 0),
      row('Load transfer, front share', '%', (x) => x.lateralLoadTransfer.frontShare * 100, 1),
      row('Roll steer coefficient ε used, front', 'deg/deg', (x) => x.kinematicsLink.front.used.rollSteerCoefficient, 4),
      row('Roll steer coefficient ε used, rear', 'deg/deg', (x) => x.kinematicsLink.rear.used.rollSteerCoefficient, 4),
      row('Characteristic speed', 'km/h', (x) => x.characteristicSpeedKph, 1),
      row('Critical speed', 'km/h', (x) => x.criticalSpeedKph, 1),
      row('Step steer: response time (90 %)', 's', (x) => x.stepSteer.responseTimeS, 3),
      row('Step steer: overshoot', '%', (x) => x.stepSteer.overshootPct, 1),
      row('Step steer: settling time (2 %)', 's', (x) => x.stepSteer.settlingTimeS, 3),
    ];
  });

  protected readonly sensitivity = computed(() => (this.result()?.sensitivity?.entries ?? []).slice(0, 12));

  private both<T>(pick: (r: Evaluated) => T): { name: string; value: T }[] {
    const r = this.result();
    if (!r) return [];
    const out = [{ name: 'Baseline', value: pick(r) }];
    if (r.comparison) out.push({ name: 'Variant', value: pick(r.comparison.variant) });
    return out;
  }

  protected readonly yawGain = computed<LineSeries[]>(() =>
    this.both((r) => r.gains.rows).map(({ name, value }) => ({
      name,
      points: value.filter((g) => g.yawRateGainPerS !== null).map((g) => ({ x: g.speedKph, y: g.yawRateGainPerS! })),
    })),
  );

  protected readonly steerCurve = computed<LineSeries[]>(() =>
    this.both((r) => r.steerCurve.rows).flatMap(({ name, value }) => [
      { name: `${name}, load-sensitive tyres`, points: value.map((s) => ({ x: s.lateralAccelerationG, y: s.steerDeg })) },
      { name: `${name}, linear`, points: value.map((s) => ({ x: s.lateralAccelerationG, y: s.linearSteerDeg })) },
    ]),
  );

  protected readonly stepSeries = computed<LineSeries[]>(() =>
    this.both((r) => r.stepSteer.history).map(({ name, value }) => ({
      name,
      points: value.map((h) => ({ x: h.tS, y: h.yawRateDegPerS })),
    })),
  );

  private async corner(id: string): Promise<Corner | undefined> {
    if (!id) return undefined;
    return (await firstValueFrom(this.api.axleDesign(this.teamId(), id))).corner;
  }

  protected async evaluate(): Promise<void> {
    const v = this.vehicle();
    if (!v || this.vehicleProblem() || this.running()) return;
    const speed = Number(this.speedKph());
    const radius = Number(this.radiusM());
    if (!(speed > 0 && speed <= 400) || !(radius >= 2 && radius <= 10000)) {
      this.failure.set('Speed: above 0 and at most 400 km/h; corner radius: 2 to 10 000 m.');
      return;
    }
    this.running.set(true);
    this.failure.set(null);
    try {
      const [bf, br, vf, vr] = await Promise.all(
        [this.baselineFront(), this.baselineRear(), this.variantFront(), this.variantRear()].map((id) => this.corner(id)),
      );
      const hasVariant = this.variantFront() !== this.baselineFront() || this.variantRear() !== this.baselineRear();
      const request = {
        vehicle: v.data,
        ...(bf ? { frontCorner: bf } : {}),
        ...(br ? { rearCorner: br } : {}),
        speedKph: speed,
        cornerRadiusM: radius,
        ...(hasVariant ? { variant: { vehicle: v.data, ...(vf ? { frontCorner: vf } : {}), ...(vr ? { rearCorner: vr } : {}) } } : {}),
      };
      const response = await firstValueFrom(this.api.balance<BalanceResponse>(request));
      this.result.set(response.result);
    } catch (error) {
      this.failure.set(apiProblem(error).message);
    } finally {
      this.running.set(false);
    }
  }

  protected designName(id: string): string {
    return this.designs().find((d) => d.id === id)?.name ?? 'values entered on the vehicle page';
  }

  protected change(f: KeyFigure): string {
    if (f.baseline === null || f.variant === null) return '–';
    if (!this.differs(f)) return '0';
    const d = f.variant - f.baseline;
    return (d > 0 ? '+' : '') + d.toFixed(f.digits);
  }

  protected differs(f: KeyFigure): boolean {
    return f.baseline !== null && f.variant !== null && Math.abs(f.variant - f.baseline) >= 0.5 * 10 ** -f.digits;
  }

  protected value(event: Event): string {
    return (event.target as HTMLInputElement | HTMLSelectElement).value;
  }
}
