import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import type { BumpCost } from '../../../shared/ride/cost';
import { formatFigure } from '../programmes/board-figures';
import { DISPLAY_UNITS, NumPipe } from '../core/format/num-pipe';
import { UnitsTextPipe } from '../core/format/units-text-pipe';
import { type QuantityKind, unitLabel } from '../core/format/quantities';
import { vehicleIssueText } from './vehicle/vehicle-fields';

/**
 * The bump cost of an axle's roll steer on the chosen track profile, from the
 * ride model (shared/ride): what its bump steer does to the car on the
 * profile's road at the profile's speed, with the road class and speed in
 * words. Shown beside every result that carries roll steer.
 */
@Component({
  selector: 'rw-bump-cost',
  imports: [NumPipe, UnitsTextPipe],
  template: `
    <div class="rw-bump-cost" data-testid="bump-cost">
      <h3 class="rw-bump-cost-title">{{ title() }}</h3>
      @if (cost(); as c) {
        <p data-testid="bump-cost-road">On a {{ c.roadInWords | unitsText }}, {{ judged(c) | unitsText }}:</p>
        <dl class="rw-bump-cost-figures">
          <div>
            <dt>Yaw-rate disturbance</dt>
            <dd data-testid="bump-cost-yaw">
              @if (c.yawRateRmsDegPerS !== null) {
                {{ f(c.yawRateRmsDegPerS, 3) }} deg/s RMS, {{ f(c.yawDisturbancePct, 2) }} % of the {{ f(c.steadyYawRateDegPerS, 1) }} deg/s of a {{ c.cornerRadiusM | num: { kind: 'distance' } }} {{ unit('distance') }} corner
              } @else {
                no steady state: the car is above its critical speed
              }
            </dd>
          </div>
          <div>
            <dt>{{ c.bumpHeightMm | num: { kind: 'length' } }} {{ unit('length') }} × {{ c.bumpLengthMm | num: { kind: 'length' } }} {{ unit('length') }} bump under one wheel</dt>
            <dd data-testid="bump-cost-heading">
              turns the car by {{ f(c.headingChangeDeg, 3) }}° ({{ c.driftM === null ? null : 1000 * c.driftM | num: { kind: 'length' } }} {{ unit('length') }} of drift within a second); toe changes by up to {{ f(c.peakToeChangeDeg, 3) }}°
            </dd>
          </div>
          @if (c.landingSideForceFraction !== null) {
            <div>
              <dt>Landing from {{ c.landingDropMm | num: { kind: 'length' } }} {{ unit('length') }}</dt>
              <dd data-testid="bump-cost-landing">a wheel's toe change pushes its tyre sideways with {{ f(100 * c.landingSideForceFraction, 1) }} % of its load</dd>
            </div>
          }
          @if (c.fullLockBumpSteerDegPerM !== null) {
            <div>
              <dt>At full lock (information)</dt>
              <dd>bump steer up to {{ c.fullLockBumpSteerDegPerM | num: { kind: 'bumpSteer' } }} {{ unit('bumpSteer') }}</dd>
            </div>
          }
        </dl>
        <p class="rw-muted">Wheel travel {{ c.wheelTravelRmsMm | num: { kind: 'length' } }} {{ unit('length') }} RMS; left and right tracks taken as independent.</p>
      } @else {
        <p class="rw-muted" data-testid="bump-cost-none">No bump cost: {{ unavailableText() }}.</p>
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

  /** Why there is no bump cost, with the vehicle's fields named by their labels rather than their keys. */
  protected readonly unavailableText = computed(() => {
    const why = this.unavailable();
    return why ? vehicleIssueText(why.replace(/^vehicle\./, '')) : 'not measured';
  });

  protected unit(kind: QuantityKind): string {
    return unitLabel(kind, this.units());
  }

  protected f(v: number | null | undefined, digits: number): string {
    return formatFigure(v, digits);
  }

  protected judged(c: BumpCost): string {
    return c.judgedAt === 'operating-steer' ? `judged at the steer of a ${c.cornerRadiusM} m corner (worse than straight ahead)` : 'judged straight ahead';
  }
}
