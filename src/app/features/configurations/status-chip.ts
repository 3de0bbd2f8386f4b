import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import type { ConfigurationStatus } from './configurations-api';
import { STATUS_WORDS } from './review-words';

/** A configuration's review status: icon and words (never colour alone). */
@Component({
  selector: 'rw-status-chip',
  imports: [MatIcon],
  template: `<span class="rw-status" [attr.data-status]="status()"><mat-icon aria-hidden="true">{{ words().icon }}</mat-icon><span class="rw-status-label">{{ words().label }}</span></span>`,
  styles: `
    .rw-status {
      display: inline-flex; align-items: center; gap: 0.25rem; padding: 0.1rem 0.6rem 0.1rem 0.35rem;
      border-radius: 1rem; border: 1px solid var(--mat-sys-outline); font: var(--mat-sys-label-large); white-space: nowrap;
      background: var(--mat-sys-surface-container); color: var(--mat-sys-on-surface);
    }
    .rw-status mat-icon { font-size: 1.1rem; width: 1.1rem; height: 1.1rem; }
    .rw-status[data-status='approved'], .rw-status[data-status='released'], .rw-status[data-status='validated'] {
      background: var(--mat-sys-primary-container); color: var(--mat-sys-on-primary-container);
    }
    .rw-status[data-status='changes_requested'] { background: var(--rw-caution-critical-container); color: var(--rw-on-caution-critical-container); }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StatusChip {
  readonly status = input.required<ConfigurationStatus>();
  protected readonly words = computed(() => STATUS_WORDS[this.status()] ?? { label: this.status(), icon: 'help' });
}
