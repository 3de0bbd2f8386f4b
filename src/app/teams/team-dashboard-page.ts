import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { RouterLink } from '@angular/router';
import { ROLE_DESCRIPTIONS, VehicleSummary } from '../core/api-types';
import { loadState } from '../core/http/load-state';
import { confirmAction } from '../core/layout/confirm-dialog';
import { TeamAccess } from '../core/teams/team-access';
import { VehicleNameDialog, VehicleNameDialogData } from './vehicle-name-dialog';
import { VehicleTable } from './vehicle-table';
import { VehiclesApi } from './vehicles-api';
import { Notifier } from '../core/layout/notifier';

/** `/teams/:teamId`: the team's vehicles, with the commands the caller's roles allow. */
@Component({
  selector: 'rw-team-dashboard-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    FormsModule,
    MatButtonModule,
    MatIconModule,
    MatProgressSpinnerModule,
    MatSlideToggleModule,
    RouterLink,
    VehicleTable,
  ],
  templateUrl: './team-dashboard-page.html',
  styleUrl: './team-dashboard-page.scss',
})
export class TeamDashboardPage {
  /** Bound from the route parameter. */
  readonly teamId = input.required<string>();

  protected readonly access = inject(TeamAccess);
  private readonly api = inject(VehiclesApi);
  private readonly dialog = inject(MatDialog);
  private readonly notifier = inject(Notifier);

  protected readonly canManage = this.access.permission('vehicle:manage');
  protected readonly showArchived = signal(false);
  private readonly vehicles = rxResource({
    params: () => ({ teamId: this.teamId(), archived: this.showArchived() }),
    stream: ({ params: p }) => this.api.list(p.teamId, p.archived),
  });
  protected readonly state = loadState(this.vehicles);
  protected readonly roleWords = computed(() =>
    (this.access.team()?.roles ?? []).map((role) => ({ role, description: ROLE_DESCRIPTIONS[role] })),
  );

  protected reload(): void {
    this.vehicles.reload();
  }

  protected createVehicle(): void {
    this.askName({ title: 'New vehicle', confirmLabel: 'Create vehicle', name: '' }, (name) =>
      this.api.create(this.teamId(), name).subscribe({
        next: (vehicle) => {
          void this.notifier.info(`Vehicle "${vehicle.name}" created.`);
          this.reload();
        },
      }),
    );
  }

  protected renameVehicle(vehicle: VehicleSummary): void {
    this.askName({ title: 'Rename vehicle', confirmLabel: 'Rename', name: vehicle.name }, (name) => {
      if (name === vehicle.name) return;
      this.api.update(this.teamId(), vehicle, { name }).subscribe({
        next: () => this.reload(),
        error: () => this.reload(), // e.g. stale revision: show what is stored now
      });
    });
  }

  protected archiveVehicle(vehicle: VehicleSummary): void {
    confirmAction(this.dialog, {
      title: 'Archive vehicle?',
      message: `"${vehicle.name}" will be hidden from the vehicle list. Its data and axle designs are kept, and it can be restored at any time.`,
      confirmLabel: 'Archive',
    }).subscribe((confirmed) => {
      if (!confirmed) return;
      this.api.update(this.teamId(), vehicle, { archived: true }).subscribe({
        next: () => {
          void this.notifier.info(`"${vehicle.name}" archived.`);
          this.reload();
        },
        error: () => this.reload(),
      });
    });
  }

  protected restoreVehicle(vehicle: VehicleSummary): void {
    this.api.update(this.teamId(), vehicle, { archived: false }).subscribe({
      next: () => {
        void this.notifier.info(`"${vehicle.name}" restored.`);
        this.reload();
      },
      error: () => this.reload(),
    });
  }

  private askName(data: VehicleNameDialogData, then: (name: string) => void): void {
    this.dialog
      .open<VehicleNameDialog, VehicleNameDialogData, string>(VehicleNameDialog, { data })
      .afterClosed()
      .subscribe((name) => {
        if (name) then(name);
      });
  }
}
