import { DOCUMENT } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { MatButton } from '@angular/material/button';

export interface PageSection {
  /** id of the section's heading (or of the element that starts it). */
  readonly id: string;
  readonly label: string;
}

/**
 * "On this page": the sections of a long page, kept in view while scrolling.
 * Choosing one opens it when folded (`<details>`), brings it into view and
 * moves the keyboard focus to its heading.
 */
@Component({
  selector: 'rw-section-nav',
  imports: [MatButton],
  template: `
    <nav class="rw-section-nav" aria-label="On this page">
      <ul>
        @for (s of sections(); track s.id) {
          <li><button mat-button type="button" (click)="jump(s.id)">{{ s.label }}</button></li>
        }
      </ul>
    </nav>
  `,
  styles: `
    :host { display: block; position: sticky; top: 0; z-index: 2; }
    .rw-section-nav {
      margin: 0.5rem -0.5rem 1rem;
      padding: 0.25rem 0.5rem;
      background: var(--mat-sys-surface);
      border-bottom: 1px solid var(--mat-sys-outline-variant);
    }
    ul { display: flex; flex-wrap: wrap; gap: 0.25rem 0.5rem; list-style: none; margin: 0; padding: 0; }
    @media print { :host { display: none; } }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SectionNav {
  readonly sections = input.required<readonly PageSection[]>();
  private readonly document = inject(DOCUMENT);

  jump(id: string): void {
    const target = this.document.getElementById(id);
    if (!target) return;
    const fold = target.closest('details');
    if (fold) fold.open = true;
    if (!target.hasAttribute('tabindex')) target.setAttribute('tabindex', '-1');
    target.scrollIntoView?.({ block: 'start' });
    target.focus({ preventScroll: true });
  }
}
