import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal, untracked } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { RouterLink } from '@angular/router';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';
import { forkJoin, map, Observable, of, switchMap } from 'rxjs';
import type { AxleLink, BalanceResponse } from '../../../../shared/balance/api';
import type { BalanceResult } from '../../../../shared/balance/index';

/** One evaluated case (the baseline, or the variant of a comparison). */
type Evaluated = BalanceResult & { kinematicsLink: { front: AxleLink; rear: AxleLink } };
import type { Corner } from '../../../../shared/schema/corner';
import { vehicleSchema } from '../../../../shared/schema/vehicle';
import { loadState, resourceProblem } from '../../core/http/load-state';
import { wordNumber } from '../../../../shared/schema/issue-words';
import { parseDecimal } from '../axle-design/hardpoint-io';
import { ALL_VEHICLE_FIELDS, vehicleIssuePlace, vehicleIssueText } from '../vehicle/vehicle-fields';
import { BarChart } from '../../charts/bar-chart';
import { LineChart } from '../../charts/line-chart';
import { BarGroup, LineSeries } from '../../charts/chart-types';
import { AxleDesignSummary, FeaturesApi } from '../features-api';
import { SafetyCaution } from '../safety-caution';
import { formatNum } from '../../core/format/num';
import { UnitsTextPipe } from '../../core/format/units-text-pipe';
import { DISPLAY_UNITS, NumPipe } from '../../core/format/num-pipe';
import { fromDisplayUnits, inDisplayUnits, QUANTITIES, type QuantityKind, unitLabel } from '../../core/format/quantities';
import type { DisplayUnits } from '../../core/api-types';

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

/** The quantity kind of a vehicle field's stored unit, for showing it in the user's units. */
const STORED_KIND: Readonly<Record<string, QuantityKind>> = {
  mm: 'length',
  kg: 'mass',
  'N / mm': 'linearRate',
  'N m / deg': 'rollStiffness',
  'kg m^2': 'inertia',
  'N / deg': 'corneringStiffness',
  'deg^-1 N^-1': 'loadSensitivityB',
  'N s / mm': 'dampingRate',
  'N m s / deg': 'rollDamping',
  GPa: 'shearModulus',
};

/** Where each linked value came from (shared/balance/link.ts ValueSource, compliance-link.ts ComplianceSource), in words. */
const SOURCE_WORDS: Readonly<Record<string, string>> = {
  kinematics: "from the axle design's kinematics",
  vehicle: 'from the vehicle page',
  override: 'entered for this evaluation',
  'not-applicable': 'not used',
  entered: 'entered on the vehicle page',
  computed: "from the axle design's bushings",
  none: 'none',
};

/** The inputs one evaluation was made with. */
interface BalanceInputs {
  readonly vehicleId: string;
  readonly vehicleRevision: number;
  readonly baselineFront: string;
  readonly baselineRear: string;
  readonly variantFront: string;
  readonly variantRear: string;
  readonly speedKph: number;
  readonly radiusM: number;
}

/** A result with the inputs that produced it. */
interface Evaluation {
  readonly inputs: BalanceInputs;
  readonly result: BalanceResponse;
}

function sameInputs(a: BalanceInputs | undefined, b: BalanceInputs | undefined): boolean {
  if (a === undefined || b === undefined) return a === b;
  return (Object.keys(a) as (keyof BalanceInputs)[]).every((k) => a[k] === b[k]);
}

function hasVariant(p: BalanceInputs): boolean {
  return p.variantFront !== p.baselineFront || p.variantRear !== p.baselineRear;
}

/** The request's limits (shared/balance/api.ts: the step-steer model divides by the speed). */
const SPEED_RANGE_KPH = { min: 1, max: 400 } as const;
const RADIUS_RANGE_M = { min: 2, max: 10_000 } as const;

/** A range of stored values in the user's units, rounded as the message shows it. */
function inUnits(range: { min: number; max: number }, kind: QuantityKind, units: DisplayUnits): { min: number; max: number } {
  const round = (v: number) => Number(formatNum(v, { kind }, units));
  return { min: round(range.min), max: round(range.max) };
}

/** What is wrong with a typed condition, in the user's words ("500 is outside 1 to 400 km/h"), or null. */
function rangeProblem(text: string, range: { min: number; max: number }, unit: string): string | null {
  if (text.trim() === '') return 'Enter a value.';
  const v = parseDecimal(text);
  if (v === null) return `"${text.trim()}" is not a number.`;
  if (v < range.min || v > range.max) return `${wordNumber(v)} is outside ${wordNumber(range.min)} to ${wordNumber(range.max)} ${unit}.`;
  return null;
}

/** Legend names of the cases drawn: the baseline's designs, and the variant's where it differs. */
function caseNames(p: BalanceInputs, name: (id: string) => string): string[] {
  if (!hasVariant(p)) return [`Baseline: front ${name(p.baselineFront)}, rear ${name(p.baselineRear)}`];
  const parts = (front: string, rear: string) =>
    [p.variantFront !== p.baselineFront ? `front ${name(front)}` : null, p.variantRear !== p.baselineRear ? `rear ${name(rear)}` : null].filter(Boolean).join(', ');
  return [`Baseline: ${parts(p.baselineFront, p.baselineRear)}`, `Variant: ${parts(p.variantFront, p.variantRear)}`];
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
  imports: [NumPipe, UnitsTextPipe, RouterLink, MatProgressBar, MatFormField, MatLabel, MatHint, MatInput, MatSelect, MatOption, BarChart, LineChart, SafetyCaution],
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
  /** The user's unit system (SI or inch/pound): figures, charts and the condition fields follow it. */
  protected readonly units = inject(DISPLAY_UNITS);
  /** The step-steer speed and corner radius as typed, in the user's units (km/h and m, or mph and ft); 80 km/h and 40 m to start. */
  protected readonly speedText = linkedSignal(() => formatNum(80, { kind: 'speed' }, this.units()));
  protected readonly radiusText = linkedSignal(() => formatNum(40, { kind: 'distance' }, this.units()));

  /** What each condition field says is wrong with its entry, in the user's words and units (all at once, beside the field). */
  protected readonly conditionErrors = computed(() => ({
    speed: rangeProblem(this.speedText(), inUnits(SPEED_RANGE_KPH, 'speed', this.units()), unitLabel('speed', this.units())),
    radius: rangeProblem(this.radiusText(), inUnits(RADIUS_RANGE_M, 'distance', this.units()), unitLabel('distance', this.units())),
  }));

  /**
   * The inputs of the evaluation the screen asks for: the vehicle revision, the four design choices
   * and the conditions; undefined while an entry is invalid or the vehicle data incomplete.
   */
  protected readonly inputs = computed<BalanceInputs | undefined>(
    () => {
      const v = this.vehicle();
      const errors = this.conditionErrors();
      if (!v || this.vehicleProblem() || errors.speed || errors.radius) return undefined;
      return {
        vehicleId: v.id,
        vehicleRevision: v.revision,
        baselineFront: this.baselineFront(),
        baselineRear: this.baselineRear(),
        variantFront: this.variantFront(),
        variantRear: this.variantRear(),
        speedKph: fromDisplayUnits(parseDecimal(this.speedText())!, 'speed', this.units()),
        radiusM: fromDisplayUnits(parseDecimal(this.radiusText())!, 'distance', this.units()),
      };
    },
    { equal: sameInputs },
  );

  /** The evaluation on the server: runs on open and again for every new set of inputs (the latest wins). */
  private readonly evaluation = rxResource({
    params: () => this.inputs(),
    stream: ({ params: p }) => this.evaluate(p),
  });

  /**
   * The result on screen with the inputs that produced it. While a new evaluation runs, or when the
   * entries are invalid or the evaluation failed, the last result stays, marked out of date.
   */
  protected readonly shown = linkedSignal<Evaluation | undefined, Evaluation | null>({
    source: () => (this.evaluation.hasValue() ? this.evaluation.value() : undefined),
    computation: (value, previous) => value ?? (previous?.value && previous.value.inputs.vehicleId === this.vehicleId() ? previous.value : null),
  });
  protected readonly result = computed(() => this.shown()?.result ?? null);
  protected readonly running = this.evaluation.isLoading;
  protected readonly outOfDate = computed(() => {
    const shown = this.shown();
    return shown !== null && !sameInputs(shown.inputs, this.inputs());
  });
  protected readonly failure = computed(() => (this.evaluation.status() === 'error' ? resourceProblem(this.evaluation.error()).message : null));

  protected readonly vehicleProblem = computed(() => {
    const v = this.vehicle();
    if (!v) return null;
    const r = vehicleSchema.safeParse(v.data);
    if (r.success) return null;
    const issues = r.error.issues.map((i) => `${vehicleIssuePlace(i.path)}: ${vehicleIssueText(i.message)}`);
    return `The vehicle data is incomplete (${issues.join('; ')}). Complete it on the vehicle page.`;
  });

  protected readonly hasVariant = computed(() => this.result()?.comparison != null);
  /**
   * The names of the cases drawn, from the inputs of the result shown (not the current choices): each
   * says which designs it is, naming only the axles that differ when a variant is compared.
   */
  protected readonly caseNames = computed<readonly string[]>(() => {
    const shown = this.shown();
    return shown ? caseNames(shown.inputs, (id) => this.designName(id)) : [];
  });
  protected readonly seriesNames = computed(() => [...this.caseNames()]);

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
    const units = this.units();
    // A figure with a quantity kind is shown in the user's unit system; the others have one unit in both.
    const row = (label: string, unit: string | QuantityKind, pick: (x: Evaluated) => number | null, digits = 3): KeyFigure => {
      const kind = unit in QUANTITIES ? (unit as QuantityKind) : null;
      const shown = (x: Evaluated) => {
        const value = pick(x);
        return value === null || kind === null ? value : inDisplayUnits(value, kind, units);
      };
      return { label, unit: kind ? unitLabel(kind, units) : unit, baseline: shown(r), variant: v ? shown(v) : null, digits };
    };
    return [
      row('Understeer gradient K on-centre (speeds, gains, step steer)', 'deg/g', (x) => x.onCentreUndersteerGradientDegPerG),
      row(`Understeer gradient K at ${r.budgetLateralAccelerationG} g`, 'deg/g', (x) => x.understeerBudget.total),
      row('Roll steer term', 'deg/g', (x) => x.understeerBudget.rollSteer),
      row('Compliance steer term', 'deg/g', (x) => x.understeerBudget.complianceSteer),
      row('Roll gradient', 'deg/g', (x) => x.rollGradientDegPerG),
      row('Roll stiffness, front', 'rollStiffness', (x) => x.rollStiffnessNmPerDeg.front, 0),
      row('Roll stiffness, rear', 'rollStiffness', (x) => x.rollStiffnessNmPerDeg.rear, 0),
      row('Roll stiffness, front share', '%', (x) => x.rollStiffnessNmPerDeg.frontShare * 100, 1),
      row('Lateral load transfer, front', 'forcePerG', (x) => x.lateralLoadTransfer.frontNPerG, 0),
      row('Lateral load transfer, rear', 'forcePerG', (x) => x.lateralLoadTransfer.rearNPerG, 0),
      row('Load transfer, front share', '%', (x) => x.lateralLoadTransfer.frontShare * 100, 1),
      row('Roll steer coefficient ε used, front', 'deg/deg', (x) => x.kinematicsLink.front.used.rollSteerCoefficient, 4),
      row('Roll steer coefficient ε used, rear', 'deg/deg', (x) => x.kinematicsLink.rear.used.rollSteerCoefficient, 4),
      row('Characteristic speed', 'speed', (x) => x.characteristicSpeedKph, 1),
      row('Critical speed', 'speed', (x) => x.criticalSpeedKph, 1),
      row('Step steer: response time (90 %)', 's', (x) => x.stepSteer.responseTimeS, 3),
      row('Step steer: overshoot', '%', (x) => x.stepSteer.overshootPct, 1),
      row('Step steer: settling time (2 %)', 's', (x) => x.stepSteer.settlingTimeS, 3),
    ];
  });

  /** Corners of the designs already read, by design and revision. */
  private readonly corners = new Map<string, Corner>();

  protected readonly sensitivity = computed(() => (this.result()?.sensitivity?.entries ?? []).slice(0, 12));

  private both<T>(pick: (r: Evaluated) => T): { name: string; value: T }[] {
    const r = this.result();
    if (!r) return [];
    const [baseline = 'Baseline', variant = 'Variant'] = this.caseNames();
    const out = [{ name: baseline, value: pick(r) }];
    if (r.comparison) out.push({ name: variant, value: pick(r.comparison.variant) });
    return out;
  }

  protected readonly yawGain = computed<LineSeries[]>(() =>
    this.both((r) => r.gains.rows).map(({ name, value }) => ({
      name,
      points: value.filter((g) => g.yawRateGainPerS !== null).map((g) => ({ x: inDisplayUnits(g.speedKph, 'speed', this.units()), y: g.yawRateGainPerS! })),
    })),
  );

  protected readonly steerCurve = computed<LineSeries[]>(() =>
    this.both((r) => r.steerCurve.rows).flatMap(({ name, value }) => [
      { name: `${name}, load-sensitive tyres`, points: value.map((s) => ({ x: s.lateralAccelerationG, y: s.steerDeg })) },
      { name: `${name}, linear`, points: value.map((s) => ({ x: s.lateralAccelerationG, y: s.linearSteerDeg })) },
    ]),
  );

  /**
   * How long the step-steer chart runs: twice the slowest shown case's settling time (or its peak or
   * response time when it settles sooner), rounded up to a tenth or half second, within the simulated
   * time; the whole simulation when a case has not settled in it.
   */
  protected readonly stepWindowS = computed(() => {
    const r = this.result();
    if (!r) return null;
    const steps = [r.stepSteer, ...(r.comparison ? [r.comparison.variant.stepSteer] : [])];
    const duration = Math.max(...steps.map((x) => x.durationS));
    if (steps.some((x) => x.settlingTimeS === null)) return duration;
    const slowest = Math.max(...steps.map((x) => Math.max(x.settlingTimeS ?? 0, x.peakTimeS ?? 0, x.responseTimeS ?? 0)));
    const want = 2 * slowest;
    const grain = want < 1 ? 0.1 : 0.5;
    return Math.min(duration, Math.max(grain, Math.ceil(want / grain - 1e-9) * grain));
  });

  protected readonly stepSeries = computed<LineSeries[]>(() => {
    const end = this.stepWindowS() ?? Infinity;
    return this.both((r) => r.stepSteer.history).map(({ name, value }) => ({
      name,
      points: value.filter((h) => h.tS <= end + 1e-9).map((h) => ({ x: h.tS, y: h.yawRateDegPerS })),
    }));
  });

  /** The step's input in words: a road-wheel angle, with the handwheel angle where the steering ratio is known. */
  protected readonly stepInput = computed(() => {
    const r = this.result();
    if (!r) return '';
    const ratio = r.effectiveVehicle.steeringRatio;
    const road = `${formatNum(r.stepSteer.steerDeg, { sig: 3 })} deg road-wheel angle`;
    return ratio === undefined
      ? `${road} (no steering ratio on the vehicle page, so no handwheel angle)`
      : `${road} (${formatNum(r.stepSteer.steerDeg * ratio, { sig: 3 })} deg at the handwheel, overall ratio ${formatNum(ratio, { sig: 3 })}:1)`;
  });

  /** Reads the chosen designs' corners (each design revision once) and asks the server for the balance. */
  private evaluate(p: BalanceInputs): Observable<Evaluation> {
    const vehicle = untracked(this.vehicle)!;
    const corner = (id: string): Observable<Corner | undefined> => {
      if (!id) return of(undefined);
      const revision = untracked(this.designs).find((d) => d.id === id)?.revision;
      const key = `${id}@${revision}`;
      const known = this.corners.get(key);
      if (known) return of(known);
      return this.api.axleDesign(untracked(this.teamId), id).pipe(
        map((d) => {
          this.corners.set(key, d.corner);
          return d.corner;
        }),
      );
    };
    return forkJoin([corner(p.baselineFront), corner(p.baselineRear), corner(p.variantFront), corner(p.variantRear)]).pipe(
      switchMap(([bf, br, vf, vr]) => {
        const request = {
          vehicle: vehicle.data,
          ...(bf ? { frontCorner: bf } : {}),
          ...(br ? { rearCorner: br } : {}),
          speedKph: p.speedKph,
          cornerRadiusM: p.radiusM,
          ...(hasVariant(p) ? { variant: { vehicle: vehicle.data, ...(vf ? { frontCorner: vf } : {}), ...(vr ? { rearCorner: vr } : {}) } } : {}),
        };
        return this.api.balance<BalanceResponse>(request);
      }),
      map((response) => ({ inputs: p, result: response.result })),
    );
  }

  /** Where a value the balance model used came from, in words. */
  protected sourceWords(source: string): string {
    return SOURCE_WORDS[source] ?? source;
  }

  protected unitOf(kind: QuantityKind): string {
    return unitLabel(kind, this.units());
  }

  /** A sensitivity entry's input in words, never its document key: "Rear axle, spring rate". */
  protected inputName(path: string): string {
    return vehicleIssuePlace(path.split('.'));
  }

  /** A sensitivity entry's value with its unit, in the user's units where the quantity has them. */
  protected inputValue(path: string, value: number): string {
    const field = ALL_VEHICLE_FIELDS.find((f) => f.path === path);
    const kind = field?.storedUnit ? STORED_KIND[field.storedUnit] : undefined;
    if (kind) return `${formatNum(value, { kind }, this.units())} ${unitLabel(kind, this.units())}`;
    const unit = field && field.plainUnit !== 'ratio' ? ` ${field.plainUnit}` : '';
    return `${formatNum(value, { sig: 4 })}${unit}`;
  }

  protected designName(id: string): string {
    return this.designs().find((d) => d.id === id)?.name ?? 'vehicle page values';
  }

  protected change(f: KeyFigure): string {
    if (f.baseline === null || f.variant === null) return '–';
    if (!this.differs(f)) return '0';
    return formatNum(f.variant - f.baseline, { decimals: f.digits, sign: 'change' });
  }

  protected differs(f: KeyFigure): boolean {
    return f.baseline !== null && f.variant !== null && Math.abs(f.variant - f.baseline) >= 0.5 * 10 ** -f.digits;
  }

  protected value(event: Event): string {
    return (event.target as HTMLInputElement).value;
  }
}
