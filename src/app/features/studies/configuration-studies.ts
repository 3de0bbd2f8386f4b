import { ChangeDetectionStrategy, Component, effect, inject, input, signal } from '@angular/core';
import { RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { firstValueFrom } from 'rxjs';
import { apiProblem } from '../../core/http/api-error';
import { TeamAccess } from '../../core/teams/team-access';
import { StudiesApi, type AttachedStudy } from './studies-api';
import { StudyKeyFiguresTable } from './key-figures-table';

type State = { kind: 'loading' } | { kind: 'error'; message: string } | { kind: 'ready'; list: AttachedStudy[] };

/**
 * The studies attached to a configuration's review record (shown on the
 * configuration page): each with its P5 / P50 / P95 key figures, a link to
 * the study, and (study:run) a way to detach it.
 */
@Component({
  selector: 'rw-configuration-studies',
  imports: [RouterLink, MatButton, StudyKeyFiguresTable],
  template: `
    @let s = state();
    @if (s.kind === 'loading') {
      <p class="rw-muted" role="status">Loading the attached studies…</p>
    } @else if (s.kind === 'error') {
      <p class="rw-error" role="alert">The attached studies could not be loaded: {{ s.message }}</p>
    } @else if (s.list.length === 0) {
      <p class="rw-muted">No study is attached. Attach a completed tolerance study or design sweep from its page.</p>
    } @else {
      @for (a of s.list; track a.studyId) {
        <article class="rw-attached-study" data-testid="attached-study">
          <h3><a [routerLink]="['/teams', teamId(), 'studies', a.studyId]">{{ a.label }}</a></h3>
          <p class="rw-muted">
            {{ a.kind === 'tolerance' ? 'Tolerance study' : 'Design sweep' }}, {{ a.totalSamples }} {{ a.kind === 'tolerance' ? 'builds' : 'variants' }};
            attached {{ a.attachedAt.slice(0, 10) }}@if (a.attachedBy) { by {{ a.attachedBy.displayName }}}.
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
  protected readonly state = signal<State>({ kind: 'loading' });
  protected readonly busy = signal(false);
  protected readonly actionError = signal<string | null>(null);

  constructor() {
    effect(() => void this.load(this.teamId(), this.configurationId()));
  }

  private async load(teamId: string, configurationId: string): Promise<void> {
    try {
      const { attachments } = await firstValueFrom(this.api.attachedTo(teamId, configurationId));
      this.state.set({ kind: 'ready', list: attachments });
    } catch (err) {
      this.state.set({ kind: 'error', message: apiProblem(err).message });
    }
  }

  protected async detach(a: AttachedStudy): Promise<void> {
    this.busy.set(true);
    this.actionError.set(null);
    try {
      await firstValueFrom(this.api.detach(this.teamId(), a.studyId, a.configurationId));
      await this.load(this.teamId(), this.configurationId());
    } catch (err) {
      this.actionError.set(apiProblem(err).message);
    } finally {
      this.busy.set(false);
    }
  }
}
