import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import type { FamilyMemberOut, ProposalDetails, SolveResult } from '../../../../shared/intent/index';
import { LineChart } from '../../charts/line-chart';
import { ChartMark, LineSeries } from '../../charts/chart-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { formatNum } from '../../core/format/num';
import { inDisplayUnits, unitLabel } from '../../core/format/quantities';
import type { RigMeasurementDetail } from '../rig/rig-api';

/** A rig file's measured toe as change from ride height (its value at travel 0 interpolated), mm and deg. */
export function rigToeChange(points: readonly { travelMm: number; toeDeg: number }[]): { travelMm: number; toeDeg: number }[] {
  const sorted = [...points].sort((a, b) => a.travelMm - b.travelMm);
  const above = sorted.findIndex((p) => p.travelMm >= 0);
  if (above < 0 || (above === 0 && sorted[0]!.travelMm > 0)) return [];
  const hi = sorted[above]!;
  const lo = sorted[Math.max(0, above - 1)]!;
  const atZero = hi.travelMm === 0 || hi === lo ? hi.toeDeg : lo.toeDeg + ((0 - lo.travelMm) / (hi.travelMm - lo.travelMm)) * (hi.toeDeg - lo.toeDeg);
  return sorted.map((p) => ({ travelMm: p.travelMm, toeDeg: p.toeDeg - atZero }));
}

/**
 * The intent result's charts, loaded as a deferred part of the intent panel: the chosen member's toe and
 * roll-steer curves over the current geometry's (with the revision's rig files as points), the solution
 * family with the solver's pick and the user's choice, and the balance gained against the bump cost.
 * Every length in the user's unit system.
 */
@Component({
  selector: 'rw-intent-charts',
  imports: [LineChart],
  template: `
    <div class="rw-result-charts">
      @if (details()) {
        <rw-line-chart
          data-testid="toe-overlay"
          chartTitle="Toe against wheel travel: proposed over current"
          [series]="toeOverlay()"
          [x]="{ label: 'Wheel travel, + bump', unit: lengthUnit() }"
          [y]="{ label: 'Toe change from ride height, + in', unit: 'deg' }"
          [description]="rigFiles().length > 0 ? 'Rig measurements of this revision at rack 0 are drawn as points, each from its own value at ride height.' : ''"
        />
        <rw-line-chart
          data-testid="roll-overlay"
          chartTitle="Axle steer against body roll: proposed over current"
          [series]="rollOverlay()"
          [x]="{ label: 'Roll, + right side down', unit: 'deg' }"
          [y]="{ label: 'Axle steer change from zero roll, + left', unit: 'deg' }"
        />
      }
      @if (familyChart(); as f) {
        <rw-line-chart chartTitle="Solution family (coordinates that meet the target)" [series]="f.series" [marks]="f.marks" [x]="f.x" [y]="f.y" [zeroLine]="false" />
      }
      @if (tradeOffChart(); as t) {
        <rw-line-chart data-testid="trade-off" chartTitle="Balance gained against bump cost" [series]="t.series" [marks]="t.marks" [x]="t.x" [y]="t.y" [description]="t.description" />
      }
    </div>
  `,
  styles: `
    .rw-result-charts { display: grid; grid-template-columns: repeat(auto-fit, minmax(24rem, 1fr)); gap: 1rem; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class IntentCharts {
  readonly result = input.required<SolveResult>();
  readonly details = input<ProposalDetails | null>(null);
  readonly rigFiles = input<readonly RigMeasurementDetail[]>([]);
  /** The member chosen to build (its family entry, null for the closest geometry of an infeasible target) and its index in the family. */
  readonly chosen = input<{ member: FamilyMemberOut | null } | null>(null);
  readonly chosenIndex = input<number>(0);
  /** Coordinate names in words. */
  readonly labels = input<Readonly<Partial<Record<string, string>>>>({});
  private readonly units = inject(DISPLAY_UNITS);
  protected readonly lengthUnit = computed(() => unitLabel('length', this.units()));

  private len(v: number): number {
    return inDisplayUnits(v, 'length', this.units());
  }

  protected readonly familyChart = computed(() => {
    const r = this.result();
    if (!r || r.family.length === 0) return null;
    const names = Object.keys(r.family[0]!.coordinates);
    if (names.length === 0) return null;
    const labels = this.labels();
    const xName = r.familyParameter && names.includes(r.familyParameter) ? r.familyParameter : names[0]!;
    const yName = names.find((n) => n !== xName) ?? null;
    const yOf = (m: (typeof r.family)[number]) => (yName ? this.len(m.coordinates[yName]!) : m.objectiveRmsDeg);
    const point = (m: (typeof r.family)[number]) => ({ x: this.len(m.coordinates[xName]!), y: yOf(m) });
    const series: LineSeries[] = [{ name: 'Solution family', points: r.family.map(point).sort((a, b) => a.x - b.x) }];
    const pick = r.family.find((m) => m.chosen);
    const chosen = r.family[this.chosenIndex()];
    const marks: ChartMark[] = [];
    if (pick) marks.push({ ...point(pick), label: "Solver's pick" });
    if (chosen && chosen !== pick) marks.push({ ...point(chosen), label: 'Chosen' });
    const u = this.lengthUnit();
    return {
      series,
      marks,
      x: { label: labels[xName] ?? xName, unit: u },
      y: yName ? { label: labels[yName] ?? yName, unit: u } : { label: 'RMS toe deviation', unit: 'deg' },
    };
  });

  /**
   * Balance gained against bump cost: the primary coordinate swept across its bounds (the family
   * itself all meets the target, so it has no balance to trade). x: the bump cost in its physical
   * unit, the RMS yaw-rate disturbance on the profile's road (deg/s) where the vehicle runs the ride
   * model, else the toe change over the single-wheel bump (deg); y: understeer change (deg/g) with
   * a vehicle, else ε.
   */
  protected readonly tradeOffChart = computed(() => {
    const r = this.result();
    if (!r || r.tradeOff.length < 2) return null;
    const useYaw = r.tradeOff.every((t) => t.yawRateRmsDegPerS !== null);
    const useUndersteer = r.tradeOff.every((t) => t.understeerChangeDegPerG !== null);
    const x = (t: (typeof r.tradeOff)[number]) => (useYaw ? t.yawRateRmsDegPerS! : Math.abs(t.bumpToeChangeDeg));
    const y = (t: (typeof r.tradeOff)[number]) => (useUndersteer ? t.understeerChangeDegPerG! : t.rollSteerCoefficient);
    // In the order of the sweep (the coordinate across its bounds): the bump cost falls to its least where the
    // toe line is straightest and rises again, so sorting by cost would zig-zag between the two sides.
    const points = [...r.tradeOff].sort((a, b) => a.valueMm - b.valueMm).map((t) => ({ x: x(t), y: y(t) }));
    const marks: ChartMark[] = [];
    const m = this.chosen()?.member;
    const mx = m ? (useYaw ? (m.bumpCost?.yawRateRmsDegPerS ?? null) : m.bumpToeChangeDeg === null ? null : Math.abs(m.bumpToeChangeDeg)) : null;
    const my = m ? (useUndersteer ? m.understeerChangeDegPerG : m.rollSteerCoefficient) : null;
    if (mx !== null && my !== null) marks.push({ x: mx, y: my, label: m!.chosen ? "Solver's pick" : 'Chosen' });
    const primary = this.labels()[r.primaryCoordinate] ?? r.primaryCoordinate;
    const spreadX = Math.max(...points.map((p) => p.x)) - Math.min(...points.map((p) => p.x));
    const spreadY = Math.max(...points.map((p) => p.y)) - Math.min(...points.map((p) => p.y));
    return {
      series: [{ name: `${primary} across its bounds`, points }],
      marks,
      x: useYaw
        ? { label: `Yaw-rate disturbance, RMS, on ${r.bumpCost?.roadInWords ?? "the profile's road"}`, unit: 'deg/s' }
        : { label: `Toe change over the ${formatNum(r.trackProfile.bumpHeightMm, { kind: 'length' }, this.units())} ${this.lengthUnit()} single-wheel bump`, unit: 'deg' },
      y: useUndersteer ? { label: 'Understeer-gradient change', unit: 'deg/g' } : { label: 'Roll steer coefficient ε', unit: 'deg/deg' },
      description:
        `Across the bounds of ${primary.toLowerCase()} the bump cost spans ${formatNum(spreadX, { sig: 3 })} ${useYaw ? 'deg/s' : 'deg'} ` +
        `and the ${useUndersteer ? 'understeer change' : 'roll steer coefficient'} ${formatNum(spreadY, { sig: 3 })} ${useUndersteer ? 'deg/g' : 'deg/deg'}.`,
    };
  });

  /** The chosen member's toe change from ride height over the current geometry's (rack straight ahead). */
  protected readonly toeOverlay = computed<LineSeries[]>(() => {
    const d = this.details();
    if (!d) return [];
    const rig: LineSeries[] = this.rigFiles().map((f) => ({
      name: `Rig: ${f.name} (${f.side} wheel)`,
      style: 'points',
      points: rigToeChange(f.points).map((p) => ({ x: this.len(p.travelMm), y: p.toeDeg })),
    }));
    return [
      { name: 'Current geometry', points: d.toeCurve.map((p) => ({ x: this.len(p.travelMm), y: p.currentDeg })) },
      { name: 'Proposed geometry', points: d.toeCurve.map((p) => ({ x: this.len(p.travelMm), y: p.proposedDeg })) },
      ...rig.filter((r) => r.points.length > 0),
    ];
  });

  /** The chosen member's axle steer against roll over the current geometry's. */
  protected readonly rollOverlay = computed<LineSeries[]>(() => {
    const d = this.details();
    if (!d) return [];
    return [
      { name: 'Current geometry', points: d.rollCurve.map((p) => ({ x: p.rollDeg, y: p.currentDeg })) },
      { name: 'Proposed geometry', points: d.rollCurve.map((p) => ({ x: p.rollDeg, y: p.proposedDeg })) },
    ];
  });
}
