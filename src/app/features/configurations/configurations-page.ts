import { ChangeDetectionStrategy, Component, computed, effect, inject, input, linkedSignal, signal, untracked } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatCheckbox } from '@angular/material/checkbox';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';
import { catchError, firstValueFrom, of } from 'rxjs';
import { trackProfiles, type TrackProfileId } from '../../../../shared/tracks/profiles';
import type { VehicleSummary } from '../../core/api-types';
import { apiProblem } from '../../core/http/api-error';
import { TeamAccess } from '../../core/teams/team-access';
import { VehiclesApi } from '../../teams/vehicles-api';
import { AxleDesignSummary, FeaturesApi, RevisionRow } from '../features-api';
import { ConfigurationsApi, NewConfiguration } from './configurations-api';
import { problemText } from './review-words';
import { browserTimeZone, formatLocalTime } from '../../core/time/local-time';
import { StatusChip } from './status-chip';
import { inputValue } from '../../core/forms/dom-events';
import { loadState } from '../../core/http/load-state';
import { DISPLAY_UNITS, NumPipe } from '../../core/format/num-pipe';
import { unitLabel } from '../../core/format/quantities';
import type { AxleName } from '../../../../shared/schema/axle';

/**
 * `/teams/:teamId/configurations[?vehicle=<id>]`: the team's configurations
 * (vehicle revision + front and rear axle design revisions + track profile)
 * with their review status, and "new configuration" for those who may make one.
 */
@Component({
  selector: 'rw-configurations-page',
  imports: [NumPipe, RouterLink, MatButton, MatIcon, MatProgressBar, MatFormField, MatLabel, MatInput, MatSelect, MatOption, MatCheckbox, StatusChip],
  templateUrl: './configurations-page.html',
  styleUrl: './configurations-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ConfigurationsPage {
  protected readonly value = inputValue;
  private readonly route = inject(ActivatedRoute);
  private readonly router = inject(Router);
  private readonly api = inject(ConfigurationsApi);
  private readonly features = inject(FeaturesApi);
  private readonly vehiclesApi = inject(VehiclesApi);
  protected readonly access = inject(TeamAccess);

  readonly teamId = input.required<string>();
  /** Only this vehicle's configurations (from the vehicle page), or all. */
  /** `?vehicle=`: the vehicle the list is filtered to. */
  readonly vehicle = input<string | undefined>(undefined);
  protected readonly vehicleFilter = linkedSignal(() => this.vehicle() ?? '');
  protected readonly showArchived = signal(false);
  /** The team's configurations (archived ones too when asked). */
  private readonly list = rxResource({
    params: () => ({ teamId: this.teamId(), archived: this.showArchived() }),
    stream: ({ params: p }) => this.api.list(p.teamId, p.archived),
  });
  protected readonly state = loadState(this.list);
  /** The team's vehicles (the filter and the new configuration's choice); none when they cannot be read. */
  private readonly vehicleList = rxResource({
    params: () => this.teamId(),
    stream: ({ params: teamId }) => this.vehiclesApi.list(teamId, false).pipe(catchError(() => of([] as VehicleSummary[]))),
  });
  protected readonly vehicles = computed<readonly VehicleSummary[]>(() => this.vehicleList.value() ?? []);
  private readonly units = inject(DISPLAY_UNITS);
  protected readonly lengthUnit = computed(() => unitLabel('length', this.units()));
  protected readonly canCreate = this.access.permission('vehicle:manage');
  protected readonly timeZone = browserTimeZone();
  protected readonly profiles = Object.values(trackProfiles);
  constructor() {
    // The caller's permissions in the team, again when the router reuses this page for another team.
    effect(() => {
      const teamId = this.teamId();
      untracked(() => void firstValueFrom(this.access.load(teamId)).catch(() => undefined));
    });
  }

  protected localTime(iso: string): string {
    return formatLocalTime(iso, this.timeZone);
  }

  protected readonly shown = computed(() => {
    const s = this.state();
    if (s.status !== 'ready') return [];
    const v = this.vehicleFilter();
    return v ? s.value.filter((c) => c.vehicle.id === v) : s.value;
  });
  protected readonly filterName = computed(() => this.vehicles().find((v) => v.id === this.vehicleFilter())?.name ?? null);

  // ---- new configuration ----
  protected readonly creating = signal(false);
  protected readonly formName = signal('');
  protected readonly formVehicle = signal('');
  protected readonly formVehicleRevision = signal('');
  protected readonly formFront = signal('');
  protected readonly formFrontRevision = signal('');
  protected readonly formRear = signal('');
  protected readonly formRearRevision = signal('');
  protected readonly formProfile = signal<TrackProfileId>('smooth-circuit');
  protected readonly formMessage = signal('');
  protected readonly formDesigns = signal<readonly AxleDesignSummary[]>([]);
  protected readonly formVehicleRevisions = signal<readonly RevisionRow[]>([]);
  protected readonly frontRevisions = signal<readonly RevisionRow[]>([]);
  protected readonly rearRevisions = signal<readonly RevisionRow[]>([]);
  protected readonly formError = signal<string | null>(null);
  protected readonly saving = signal(false);
  protected readonly fronts = computed(() => this.formDesigns().filter((d) => d.axle === 'front'));
  protected readonly rears = computed(() => this.formDesigns().filter((d) => d.axle === 'rear'));
  /** The two axles' design and revision choices, drawn by one template row. */
  protected readonly axleChoices = [
    { axle: 'front', title: 'Front', design: this.formFront, revision: this.formFrontRevision, designs: this.fronts, revisions: this.frontRevisions },
    { axle: 'rear', title: 'Rear', design: this.formRear, revision: this.formRearRevision, designs: this.rears, revisions: this.rearRevisions },
  ] as const;

  protected load(): void {
    this.list.reload();
  }

  protected toggleArchived(checked: boolean): void {
    this.showArchived.set(checked);
  }

  protected chooseFilter(id: string): void {
    this.vehicleFilter.set(id);
    void this.router.navigate([], { relativeTo: this.route, queryParams: { vehicle: id || null }, replaceUrl: true });
  }

  protected openForm(): void {
    this.creating.set(true);
    this.formError.set(null);
    const v = this.vehicleFilter() || this.vehicles()[0]?.id || '';
    void this.chooseVehicle(v);
  }

  protected async chooseVehicle(id: string): Promise<void> {
    this.formVehicle.set(id);
    this.formVehicleRevision.set('');
    this.formFront.set('');
    this.formRear.set('');
    this.formDesigns.set([]);
    this.formVehicleRevisions.set([]);
    if (!id) return;
    try {
      const [designs, revisions] = await Promise.all([
        firstValueFrom(this.features.axleDesigns(this.teamId(), id)),
        firstValueFrom(this.features.vehicleRevisions(this.teamId(), id)),
      ]);
      this.formDesigns.set(designs);
      this.formVehicleRevisions.set(revisions);
      await this.chooseDesign('front', designs.find((d) => d.axle === 'front')?.id ?? '');
      await this.chooseDesign('rear', designs.find((d) => d.axle === 'rear')?.id ?? '');
    } catch (error) {
      this.formError.set(`The vehicle's axle designs could not be loaded: ${apiProblem(error).message}`);
    }
  }

  protected async chooseDesign(axle: AxleName, id: string): Promise<void> {
    (axle === 'front' ? this.formFront : this.formRear).set(id);
    (axle === 'front' ? this.formFrontRevision : this.formRearRevision).set('');
    const revisions = axle === 'front' ? this.frontRevisions : this.rearRevisions;
    revisions.set([]);
    if (!id) return;
    try {
      revisions.set(await firstValueFrom(this.features.axleDesignRevisions(this.teamId(), id)));
    } catch {
      revisions.set([]);
    }
  }

  protected async create(): Promise<void> {
    if (this.saving()) return;
    const name = this.formName().trim();
    const missing = [
      !name && 'a name',
      !this.formVehicle() && 'a vehicle',
      !this.formFront() && 'a front axle design',
      !this.formRear() && 'a rear axle design',
    ].filter(Boolean);
    if (missing.length) {
      this.formError.set(`Choose ${missing.join(', ')}.`);
      return;
    }
    const body: NewConfiguration = {
      name,
      vehicleId: this.formVehicle(),
      ...(this.formVehicleRevision() ? { vehicleRevision: Number(this.formVehicleRevision()) } : {}),
      frontDesignId: this.formFront(),
      ...(this.formFrontRevision() ? { frontDesignRevision: Number(this.formFrontRevision()) } : {}),
      rearDesignId: this.formRear(),
      ...(this.formRearRevision() ? { rearDesignRevision: Number(this.formRearRevision()) } : {}),
      trackProfile: this.formProfile(),
      ...(this.formMessage().trim() ? { message: this.formMessage().trim() } : {}),
    };
    this.saving.set(true);
    this.formError.set(null);
    try {
      const c = await firstValueFrom(this.api.create(this.teamId(), body));
      await this.router.navigate(['/teams', this.teamId(), 'configurations', c.id]);
    } catch (error) {
      this.formError.set(problemText(error));
    } finally {
      this.saving.set(false);
    }
  }

  protected profileLabel(id: string): string {
    return trackProfiles[id as TrackProfileId]?.label ?? id;
  }
}
