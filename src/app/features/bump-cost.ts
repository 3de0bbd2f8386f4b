import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import type { BumpCost } from '../../../shared/ride/cost';
import { formatFigure } from '../programmes/board-figures';
import { DISPLAY_UNITS } from '../core/format/num-pipe';
import { formatNum } from '../core/format/num';
import { unitLabel, type QuantityKind } from '../core/format/quantities';

/** A document key in words, its unit suffix dropped: `tyre.verticalRateNPerMm` → "tyre vertical rate". */
function keyWords(key: string): string {
  return key
    .split('.')
    .map((part) => part.replace(/(?:Ns?PerMm|NPerDeg|NmPerDeg|NPerKN|DegPerG|DegPerKN|Mm|Kg|Kph|Deg|Pct|M|N)$/, '').replace(/([A-Z])/g, ' $1'))
    .join(' ')
    .toLowerCase()
    .trim();
}

/**
 * The bump cost of an axle's roll steer on the chosen track profile, from the
 * ride model (shared/ride): what its bump steer does to the car on the
 * profile's road at the profile's speed, with the road class and speed in
 * words. Shown beside every result that carries roll steer.
 */
@Component({
  selector: 'rw-bump-cost',
  template: `
    <div class="rw-bump-cost" data-testid="bump-cost">
      <h3 class="rw-bump-cost-title">{{ title() }}</h3>
      @if (cost(); as c) {
        <p data-testid="bump-cost-road">On a {{ c.roadInWords }}, {{ judged(c) }}:</p>
        <dl class="rw-bump-cost-figures">
          <div>
            <dt>Yaw-rate disturbance</dt>
            <dd data-testid="bump-cost-yaw">
              @if (c.yawRateRmsDegPerS !== null) {
                {{ f(c.yawRateRmsDegPerS, 3) }} deg/s RMS, {{ f(c.yawDisturbancePct, 2) }} % of the {{ f(c.steadyYawRateDegPerS, 1) }} deg/s of a {{ q(c.cornerRadiusM, 'distance') }} corner
              } @else {
                no steady state: the car is above its critical speed
              }
            </dd>
          </div>
          <div>
            <dt>{{ q(c.bumpHeightMm, 'length') }} × {{ q(c.bumpLengthMm, 'length') }} bump under one wheel</dt>
            <dd data-testid="bump-cost-heading">
              turns the car by {{ f(c.headingChangeDeg, 3) }}° ({{ c.driftM === null ? '–' : q(1000 * c.driftM, 'length') }} of drift within a second); toe changes by up to {{ f(c.peakToeChangeDeg, 3) }}°
            </dd>
          </div>
          @if (c.landingSideForceFraction !== null) {
            <div>
              <dt>Landing from {{ q(c.landingDropMm, 'length') }}</dt>
              <dd data-testid="bump-cost-landing">a wheel's toe change pushes its tyre sideways with {{ f(100 * c.landingSideForceFraction, 1) }} % of its load</dd>
            </div>
          }
          @if (c.fullLockBumpSteerDegPerM !== null) {
            <div>
              <dt>At full lock (information)</dt>
              <dd>bump steer up to {{ q(c.fullLockBumpSteerDegPerM, 'bumpSteer') }}</dd>
            </div>
          }
        </dl>
        <p class="rw-muted">Wheel travel {{ q(c.wheelTravelRmsMm, 'length') }} RMS; left and right tracks taken as independent.</p>
      } @else {
        <p class="rw-muted" data-testid="bump-cost-none">No bump cost: {{ unavailableWords() }}.</p>
      }
    </div>
  `,
  styles: `
    .rw-bump-cost { margin-top: 0.5rem; }
    .rw-bump-cost-title { font: var(--mat-sys-title-small); margin: 0.25rem 0; }
    .rw-bump-cost-figures { margin: 0.25rem 0; }
    .rw-bump-cost-figures div { display: grid; grid-template-columns: minmax(10rem, 16rem) 1fr; gap: 0.5rem; }
    .rw-bump-cost-figures dt { font-weight: 600; }
    .rw-bump-cost-figures dd { margin: 0; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BumpCostView {
  readonly cost = input<BumpCost | null>(null);
  readonly unavailable = input<string | null>(null);
  readonly title = input<string>('Bump cost of this roll steer');

  private readonly units = inject(DISPLAY_UNITS);

  /** Why there is no bump cost, with a vehicle key named in words ("the front tyre vertical rate"). */
  protected readonly unavailableWords = computed(() =>
    (this.unavailable() ?? 'not measured').replace(/\bvehicle\.((front|rear)\.)?([A-Za-z.]+)/g, (key: string, _axle: string, axle: string | undefined, rest: string) => {
      const label = keyWords(rest);
      return `the vehicle's ${axle ? `${axle} ` : ''}${label}`;
    }),
  );

  protected f(v: number | null | undefined, digits: number): string {
    return formatFigure(v, digits);
  }

  /** A stored figure with its unit, in the user's unit system (to the quantity's significant figures). */
  protected q(v: number | null | undefined, kind: QuantityKind): string {
    const text = formatNum(v, { kind }, this.units());
    return text === '–' ? text : `${text} ${unitLabel(kind, this.units())}`;
  }

  protected judged(c: BumpCost): string {
    return c.judgedAt === 'operating-steer' ? `judged at the steer of a ${c.cornerRadiusM} m corner (worse than straight ahead)` : 'judged straight ahead';
  }
}
