import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { loadState } from '../../core/http/load-state';
import { DISPLAY_UNITS, NumPipe } from '../../core/format/num-pipe';
import { LocalTimePipe } from '../../core/time/local-time';
import { studyFormat, studyUnit } from '../../../../shared/study/units';
import { StudiesApi, type ProgrammeStudies as ProgrammeStudiesView } from './studies-api';

/**
 * The programme board's study column (its instructor): per accepted team,
 * the latest study attached to one of its configurations and its headline
 * figure (P5 / P50 / P95) in the user's units.
 */
@Component({
  imports: [NumPipe, LocalTimePipe],
  selector: 'rw-programme-studies',
  template: `
    @let s = state();
    @if (s.status === 'loading') {
      <p class="rw-muted" role="status">Loading the attached studies…</p>
    } @else if (s.status === 'error') {
      <p class="rw-error" role="alert">The attached studies could not be loaded: {{ s.message }}</p>
    } @else if (s.value.teams.length === 0) {
      <p class="rw-muted">No team is on the board yet, so no study is attached.</p>
    } @else {
      <table class="rw-table" aria-label="Latest attached study per team" data-testid="programme-studies">
        <thead>
          <tr><th scope="col">Team</th><th scope="col">Configuration</th><th scope="col">Study</th><th scope="col">Headline figure</th><th scope="col">P5</th><th scope="col">P50</th><th scope="col">P95</th></tr>
        </thead>
        <tbody>
          @for (t of s.value.teams; track t.teamId) {
            @let h = t.study?.keyFigures?.[0];
            <tr>
              <th scope="row">{{ t.teamName }}</th>
              @if (t.study) {
                <td>{{ t.configurationName }}</td>
                <td>{{ t.study.label }} ({{ t.study.totalSamples }} {{ t.study.kind === 'tolerance' ? 'builds' : 'variants' }}, <time [attr.datetime]="t.study.attachedAt">{{ t.study.attachedAt | localTime }}</time>)</td>
                @if (h) {
                  @let format = studyFormat(h.unit);
                  <td>{{ h.label }} ({{ studyUnit(h.unit, units()) }})</td>
                  <td>{{ h.p5 | num: format }}</td><td>{{ h.p50 | num: format }}</td><td>{{ h.p95 | num: format }}</td>
                } @else {
                  <td>—</td><td>—</td><td>—</td><td>—</td>
                }
              } @else {
                <td colspan="6" class="rw-muted">No study attached yet</td>
              }
            </tr>
          }
        </tbody>
      </table>
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProgrammeStudies {
  readonly programmeId = input.required<string>();
  private readonly api = inject(StudiesApi);
  protected readonly units = inject(DISPLAY_UNITS);
  protected readonly studyFormat = studyFormat;
  protected readonly studyUnit = studyUnit;
  private readonly studies = rxResource({
    params: () => this.programmeId(),
    stream: ({ params: id }) => this.api.programmeStudies(id),
  });
  protected readonly state = loadState<ProgrammeStudiesView>(this.studies);
}
