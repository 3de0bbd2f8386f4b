import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { Caution, CautionCode } from '../../../../shared/cautions/cautions';
import { CautionList } from '../intent/caution-list';

/** Which result each caution concerns: the bump-steer fits, or the roll steer ε. */
export const CAUTION_GROUPS: Readonly<Record<'bump' | 'roll', readonly CautionCode[]>> = {
  bump: ['bump-yaw-disturbance', 'bump-heading-change', 'landing-side-force', 'bump-cost-unavailable', 'bump-toe-change', 'bump-lateral-force', 'bump-lateral-scrub', 'lock-bump-steer-spread', 'rack-pose-unreachable'],
  roll: ['front-roll-steer-feel', 'long-travel-roll-steer', 'rear-roll-oversteer', 'roll-steer-curvature', 'compliance-steer-rivals', 'compliance-steer-unmodelled'],
};

/**
 * The cautions of one group, shown beside the result they concern (the
 * safety notice is the page's own, so it is never repeated here).
 */
@Component({
  selector: 'rw-corner-cautions',
  imports: [CautionList],
  template: `
    <div class="rw-corner-cautions" [attr.data-group]="group()">
      <h3 class="rw-corner-cautions-title">{{ title() }}</h3>
      @if (shown().length === 0) {
        <p class="rw-muted">None on this profile.</p>
      } @else {
        <rw-caution-list [cautions]="shown()" [label]="title()" />
      }
    </div>
  `,
  styles: `
    .rw-corner-cautions { margin-top: 0.5rem; }
    .rw-corner-cautions-title { font: var(--mat-sys-title-small); margin: 0.25rem 0; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CornerCautions {
  readonly cautions = input.required<readonly Caution[]>();
  readonly group = input.required<'bump' | 'roll'>();
  readonly title = input<string>('Cautions');
  protected readonly shown = computed(() => {
    const codes = CAUTION_GROUPS[this.group()];
    return this.cautions().filter((c) => codes.includes(c.code));
  });
}
