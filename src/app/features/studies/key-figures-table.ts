import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { StudyKeyFigure } from '../../../../shared/study/index';
import { NumPipe } from '../../core/format/num-pipe';

/** P5 / P50 / P95 of a study's key figures (an attached study on a configuration or the programme board). */
@Component({
  imports: [NumPipe],
  selector: 'rw-study-key-figures',
  template: `
    <table class="rw-table rw-key-figures" [attr.aria-label]="caption()">
      <thead><tr><th scope="col">Figure</th><th scope="col">P5</th><th scope="col">P50</th><th scope="col">P95</th></tr></thead>
      <tbody>
        @for (f of figures(); track f.key) {
          <tr><th scope="row">{{ f.label }} ({{ f.unit }})</th><td>{{ f.p5 | num: { sig: 4, missing: '—' } }}</td><td>{{ f.p50 | num: { sig: 4, missing: '—' } }}</td><td>{{ f.p95 | num: { sig: 4, missing: '—' } }}</td></tr>
        }
      </tbody>
    </table>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudyKeyFiguresTable {
  readonly figures = input.required<readonly StudyKeyFigure[]>();
  readonly caption = input('Key figures of the study');
}
