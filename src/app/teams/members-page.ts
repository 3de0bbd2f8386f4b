import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import {
  AbstractControl,
  NonNullableFormBuilder,
  ReactiveFormsModule,
  ValidationErrors,
  Validators,
} from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatChipListboxChange, MatChipsModule } from '@angular/material/chips';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';
import { MatTableModule } from '@angular/material/table';
import { Router } from '@angular/router';
import { Role, ROLE_DESCRIPTIONS, ROLES, TeamInvitation, TeamMember } from '../core/api-types';
import { AuthService } from '../core/auth/auth-service';
import { apiProblem } from '../core/http/api-error';
import { loadState } from '../core/http/load-state';
import { confirmAction } from '../core/layout/confirm-dialog';
import { TeamAccess } from '../core/teams/team-access';
import { TeamsApi } from '../core/teams/teams-api';
import { Notifier } from '../core/layout/notifier';
import { LocalTimePipe } from '../core/time/local-time';

function atLeastOneRole(control: AbstractControl): ValidationErrors | null {
  const roles = control.value as readonly Role[] | null;
  return roles && roles.length > 0 ? null : { noRole: true };
}

/**
 * `/teams/:teamId/members` (owners): invite people by e-mail (they join when
 * they accept), see open invitations, change members' roles, remove them.
 */
@Component({
  selector: 'rw-members-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    LocalTimePipe,
    ReactiveFormsModule,
    MatButtonModule,
    MatChipsModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressSpinnerModule,
    MatTableModule,
  ],
  templateUrl: './members-page.html',
  styleUrl: './members-page.scss',
})
export class MembersPage {
  /** Bound from the route parameter. */
  readonly teamId = input.required<string>();

  protected readonly access = inject(TeamAccess);
  private readonly auth = inject(AuthService);
  private readonly api = inject(TeamsApi);
  private readonly dialog = inject(MatDialog);
  private readonly notifier = inject(Notifier);
  private readonly router = inject(Router);

  protected readonly roles = ROLES;
  protected readonly roleDescriptions = ROLE_DESCRIPTIONS;
  protected readonly columns = ['member', 'roles', 'actions'];
  private readonly members = rxResource({
    params: () => this.teamId(),
    stream: ({ params: teamId }) => this.api.members(teamId),
  });
  protected readonly state = loadState(this.members);
  protected readonly myUserId = computed(() => this.auth.user()?.id ?? null);

  protected readonly addForm = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email]],
    roles: [['viewer'] as Role[], [atLeastOneRole]],
  });
  protected readonly adding = signal(false);
  protected readonly addFailure = signal<string | null>(null);
  /** Invitations not accepted yet (expired ones included, marked). */
  private readonly invitationList = rxResource({
    params: () => this.teamId(),
    stream: ({ params: teamId }) => this.api.invitations(teamId),
  });
  protected readonly invitations = loadState(this.invitationList);
  protected readonly openInvitations = computed(() => {
    const state = this.invitations();
    return state.status === 'ready' ? state.value.filter((i) => i.acceptedAt === null) : [];
  });
  protected readonly now = signal(Date.now());

  protected expired(invitation: TeamInvitation): boolean {
    return new Date(invitation.expiresAt).getTime() <= this.now();
  }

  protected reload(): void {
    this.now.set(Date.now());
    this.members.reload();
    this.invitationList.reload();
  }

  protected invite(): void {
    this.addFailure.set(null);
    if (this.addForm.invalid) {
      this.addForm.markAllAsTouched();
      return;
    }
    const { email, roles } = this.addForm.getRawValue();
    this.adding.set(true);
    this.api.invite(this.teamId(), email.trim(), roles).subscribe({
      next: () => {
        this.adding.set(false);
        this.addForm.reset({ email: '', roles: ['viewer'] });
        void this.notifier.info(`Invitation sent to ${email.trim()}. They join the team when they accept it.`);
        this.reload();
      },
      error: (error: unknown) => {
        this.adding.set(false);
        this.addFailure.set(apiProblem(error).message);
      },
    });
  }

  protected changeRoles(member: TeamMember, event: MatChipListboxChange): void {
    const roles = ROLES.filter((role) => (event.value as Role[]).includes(role));
    if (roles.length === 0) {
      void this.notifier.error(
        `${member.displayName} needs at least one role. To take them off the team, use Remove.`,
      );
      event.source.value = [...member.roles]; // the stored roles again, without asking the server
      return;
    }
    this.api.setRoles(this.teamId(), member.userId, roles).subscribe({
      next: () => {
        void this.notifier.info(`Roles of ${member.displayName} saved.`);
        if (member.userId === this.myUserId()) this.afterOwnChange();
        else this.reload();
      },
      error: () => {
        event.source.value = [...member.roles]; // e.g. last_owner: show the roles that are stored…
        this.reload(); // …and whatever else changed meanwhile
      },
    });
  }

  protected removeMember(member: TeamMember): void {
    const self = member.userId === this.myUserId();
    confirmAction(this.dialog, {
      title: self ? 'Leave this team?' : 'Remove member?',
      message: self
        ? 'You will lose access to this team and its vehicles.'
        : `${member.displayName} (${member.email}) will lose access to this team. Their revisions and reviews stay in the history.`,
      confirmLabel: self ? 'Leave team' : 'Remove member',
    }).subscribe((confirmed) => {
      if (!confirmed) return;
      this.api.removeMember(this.teamId(), member.userId).subscribe({
        next: () => {
          void this.notifier.info(`${member.displayName} removed from the team.`);
          if (self) this.afterOwnChange();
          else this.reload();
        },
      });
    });
  }

  /** One's own roles changed: refresh who may do what, and leave if no longer allowed here. */
  private afterOwnChange(): void {
    const teamId = this.teamId();
    this.auth.refresh().subscribe(() => {
      if (!this.auth.isMemberOf(teamId)) {
        this.access.clear();
        void this.router.navigate(['/teams']);
        return;
      }
      this.access.load(teamId, true).subscribe((team) => {
        if (team.permissions.includes('members:manage')) this.reload();
        else void this.router.navigate(['/teams', teamId]);
      });
    });
  }
}
