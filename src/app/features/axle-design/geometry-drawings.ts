import { ChangeDetectionStrategy, Component, computed, inject, input, output } from '@angular/core';
import { MatSlider, MatSliderThumb } from '@angular/material/slider';
import type { Corner } from '../../../../shared/schema/corner';
import type { DrawnPose } from '../../workers/analysis-types';
import { formatNum } from '../../core/format/num';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { unitLabel } from '../../core/format/quantities';
import { LinkageViews } from './linkage-views';
import { SweepSettings, type TravelRange } from './sweep-settings';

/**
 * The geometry stage's drawings: the pose to draw (wheel travel, and rack
 * travel on a steered corner, on Material sliders), the scaled views at the
 * solved pose and the travel range of the curves. Loaded with the editor
 * but in its own chunk (`@defer`), so the slider code stays out of the
 * editor's first chunk.
 */
@Component({
  selector: 'rw-geometry-drawings',
  imports: [MatSlider, MatSliderThumb, LinkageViews, SweepSettings],
  template: `
    <div class="rw-pose" role="group" aria-label="Pose drawn">
      <div class="rw-pose-control">
        <span class="rw-pose-label" id="rw-pose-travel-label">Wheel travel, + bump: <strong>{{ show(travelMm()) }}</strong></span>
        <mat-slider [min]="range().from" [max]="range().to" [step]="range().step" data-testid="travel-slider">
          <input matSliderThumb aria-labelledby="rw-pose-travel-label" [value]="travelMm()" (input)="travelChange.emit(numberFrom($event))" />
        </mat-slider>
      </div>
      @if (rackStroke(); as stroke) {
        <div class="rw-pose-control">
          <span class="rw-pose-label" id="rw-pose-rack-label">Rack travel, + toward the left: <strong>{{ show(rackMm()) }}</strong></span>
          <mat-slider [min]="stroke[0]" [max]="stroke[1]" step="1" data-testid="rack-slider">
            <input matSliderThumb aria-labelledby="rw-pose-rack-label" [value]="rackMm()" (input)="rackChange.emit(numberFrom($event))" />
          </mat-slider>
        </div>
      }
      <rw-sweep-settings [range]="range()" (rangeChange)="rangeChange.emit($event)" />
    </div>
    <rw-linkage-views [corner]="corner()" [posed]="pose()?.points ?? null" [contactPatch]="pose()?.contactPatch ?? null" [caption]="caption()" />
    @if (pose(); as p) {
      <p class="rw-pose-figures" data-testid="pose-figures">
        Drawn at {{ show(p.travelMm) }} of wheel travel{{ rackStroke() ? ', rack ' + show(p.rackMm) : '' }}: toe {{ deg(p.toeDeg) }} deg (toe-in +), camber {{ deg(p.camberDeg) }} deg (top outboard +).
      </p>
    }
  `,
  styles: `
    :host { display: block; }
    .rw-pose {
      display: flex;
      flex-wrap: wrap;
      gap: 0.25rem 2rem;
      align-items: flex-end;
      margin-bottom: 0.5rem;
    }
    .rw-pose-control { display: flex; flex-direction: column; min-width: 16rem; }
    .rw-pose-label { font: var(--mat-sys-body-small); }
    mat-slider { width: 100%; margin: 0; }
    .rw-pose-figures { font: var(--mat-sys-body-small); }
    @media print { .rw-pose { display: none; } }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class GeometryDrawings {
  readonly corner = input.required<Corner>();
  /** The solved pose (null until the first solve). */
  readonly pose = input<DrawnPose | null>(null);
  readonly range = input.required<TravelRange>();
  readonly travelMm = input<number>(0);
  readonly rackMm = input<number>(0);
  readonly rackStroke = input<readonly [number, number] | null>(null);
  readonly travelChange = output<number>();
  readonly rackChange = output<number>();
  readonly rangeChange = output<TravelRange>();

  private readonly units = inject(DISPLAY_UNITS);

  protected readonly caption = computed(() => {
    const p = this.pose();
    return p ? `At ${this.show(p.travelMm)} travel, rack ${this.show(p.rackMm)}.` : '';
  });

  /** A length (mm) with the user's unit. */
  protected show(mm: number): string {
    const u = this.units();
    return `${formatNum(mm, { kind: 'length' }, u)} ${unitLabel('length', u)}`;
  }

  protected deg(value: number): string {
    return formatNum(value, { decimals: 3 });
  }

  protected numberFrom(event: Event): number {
    return Number((event.target as HTMLInputElement).value);
  }
}
