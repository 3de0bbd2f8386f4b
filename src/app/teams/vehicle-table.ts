import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatTableModule } from '@angular/material/table';
import { MatTooltipModule } from '@angular/material/tooltip';
import { RouterLink } from '@angular/router';
import { VehicleSummary } from '../core/api-types';
import { LocalTimePipe } from '../core/time/local-time';

/**
 * The team's vehicles. Row names link to the vehicle screen; the rename and
 * archive controls exist only when `canManage` (vehicle:manage) is true.
 */
@Component({
  selector: 'rw-vehicle-table',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatTableModule, MatButtonModule, MatIconModule, MatTooltipModule, RouterLink, LocalTimePipe],
  templateUrl: './vehicle-table.html',
  styleUrl: './vehicle-table.scss',
})
export class VehicleTable {
  readonly teamId = input.required<string>();
  readonly vehicles = input.required<readonly VehicleSummary[]>();
  readonly canManage = input(false);

  readonly rename = output<VehicleSummary>();
  readonly archive = output<VehicleSummary>();
  readonly restore = output<VehicleSummary>();

  protected readonly columns = computed(() =>
    this.canManage()
      ? ['name', 'revision', 'updated', 'actions']
      : ['name', 'revision', 'updated'],
  );
}
