import { ChangeDetectionStrategy, Component, effect, inject, input, signal } from '@angular/core';
import { RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { firstValueFrom } from 'rxjs';
import { apiProblem } from '../../core/http/api-error';
import { ConfigurationsApi, type Configuration } from '../configurations/configurations-api';
import { StudiesApi } from './studies-api';

/**
 * Attaches a completed study to one of the team's configurations, where it
 * joins the configuration's review record (with its key figures) and the
 * programme board. Shown on the study page to people with study:run.
 */
@Component({
  selector: 'rw-study-attach',
  imports: [RouterLink, MatButton],
  template: `
    <form class="rw-study-row" (submit)="$event.preventDefault(); attach()" aria-label="Attach to a configuration">
      <label><span>Attach to configuration</span>
        <select aria-label="Configuration to attach to" name="configuration" (change)="chosen.set(value($event))">
          <option value="" [selected]="chosen() === ''">Choose…</option>
          @for (c of configurations(); track c.id) { <option [value]="c.id" [selected]="chosen() === c.id">{{ c.name }} (r{{ c.revision }})</option> }
        </select>
      </label>
      <label><span>Note for the reviewers</span><input aria-label="Note for the reviewers" name="note" maxlength="500" [value]="note()" (input)="note.set(value($event))" /></label>
      <button mat-stroked-button type="submit" [disabled]="busy() || chosen() === ''">Attach</button>
    </form>
    @if (attachedTo(); as c) {
      <p role="status">Attached to <a [routerLink]="['/teams', teamId(), 'configurations', c.id]">{{ c.name }}</a>: it is listed in its review record.</p>
    }
    @if (error(); as m) { <p class="rw-error" role="alert">{{ m }}</p> }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudyAttach {
  readonly teamId = input.required<string>();
  readonly studyId = input.required<string>();
  private readonly api = inject(StudiesApi);
  private readonly configs = inject(ConfigurationsApi);
  protected readonly configurations = signal<readonly Configuration[]>([]);
  protected readonly chosen = signal('');
  protected readonly note = signal('');
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly attachedTo = signal<Configuration | null>(null);

  constructor() {
    effect(() => {
      const teamId = this.teamId();
      this.configs.list(teamId).subscribe({
        next: (list) => this.configurations.set(list),
        error: (err: unknown) => this.error.set(`The configurations could not be loaded: ${apiProblem(err).message}`),
      });
    });
  }

  protected value(event: Event): string {
    return (event.target as HTMLInputElement | HTMLSelectElement).value;
  }

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
