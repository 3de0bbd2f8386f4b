import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';
import { MatSelectModule } from '@angular/material/select';
import { Router, RouterLink } from '@angular/router';
import { trackProfiles, type TrackProfileId } from '../../../shared/tracks/profiles';
import { formatLocalTime, browserTimeZone } from '../core/time/local-time';
import { AuthService } from '../core/auth/auth-service';
import { apiProblem } from '../core/http/api-error';
import { loadState } from '../core/http/load-state';
import { Notifier } from '../core/layout/notifier';
import { profileLabel } from './board-figures';
import { ProgrammesApi } from './programmes-api';

/** `/programmes`: an instructor's programmes, and a form to start one. */
@Component({
  selector: 'rw-programme-list-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressSpinnerModule,
    MatSelectModule,
  ],
  templateUrl: './programme-list-page.html',
  styleUrl: './programme-list-page.scss',
})
export class ProgrammeListPage {
  private readonly api = inject(ProgrammesApi);
  private readonly auth = inject(AuthService);
  private readonly notifier = inject(Notifier);
  private readonly router = inject(Router);

  protected readonly instructor = computed(() => this.auth.user()?.instructor === true);
  protected readonly profiles = Object.values(trackProfiles);
  protected readonly profileLabel = profileLabel;
  protected readonly timeZone = browserTimeZone();
  // Only instructors have programmes; nobody else is sent asking.
  private readonly programmes = rxResource({
    params: () => (this.instructor() ? true : undefined),
    stream: () => this.api.list(),
  });
  protected readonly state = loadState(this.programmes);

  protected readonly form = inject(NonNullableFormBuilder).group({
    name: ['', [Validators.required, Validators.maxLength(120)]],
    trackProfile: ['smooth-circuit' as TrackProfileId, [Validators.required]],
  });
  protected readonly creating = signal(false);
  protected readonly failure = signal<string | null>(null);

  protected reload(): void {
    this.programmes.reload();
  }

  protected local(iso: string): string {
    return formatLocalTime(iso, this.timeZone);
  }

  protected create(): void {
    this.failure.set(null);
    const name = this.form.controls.name.value.trim();
    if (!name) this.form.controls.name.setValue('');
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.creating.set(true);
    this.api.create(name, this.form.controls.trackProfile.value).subscribe({
      next: (p) => {
        this.creating.set(false);
        void this.notifier.info(`Programme "${p.name}" created. Invite the teams next.`);
        void this.router.navigate(['/programmes', p.id]);
      },
      error: (error: unknown) => {
        this.creating.set(false);
        this.failure.set(apiProblem(error).message);
      },
    });
  }
}
