import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';
import { firstValueFrom } from 'rxjs';
import { apiProblem } from '../../core/http/api-error';
import { inputValue } from '../../core/forms/dom-events';
import { loadState } from '../../core/http/load-state';
import { ConfigurationsApi, type Configuration } from '../configurations/configurations-api';
import { StudiesApi } from './studies-api';

/**
 * Attaches a completed study to one of the team's configurations, where it
 * joins the configuration's review record (with its key figures) and the
 * programme board. Shown on the study page to people with study:run.
 */
@Component({
  selector: 'rw-study-attach',
  imports: [RouterLink, MatButton, MatFormField, MatLabel, MatInput, MatSelect, MatOption],
  template: `
    @let s = state();
    @if (s.status === 'error') {
      <p class="rw-error" role="alert">The configurations could not be loaded: {{ s.message }}</p>
    } @else {
      <form class="rw-study-row rw-study-attach" (submit)="$event.preventDefault(); attach()" aria-label="Attach to a configuration">
        <mat-form-field>
          <mat-label>Configuration to attach to</mat-label>
          <mat-select name="configuration" [value]="chosen()" (selectionChange)="chosen.set($event.value)" [disabled]="s.status === 'loading'">
            @for (c of configurations(); track c.id) { <mat-option [value]="c.id">{{ c.name }} (revision {{ c.revision }})</mat-option> }
          </mat-select>
        </mat-form-field>
        <mat-form-field class="rw-study-wide">
          <mat-label>Note for the reviewers</mat-label>
          <input matInput name="note" maxlength="500" [value]="note()" (input)="note.set(value($event))" />
        </mat-form-field>
        <button mat-stroked-button type="submit" [disabled]="busy() || chosen() === ''">Attach</button>
      </form>
    }
    @if (attachedTo(); as c) {
      <p role="status">Attached to <a [routerLink]="['/teams', teamId(), 'configurations', c.id]">{{ c.name }}</a>: it is listed in its review record.</p>
    }
    @if (error(); as m) { <p class="rw-error" role="alert">{{ m }}</p> }
  `,
  styles: `
    .rw-study-attach { align-items: center; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudyAttach {
  readonly teamId = input.required<string>();
  readonly studyId = input.required<string>();
  private readonly api = inject(StudiesApi);
  private readonly configs = inject(ConfigurationsApi);
  protected readonly value = inputValue;
  /** The team's configurations to choose from. */
  private readonly list = rxResource({
    params: () => this.teamId(),
    stream: ({ params: teamId }) => this.configs.list(teamId),
  });
  protected readonly state = loadState(this.list);
  protected readonly configurations = computed<readonly Configuration[]>(() => {
    const s = this.state();
    return s.status === 'ready' ? s.value : [];
  });
  protected readonly chosen = signal('');
  protected readonly note = signal('');
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly attachedTo = signal<Configuration | null>(null);

  protected async attach(): Promise<void> {
    const c = this.configurations().find((x) => x.id === this.chosen());
    if (!c) return;
    this.busy.set(true);
    this.error.set(null);
    try {
      await firstValueFrom(this.api.attach(this.teamId(), this.studyId(), c.id, this.note().trim()));
      this.attachedTo.set(c);
    } catch (err) {
      this.error.set(apiProblem(err).message);
    } finally {
      this.busy.set(false);
    }
  }
}
