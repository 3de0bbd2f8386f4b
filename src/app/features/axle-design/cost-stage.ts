import { ChangeDetectionStrategy, Component, computed, inject, input, output } from '@angular/core';
import { RouterLink } from '@angular/router';
import type { TrackProfileId } from '../../../../shared/tracks/profiles';
import { formatNum } from '../../core/format/num';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { unitLabel } from '../../core/format/quantities';
import type { CornerCautions as CornerCautionsResult } from '../../workers/analysis-types';
import { failureWords } from '../../workers/failure-words';
import { BumpCostView } from '../bump-cost';
import { CornerCautions } from './corner-cautions';
import { TrackProfileSelect } from './track-profile-select';

/**
 * The editor's fourth stage, cost: what the geometry costs on the chosen
 * track profile (bump and roll-steer cautions, the ride model's bump cost),
 * with the way to a tolerance study or a design sweep. Loaded in its own
 * chunk (`@defer`) beside the editor.
 */
@Component({
  selector: 'rw-cost-stage',
  imports: [RouterLink, TrackProfileSelect, CornerCautions, BumpCostView],
  template: `
    <div class="rw-caution-settings">
      <rw-track-profile-select [value]="profile()" (changed)="profileChange.emit($event)" />
      <p class="rw-muted" data-testid="caution-basis">{{ basis() }}</p>
    </div>
    @let c = cautions();
    @if (c && !c.ok) {
      <p class="rw-state rw-state-error" role="alert" data-testid="caution-error">The cautions could not be measured on this profile: {{ failure() }}</p>
    }
    @if (c && c.ok) {
      <div class="rw-cost-grid">
        <div>
          <rw-bump-cost [cost]="c.bumpCost" [unavailable]="c.bumpCostUnavailable" />
        </div>
        <div>
          <rw-corner-cautions [cautions]="c.list" group="bump" title="Bump-steer cautions" data-testid="bump-cautions" />
          <rw-corner-cautions [cautions]="c.list" group="roll" title="Roll-steer cautions" data-testid="roll-cautions" />
        </div>
      </div>
    } @else if (!c) {
      <p class="rw-muted" role="status">The cautions are measured with the next solve.</p>
    }
    <p>
      <a [routerLink]="['/teams', teamId(), 'studies']" [queryParams]="{ axleDesignId: designId() }">Tolerance study or design sweep</a>
      <span class="rw-muted"> — how far the figures move with build tolerances, or across a range of pickup positions.</span>
    </p>
  `,
  styles: `
    :host { display: block; }
    .rw-caution-settings {
      display: flex;
      flex-wrap: wrap;
      gap: 0.5rem 1.5rem;
      align-items: center;
      margin-bottom: 0.75rem;
      p { margin: 0; max-width: 48rem; }
    }
    .rw-cost-grid {
      display: grid;
      grid-template-columns: repeat(auto-fit, minmax(24rem, 1fr));
      gap: 1rem 2rem;
      align-items: start;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CostStage {
  readonly cautions = input<CornerCautionsResult | null>(null);
  readonly profile = input.required<TrackProfileId>();
  readonly teamId = input.required<string>();
  readonly designId = input.required<string>();
  readonly profileChange = output<TrackProfileId>();

  private readonly units = inject(DISPLAY_UNITS);

  private length(mm: number): string {
    return formatNum(mm, { kind: 'length' }, this.units());
  }

  protected readonly failure = computed(() => {
    const c = this.cautions();
    return c && !c.ok ? failureWords(c.failure, this.units()) : '';
  });

  /** How the cautions were measured, in words (beside the profile selector), from the solve that measured them. */
  protected readonly basis = computed(() => {
    const c = this.cautions();
    if (!c) return '';
    const p = c.profile;
    const lu = unitLabel('length', this.units());
    const where = `over ${this.length(p.travelMm[0])} to ${this.length(p.travelMm[1])} ${lu} of travel (the curves' range) with a ${this.length(p.bumpHeightMm)} ${lu} single-wheel bump, on ISO 8608 class ${p.roadClass} at ${formatNum(p.speedKph, { kind: 'speed' }, this.units())} ${unitLabel('speed', this.units())}`;
    if (!c.ok) return `Measured ${where}.`;
    const racks = c.racksMm.length > 1 ? `, at rack ${c.racksMm.map((r) => this.length(r)).join(', ')} ${lu}` : '';
    const vehicle = c.vehicleUsed ? "the vehicle's tyres, loads and roll" : `product default tyre figures (${c.vehicleNote ?? 'no vehicle'})`;
    return `Measured ${where}${racks}, with ${vehicle}; thresholds are the product defaults for ${p.label.toLowerCase()}.`;
  });
}
