import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { trackProfiles, type TrackProfileId } from '../../../../shared/tracks/profiles';

/** Chooses the track profile the cautions are measured for. */
@Component({
  selector: 'rw-track-profile-select',
  template: `
    <label class="rw-track-profile">
      <span>Track profile for the cautions</span>
      <select [value]="value()" (change)="pick($event)">
        @for (p of profiles; track p.id) {
          <option [value]="p.id" [selected]="p.id === value()">{{ p.label }} (ISO 8608 class {{ p.roadClass }} at {{ p.speedKph }} km/h, {{ p.bumpHeightMm }} mm bump)</option>
        }
      </select>
    </label>
  `,
  styles: `
    .rw-track-profile { display: inline-flex; flex-direction: column; gap: 0.2rem; }
    .rw-track-profile select { font: inherit; padding: 0.25rem; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TrackProfileSelect {
  readonly value = input.required<TrackProfileId>();
  readonly changed = output<TrackProfileId>();
  protected readonly profiles = Object.values(trackProfiles);

  protected pick(event: Event): void {
    const id = (event.target as HTMLSelectElement).value;
    if (id in trackProfiles) this.changed.emit(id as TrackProfileId);
  }
}
