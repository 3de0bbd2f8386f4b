import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { catchError, of, switchMap } from 'rxjs';
import { ROLE_DESCRIPTIONS } from '../core/api-types';
import { AuthService } from '../core/auth/auth-service';
import {
  matchingPasswords,
  MAX_PASSWORD_LENGTH,
  MIN_PASSWORD_LENGTH,
} from '../core/auth/password-rules';
import { apiProblem } from '../core/http/api-error';
import { NewPasswordFields } from '../core/forms/new-password-fields';
import { Notifier } from '../core/layout/notifier';
import { TeamAccess } from '../core/teams/team-access';
import { InvitationInfo, InvitationsApi } from './invitations-api';
import { LocalTimePipe } from '../core/time/local-time';

type Loaded =
  | { readonly status: 'loading' }
  | { readonly status: 'ready'; readonly invitation: InvitationInfo }
  | { readonly status: 'error'; readonly code: string; readonly message: string };

/** What the visitor can do with the invitation, given who is signed in. */
export type InvitationMode = 'accept' | 'member' | 'wrong-account' | 'unverified' | 'signed-out';

const LINK_TITLES: Readonly<Record<string, string>> = {
  invitation_expired: 'This invitation has expired',
  invitation_used: 'This invitation was already accepted',
  invitation_invalid: 'This invitation link is not valid',
};

/**
 * `/invitations/:token`, the link of the invitation mail. Shows the team and
 * roles offered; the invited person accepts with a POST: signed in with the
 * invited, confirmed address, or by creating their account here (the link
 * proves the address). Signed out, it offers both alike and never says
 * whether the address has an account. Expired, used and tampered links say so.
 */
@Component({
  selector: 'rw-invitation-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [NewPasswordFields, 
    LocalTimePipe,
    ReactiveFormsModule,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    RouterLink,
  ],
  templateUrl: './invitation-page.html',
  styleUrl: './invitation-page.scss',
})
export class InvitationPage {
  private readonly api = inject(InvitationsApi);
  protected readonly auth = inject(AuthService);
  private readonly access = inject(TeamAccess);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);

  /** From the link (route parameter). */
  readonly token = input.required<string>();

  protected readonly roleDescriptions = ROLE_DESCRIPTIONS;
  protected readonly loaded = signal<Loaded>({ status: 'loading' });
  protected readonly accepting = signal(false);
  protected readonly failure = signal<string | null>(null);

  protected readonly form = inject(NonNullableFormBuilder).group(
    {
      displayName: ['', [Validators.required, Validators.maxLength(100)]],
      password: [
        '',
        [
          Validators.required,
          Validators.minLength(MIN_PASSWORD_LENGTH),
          Validators.maxLength(MAX_PASSWORD_LENGTH),
        ],
      ],
      confirm: ['', [Validators.required]],
    },
    { validators: matchingPasswords() },
  );

  protected readonly invitation = computed(() => {
    const state = this.loaded();
    return state.status === 'ready' ? state.invitation : null;
  });

  protected readonly mode = computed<InvitationMode | null>(() => {
    const invitation = this.invitation();
    if (!invitation) return null;
    const user = this.auth.user();
    // Signed out: both ways in are offered, so the page never says whether the address has an account.
    if (!user) return 'signed-out';
    if (user.email.toLowerCase() !== invitation.email.toLowerCase()) return 'wrong-account';
    if (this.auth.isMemberOf(invitation.teamId)) return 'member';
    // Membership binds to a confirmed address.
    return user.emailVerified ? 'accept' : 'unverified';
  });

  protected readonly linkTitle = computed(() => {
    const state = this.loaded();
    return state.status === 'error'
      ? (LINK_TITLES[state.code] ?? 'The invitation could not be opened')
      : '';
  });

  constructor() {
    effect(() => {
      const token = this.token();
      untracked(() => this.load(token));
    });
  }

  /** Where sign-in should bring the invited person back to. */
  protected returnHere(): { returnUrl: string } {
    return { returnUrl: `/invitations/${encodeURIComponent(this.token())}` };
  }

  private load(token: string): void {
    this.loaded.set({ status: 'loading' });
    // Who is signed in decides what the page offers, so learn that first.
    this.auth
      .ensureLoaded()
      .pipe(
        catchError(() => of(null)),
        switchMap(() => this.api.get(token)),
      )
      .subscribe({
        next: (invitation) => this.loaded.set({ status: 'ready', invitation }),
        error: (error: unknown) => {
          const problem = apiProblem(error);
          this.loaded.set({ status: 'error', code: problem.code, message: problem.message });
        },
      });
  }

  /** Signed in with the invited address: join. */
  protected accept(): void {
    const invitation = this.invitation();
    if (!invitation || this.accepting()) return;
    this.failure.set(null);
    this.accepting.set(true);
    this.api.accept(this.token()).subscribe({
      next: (accepted) =>
        // Re-read `me` so the team switcher lists the new team.
        this.auth.refresh().subscribe({
          next: () => this.enter(accepted.teamId, invitation.teamName),
          error: () => this.enter(accepted.teamId, invitation.teamName),
        }),
      error: (error: unknown) => this.refused(error),
    });
  }

  /** A new person: create the account for the invited address inside the team. */
  protected register(): void {
    const invitation = this.invitation();
    if (!invitation || this.accepting()) return;
    this.failure.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const { displayName, password } = this.form.getRawValue();
    this.accepting.set(true);
    this.api.accept(this.token(), { displayName: displayName.trim(), password }).subscribe({
      // The answer carries a session already; signing in through AuthService
      // makes the whole app (guards included) know it.
      next: (accepted) =>
        this.auth.signIn(invitation.email, password).subscribe({
          next: () => this.enter(accepted.teamId, invitation.teamName),
          error: () => void this.router.navigate(['/sign-in']),
        }),
      error: (error: unknown) => {
        this.form.controls.password.reset();
        this.form.controls.confirm.reset();
        this.refused(error);
      },
    });
  }

  /** Signed in as someone else: sign out, then the page offers the invited address's way in. */
  protected signOut(): void {
    this.auth.signOut().subscribe(() => this.access.clear());
  }

  private enter(teamId: string, teamName: string): void {
    this.access.clear();
    this.auth.switchTeam(teamId);
    void this.notifier.info(`Welcome to ${teamName}.`);
    void this.router.navigate(['/teams', teamId]);
  }

  private refused(error: unknown): void {
    this.accepting.set(false);
    const problem = apiProblem(error);
    // The link itself went bad meanwhile (expired, or accepted elsewhere): show that instead.
    if (problem.code in LINK_TITLES) {
      this.loaded.set({ status: 'error', code: problem.code, message: problem.message });
      return;
    }
    this.failure.set(problem.message);
  }
}
