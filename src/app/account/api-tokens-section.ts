import { Clipboard } from '@angular/cdk/clipboard';
import { ChangeDetectionStrategy, Component, computed, effect, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormGroupDirective, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';
import { MatRadioModule } from '@angular/material/radio';
import { MatSelectModule } from '@angular/material/select';
import { browserTimeZone, formatLocalTime } from '../core/time/local-time';
import { AuthService } from '../core/auth/auth-service';
import { apiProblem } from '../core/http/api-error';
import { loadState } from '../core/http/load-state';
import { confirmAction } from '../core/layout/confirm-dialog';
import { Notifier } from '../core/layout/notifier';
import { ApiToken, ApiTokensApi, CreatedApiToken, TokenScope } from './api-tokens-api';

/** Expiry choices (the API takes 1–366 days, or none). */
const EXPIRY_CHOICES: readonly { days: number; label: string }[] = [
  { days: 0, label: 'Never' },
  { days: 7, label: 'In 7 days' },
  { days: 30, label: 'In 30 days' },
  { days: 90, label: 'In 90 days' },
  { days: 366, label: 'In a year (366 days)' },
];

/**
 * The account page's personal API tokens for scripts and the command line:
 * create one for a team (read or write, optional expiry), see its secret
 * once, list them and revoke them.
 */
@Component({
  selector: 'rw-api-tokens-section',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    ReactiveFormsModule,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressSpinnerModule,
    MatRadioModule,
    MatSelectModule,
  ],
  templateUrl: './api-tokens-section.html',
  styleUrl: './api-tokens-section.scss',
})
export class ApiTokensSection {
  /** Selects the whole secret on focus, ready to copy. */
  protected selectAll(event: Event): void {
    (event.target as HTMLInputElement).select();
  }

  private readonly api = inject(ApiTokensApi);
  protected readonly auth = inject(AuthService);
  private readonly clipboard = inject(Clipboard);
  private readonly dialog = inject(MatDialog);
  private readonly notifier = inject(Notifier);

  protected readonly expiryChoices = EXPIRY_CHOICES;
  protected readonly timeZone = browserTimeZone();
  // A reload keeps the list shown until the new one arrives.
  private readonly tokens = rxResource({ stream: () => this.api.list() });
  protected readonly state = loadState(this.tokens);

  protected readonly form = inject(NonNullableFormBuilder).group({
    name: ['', [Validators.required, Validators.maxLength(100)]],
    teamId: ['', [Validators.required]],
    scope: ['read' as TokenScope, [Validators.required]],
    expiresInDays: [90],
  });
  protected readonly creating = signal(false);
  protected readonly failure = signal<string | null>(null);
  /** The token just created, whose secret is shown this once. */
  protected readonly created = signal<CreatedApiToken | null>(null);
  protected readonly copied = signal(false);

  protected readonly teams = computed(() => this.auth.memberships());

  constructor() {
    // Preselect the current team once memberships are known.
    effect(() => {
      const team = this.auth.currentTeam();
      if (team && !this.form.controls.teamId.value) this.form.controls.teamId.setValue(team.teamId);
    });
  }

  protected reload(): void {
    this.tokens.reload();
  }

  protected local(iso: string): string {
    return formatLocalTime(iso, this.timeZone);
  }

  protected condition(t: ApiToken): string {
    if (t.revokedAt) return `Revoked ${this.local(t.revokedAt)}`;
    if (t.expiresAt && new Date(t.expiresAt).getTime() <= Date.now()) return `Expired ${this.local(t.expiresAt)}`;
    return t.expiresAt ? `Active until ${this.local(t.expiresAt)}` : 'Active, no expiry';
  }

  protected usable(t: ApiToken): boolean {
    return !t.revokedAt && !(t.expiresAt && new Date(t.expiresAt).getTime() <= Date.now());
  }

  /** `formDir` resets the submitted state too, so the emptied name shows no error. */
  protected create(formDir: FormGroupDirective): void {
    this.failure.set(null);
    const name = this.form.controls.name.value.trim();
    if (!name) this.form.controls.name.setValue('');
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const { teamId, scope, expiresInDays } = this.form.getRawValue();
    this.creating.set(true);
    this.api.create({ name, teamId, scope, ...(expiresInDays > 0 ? { expiresInDays } : {}) }).subscribe({
      next: (t) => {
        this.creating.set(false);
        this.copied.set(false);
        this.created.set(t);
        formDir.resetForm({ name: '', teamId, scope: 'read', expiresInDays: 90 });
        this.reload();
      },
      error: (error: unknown) => {
        this.creating.set(false);
        this.failure.set(apiProblem(error).message);
      },
    });
  }

  protected copySecret(): void {
    const t = this.created();
    if (!t) return;
    if (this.clipboard.copy(t.token)) {
      this.copied.set(true);
      void this.notifier.info('Token copied to the clipboard.');
    } else {
      void this.notifier.error('The browser refused to copy. Select the token and copy it by hand.');
    }
  }

  protected dismissSecret(): void {
    this.created.set(null);
  }

  protected revoke(t: ApiToken): void {
    confirmAction(this.dialog, {
      title: 'Revoke this token?',
      message: `"${t.name}" (${t.prefix}…, ${t.scope} access to ${t.teamName}) stops working at once. Scripts using it will be refused.`,
      confirmLabel: 'Revoke token',
    }).subscribe((ok) => {
      if (!ok) return;
      this.api.revoke(t.id).subscribe({
        next: () => {
          if (this.created()?.id === t.id) this.created.set(null);
          void this.notifier.info(`Token "${t.name}" revoked.`);
          this.reload();
        },
      });
    });
  }
}
