import { ChangeDetectionStrategy, Component, computed, effect, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDividerModule } from '@angular/material/divider';
import { MatIconModule } from '@angular/material/icon';
import { MatMenuModule } from '@angular/material/menu';
import { MatToolbarModule } from '@angular/material/toolbar';
import { Router, RouterLink, RouterLinkActive } from '@angular/router';
import { DevMailApi } from '../../dev-mail/dev-mail-api';
import { AuthService } from '../auth/auth-service';
import { TeamAccess } from '../teams/team-access';
import { Notifier } from './notifier';

/** Product name, team switcher, the team's sections and the user menu. */
@Component({
  selector: 'rw-top-bar',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    MatToolbarModule,
    MatButtonModule,
    MatIconModule,
    MatMenuModule,
    MatDividerModule,
    RouterLink,
    RouterLinkActive,
  ],
  templateUrl: './top-bar.html',
  styleUrl: './top-bar.scss',
})
export class TopBar {
  protected readonly auth = inject(AuthService);
  protected readonly access = inject(TeamAccess);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);

  protected readonly team = this.auth.currentTeam;
  protected readonly canManageMembers = computed(
    () => this.access.team()?.id === this.team()?.teamId && this.access.can('members:manage'),
  );
  private readonly devMail = inject(DevMailApi);
  /** Anyone signed in, on a development server: their own captured mail. */
  protected readonly showDevMail = computed(
    () => this.auth.user() !== null && this.devMail.available() === true,
  );

  constructor() {
    effect(() => {
      if (this.auth.user()) this.devMail.probe();
    });
  }

  protected switchTo(teamId: string): void {
    this.auth.switchTeam(teamId);
    void this.router.navigate(['/teams', teamId]);
  }

  protected signOut(): void {
    this.auth.signOut().subscribe(() => {
      this.access.clear();
      void this.router.navigate(['/sign-in']);
      void this.notifier.info('You are signed out.');
    });
  }
}
