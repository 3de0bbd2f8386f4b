import { ChangeDetectionStrategy, Component, input, output, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import type { Corner, Vec3 } from '../../../../shared/schema/corner';
import { Linkage3d } from './linkage-3d';

/**
 * The editor's 3D linkage view behind a button: three.js and the view's
 * code load (a lazy chunk, `@defer`) only when the user opens it.
 */
@Component({
  selector: 'rw-linkage-3d-panel',
  imports: [MatButton, Linkage3d],
  template: `
    <div class="rw-3d-panel">
      <button mat-stroked-button type="button" (click)="open.set(!open())" [attr.aria-expanded]="open()" data-testid="open-3d">
        {{ open() ? 'Hide the 3D view' : 'Show the linkage in 3D' }}
      </button>
      @if (open()) {
        @defer (on immediate) {
          <rw-linkage-3d
            [corner]="corner()"
            [posed]="posed()"
            [contactPatch]="contactPatch()"
            [travelMm]="travelMm()"
            [rackMm]="rackMm()"
            [travelRange]="travelRange()"
            [selectedKey]="selectedKey()"
            (picked)="picked.emit($event)"
          />
        } @loading {
          <p class="rw-muted" role="status">Loading the 3D view…</p>
        } @error {
          <p role="alert">The 3D view could not be loaded. Reload the page and try again.</p>
        }
      }
    </div>
  `,
  styles: `
    :host {
      display: block;
      min-width: 0;
    }
    .rw-3d-panel {
      display: grid;
      gap: 8px;
      justify-items: start;
      margin: 12px 0;
    }
    .rw-3d-panel > rw-linkage-3d {
      justify-self: stretch;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Linkage3dPanel {
  readonly corner = input.required<Corner>();
  readonly posed = input<Readonly<Record<string, Vec3>> | null>(null);
  readonly contactPatch = input<Vec3 | null>(null);
  readonly travelMm = input<number>(0);
  readonly rackMm = input<number>(0);
  readonly travelRange = input<{ from: number; to: number }>({ from: -25, to: 25 });
  readonly selectedKey = input<string | null>(null);
  readonly picked = output<string>();
  protected readonly open = signal(false);
}
