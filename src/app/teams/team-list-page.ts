import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatListModule } from '@angular/material/list';
import { Router, RouterLink } from '@angular/router';
import { map, switchMap } from 'rxjs';
import { AuthService } from '../core/auth/auth-service';
import { apiProblem } from '../core/http/api-error';
import { TeamsApi } from '../core/teams/teams-api';
import { Notifier } from '../core/layout/notifier';

/** As the API: lower-case letters and digits in groups joined by single hyphens, 2–60 long. */
export const TEAM_SLUG_PATTERN = /^[a-z0-9]+(?:-[a-z0-9]+)*$/;
export const TEAM_SLUG_MAX_LENGTH = 60;

/** A short web-safe name from the team name: "Brackenfield Road" → "brackenfield-road". */
export function slugFromName(name: string): string {
  return name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, TEAM_SLUG_MAX_LENGTH)
    .replace(/-+$/g, '');
}

/** `/teams`: the teams the user belongs to, and a form to start a new one. */
@Component({
  selector: 'rw-team-list-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatListModule,
  ],
  templateUrl: './team-list-page.html',
  styleUrl: './team-list-page.scss',
})
export class TeamListPage {
  protected readonly auth = inject(AuthService);
  private readonly api = inject(TeamsApi);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);

  protected readonly form = inject(NonNullableFormBuilder).group({
    name: ['', [Validators.required, Validators.maxLength(120)]],
    slug: [
      '',
      [
        Validators.required,
        Validators.minLength(2),
        Validators.maxLength(TEAM_SLUG_MAX_LENGTH),
        Validators.pattern(TEAM_SLUG_PATTERN),
      ],
    ],
  });
  protected readonly creating = signal(false);
  protected readonly failure = signal<string | null>(null);

  constructor() {
    // Suggest a slug from the name until the user edits the slug themselves.
    this.form.controls.name.valueChanges.pipe(takeUntilDestroyed()).subscribe((name) => {
      if (!this.form.controls.slug.dirty) {
        this.form.controls.slug.setValue(slugFromName(name));
      }
    });
  }

  protected create(): void {
    this.failure.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const { name, slug } = this.form.getRawValue();
    this.creating.set(true);
    this.api
      .create(name.trim(), slug)
      .pipe(switchMap((team) => this.auth.refresh().pipe(map(() => team))))
      .subscribe({
        next: (team) => {
          this.creating.set(false);
          void this.notifier.info(`Team "${team.name}" created. You are its owner.`);
          this.auth.switchTeam(team.id);
          void this.router.navigate(['/teams', team.id]);
        },
        error: (error: unknown) => {
          this.creating.set(false);
          this.failure.set(apiProblem(error).message);
        },
      });
  }
}
