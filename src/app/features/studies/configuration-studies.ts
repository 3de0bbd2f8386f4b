import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { firstValueFrom, map } from 'rxjs';
import { apiProblem } from '../../core/http/api-error';
import { loadState } from '../../core/http/load-state';
import { TeamAccess } from '../../core/teams/team-access';
import { LocalTimePipe } from '../../core/time/local-time';
import { StudiesApi, type AttachedStudy } from './studies-api';
import { StudyKeyFiguresTable } from './key-figures-table';

/**
 * The studies attached to a configuration's review record (shown on the
 * configuration page): each with its P5 / P50 / P95 key figures, a link to
 * the study, and (study:run) a way to detach it.
 */
@Component({
  selector: 'rw-configuration-studies',
  imports: [RouterLink, MatButton, LocalTimePipe, StudyKeyFiguresTable],
  template: `
    @let s = state();
    @if (s.status === 'loading') {
      <p class="rw-muted" role="status">Loading the attached studies…</p>
    } @else if (s.status === 'error') {
      <p class="rw-error" role="alert">The attached studies could not be loaded: {{ s.message }}</p>
    } @else if (s.value.length === 0) {
      <p class="rw-muted">No study is attached. Attach a completed tolerance study or design sweep from its page.</p>
    } @else {
      @for (a of s.value; track a.studyId) {
        <article class="rw-attached-study" data-testid="attached-study">
          <h3><a [routerLink]="['/teams', teamId(), 'studies', a.studyId]">{{ a.label }}</a></h3>
          <p class="rw-muted">
            {{ a.kind === 'tolerance' ? 'Tolerance study' : 'Design sweep' }}, {{ a.totalSamples }} {{ a.kind === 'tolerance' ? 'builds' : 'variants' }};
            attached <time [attr.datetime]="a.attachedAt">{{ a.attachedAt | localTime }}</time>@if (a.attachedBy) { by {{ a.attachedBy.displayName }}}.
            @if (a.note) { “{{ a.note }}” }
          </p>
          <rw-study-key-figures [figures]="a.keyFigures" [caption]="'Key figures of ' + a.label" />
          @if (canRun()) {
            <button mat-button type="button" (click)="detach(a)" [disabled]="busy()">Detach</button>
          }
        </article>
      }
    }
    @if (actionError(); as m) { <p class="rw-error" role="alert">{{ m }}</p> }
  `,
  styles: `
    .rw-attached-study { margin: 0.75rem 0; }
    .rw-attached-study h3 { margin: 0; font: var(--mat-sys-title-small); }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ConfigurationStudies {
  readonly teamId = input.required<string>();
  readonly configurationId = input.required<string>();
  private readonly api = inject(StudiesApi);
  protected readonly canRun = inject(TeamAccess).permission('study:run');
  private readonly attached = rxResource({
    params: () => ({ teamId: this.teamId(), configurationId: this.configurationId() }),
    stream: ({ params: p }) => this.api.attachedTo(p.teamId, p.configurationId).pipe(map((r): readonly AttachedStudy[] => r.attachments)),
  });
  protected readonly state = loadState(this.attached);
  protected readonly busy = signal(false);
  protected readonly actionError = signal<string | null>(null);

  protected async detach(a: AttachedStudy): Promise<void> {
    this.busy.set(true);
    this.actionError.set(null);
    try {
      await firstValueFrom(this.api.detach(this.teamId(), a.studyId, a.configurationId));
      this.attached.reload();
    } catch (err) {
      this.actionError.set(apiProblem(err).message);
    } finally {
      this.busy.set(false);
    }
  }
}
