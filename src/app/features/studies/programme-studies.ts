import { ChangeDetectionStrategy, Component, effect, inject, input, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import { apiProblem } from '../../core/http/api-error';
import { NumPipe } from '../../core/format/num-pipe';
import { StudiesApi, type ProgrammeStudies as ProgrammeStudiesView } from './studies-api';

type State = { kind: 'loading' } | { kind: 'error'; message: string } | { kind: 'ready'; value: ProgrammeStudiesView };

/**
 * The programme board's study column (its instructor): per accepted team,
 * the latest study attached to one of its configurations and its headline
 * figure (P5 / P50 / P95).
 */
@Component({
  imports: [NumPipe],
  selector: 'rw-programme-studies',
  template: `
    @let s = state();
    @if (s.kind === 'loading') {
      <p class="rw-muted" role="status">Loading the attached studies…</p>
    } @else if (s.kind === 'error') {
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
                <td>{{ t.study.label }} ({{ t.study.totalSamples }} {{ t.study.kind === 'tolerance' ? 'builds' : 'variants' }}, {{ t.study.attachedAt.slice(0, 10) }})</td>
                <td>{{ h ? h.label + ' (' + h.unit + ')' : '—' }}</td>
                <td>{{ h?.p5 | num: { sig: 4, missing: '—' } }}</td><td>{{ h?.p50 | num: { sig: 4, missing: '—' } }}</td><td>{{ h?.p95 | num: { sig: 4, missing: '—' } }}</td>
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
  protected readonly state = signal<State>({ kind: 'loading' });

  constructor() {
    effect(() => void this.load(this.programmeId()));
  }

  private async load(id: string): Promise<void> {
    try {
      this.state.set({ kind: 'ready', value: await firstValueFrom(this.api.programmeStudies(id)) });
    } catch (err) {
      this.state.set({ kind: 'error', message: apiProblem(err).message });
    }
  }
}
