import { ChangeDetectionStrategy, Component, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import type { Corner } from '../../../../shared/schema/corner';
import type { Proposal, RevisionRow } from '../features-api';
import { OutputCurves } from './output-curves';
import type { AxleName } from '../../../../shared/schema/axle';

/**
 * The editor's output curves behind a button: the panel's code and its
 * worker load (`@defer`) only when the user opens it, so the editor's first
 * load and every edit's redraw carry none of it until then.
 */
@Component({
  selector: 'rw-output-curves-panel',
  imports: [MatButton, OutputCurves],
  template: `
    <div class="rw-curves-panel">
      <button mat-stroked-button type="button" (click)="open.set(!open())" [attr.aria-expanded]="open()" data-testid="open-curves">
        {{ open() ? 'Hide the output curves' : 'Show the output curves (toe, camber, caster, roll centre, anti features and more)' }}
      </button>
      @if (open()) {
        @defer (on immediate) {
          <rw-output-curves
            [corner]="corner()"
            [axle]="axle()"
            [teamId]="teamId()"
            [designId]="designId()"
            [vehicleId]="vehicleId()"
            [revision]="revision()"
            [dirty]="dirty()"
            [revisions]="revisions()"
            [proposals]="proposals()"
            [travelRange]="travelRange()"
            [rackMm]="rackMm()"
            [travelMm]="travelMm()"
          />
        } @loading {
          <p class="rw-muted" role="status">Loading the output curves…</p>
        } @error {
          <p role="alert">The output curves could not be loaded. Reload the page and try again.</p>
        }
      }
    </div>
  `,
  styles: `
    :host {
      display: block;
      min-width: 0;
    }
    .rw-curves-panel {
      display: grid;
      gap: 8px;
      justify-items: start;
      margin: 12px 0;
    }
    .rw-curves-panel > rw-output-curves {
      justify-self: stretch;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutputCurvesPanel {
  readonly corner = input.required<Corner>();
  readonly axle = input<AxleName>('front');
  readonly teamId = input.required<string>();
  readonly designId = input.required<string>();
  readonly vehicleId = input.required<string>();
  readonly revision = input.required<number>();
  readonly dirty = input<boolean>(false);
  readonly revisions = input<readonly RevisionRow[]>([]);
  readonly proposals = input<readonly Proposal[]>([]);
  readonly travelRange = input<{ from: number; to: number; step: number }>({ from: -25, to: 25, step: 2.5 });
  readonly rackMm = input<number>(0);
  readonly travelMm = input<number>(0);
  protected readonly open = signal(false);
}
