import { ChangeDetectionStrategy, Component, inject, input, output } from '@angular/core';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatOption, MatSelect } from '@angular/material/select';
import { trackProfiles, type TrackProfileId } from '../../../../shared/tracks/profiles';
import { DISPLAY_UNITS, NumPipe } from '../../core/format/num-pipe';
import { unitLabel, type QuantityKind } from '../../core/format/quantities';

/** Chooses the track profile the cautions are measured for. */
@Component({
  selector: 'rw-track-profile-select',
  imports: [MatFormField, MatLabel, MatSelect, MatOption, NumPipe],
  template: `
    <mat-form-field class="rw-track-profile" subscriptSizing="dynamic">
      <mat-label>Track profile for the cautions</mat-label>
      <mat-select [value]="value()" (selectionChange)="pick($event.value)" data-testid="track-profile">
        @for (p of profiles; track p.id) {
          <mat-option [value]="p.id">{{ p.label }} (ISO 8608 class {{ p.roadClass }} at {{ p.speedKph | num: { kind: 'speed' } }} {{ unit('speed') }}, {{ p.bumpHeightMm | num: { kind: 'length' } }} {{ unit('length') }} bump)</mat-option>
        }
      </mat-select>
    </mat-form-field>
  `,
  styles: `
    :host { display: block; flex: 1 1 28rem; max-width: 40rem; }
    .rw-track-profile { width: 100%; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TrackProfileSelect {
  readonly value = input.required<TrackProfileId>();
  readonly changed = output<TrackProfileId>();
  protected readonly profiles = Object.values(trackProfiles);
  private readonly units = inject(DISPLAY_UNITS);

  protected unit(kind: QuantityKind): string {
    return unitLabel(kind, this.units());
  }

  pick(id: unknown): void {
    if (typeof id === 'string' && id in trackProfiles) this.changed.emit(id as TrackProfileId);
  }
}
