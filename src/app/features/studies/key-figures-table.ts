import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import type { StudyKeyFigure } from '../../../../shared/study/index';
import { DISPLAY_UNITS, NumPipe } from '../../core/format/num-pipe';
import { studyFormat, studyLabel, studyUnit } from '../../../../shared/study/units';

/** P5 / P50 / P95 of a study's key figures (an attached study on a configuration), in the user's units. */
@Component({
  imports: [NumPipe],
  selector: 'rw-study-key-figures',
  template: `
    <table class="rw-table rw-key-figures" [attr.aria-label]="caption()">
      <thead><tr><th scope="col">Figure</th><th scope="col">P5</th><th scope="col">P50</th><th scope="col">P95</th></tr></thead>
      <tbody>
        @for (f of figures(); track f.key) {
          @let format = studyFormat(f.unit);
          <tr><th scope="row">{{ words(f.label) }} ({{ studyUnit(f.unit, units()) }})</th><td>{{ f.p5 | num: format }}</td><td>{{ f.p50 | num: format }}</td><td>{{ f.p95 | num: format }}</td></tr>
        }
      </tbody>
    </table>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudyKeyFiguresTable {
  readonly figures = input.required<readonly StudyKeyFigure[]>();
  readonly caption = input('Key figures of the study');
  protected readonly units = inject(DISPLAY_UNITS);
  protected readonly studyFormat = studyFormat;
  protected readonly studyUnit = studyUnit;
  /** A key figure's label in the user's units (the figures it carries, such as the bump height). */
  protected readonly words = (label: string) => studyLabel(label, this.units());
}
