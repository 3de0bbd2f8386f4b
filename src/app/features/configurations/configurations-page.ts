import { ChangeDetectionStrategy, Component, computed, effect, inject, input, linkedSignal, signal, untracked } from '@angular/core';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { firstValueFrom } from 'rxjs';
import { trackProfiles, type TrackProfileId } from '../../../../shared/tracks/profiles';
import type { VehicleSummary } from '../../core/api-types';
import { apiProblem } from '../../core/http/api-error';
import { TeamAccess } from '../../core/teams/team-access';
import { VehiclesApi } from '../../teams/vehicles-api';
import { AxleDesignSummary, FeaturesApi, RevisionRow } from '../features-api';
import { Configuration, ConfigurationsApi, NewConfiguration } from './configurations-api';
import { problemText } from './review-words';
import { browserTimeZone, formatLocalTime } from '../../core/time/local-time';
import { StatusChip } from './status-chip';
import { optionValue } from '../../core/forms/dom-events';
import { routeKey } from '../route-params';
import type { AxleName } from '../../../../shared/schema/axle';

type ListState = { kind: 'loading' } | { kind: 'error'; message: string } | { kind: 'ready'; list: readonly Configuration[] };

/**
 * `/teams/:teamId/configurations[?vehicle=<id>]`: the team's configurations
 * (vehicle revision + front and rear axle design revisions + track profile)
 * with their review status, and "new configuration" for those who may make one.
 */
@Component({
  selector: 'rw-configurations-page',
  imports: [RouterLink, MatButton, MatIcon, MatProgressBar, StatusChip],
  templateUrl: './configurations-page.html',
  styleUrl: './configurations-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ConfigurationsPage {
  protected readonly optionValue = optionValue;
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
  protected readonly state = signal<ListState>({ kind: 'loading' });
  protected readonly vehicles = signal<readonly VehicleSummary[]>([]);
  protected readonly canCreate = this.access.permission('vehicle:manage');
  protected readonly timeZone = browserTimeZone();
  protected readonly profiles = Object.values(trackProfiles);
  constructor() {
    // Loads on arrival and again when the router reuses this page for other route parameters.
    effect(() => {
      routeKey(this.teamId());
      untracked(() => {
        void firstValueFrom(this.access.load(this.teamId())).catch(() => undefined);
        void this.load();
      });
    });
  }

  protected localTime(iso: string): string {
    return formatLocalTime(iso, this.timeZone);
  }

  protected readonly shown = computed(() => {
    const s = this.state();
    if (s.kind !== 'ready') return [];
    const v = this.vehicleFilter();
    return v ? s.list.filter((c) => c.vehicle.id === v) : s.list;
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

  protected async load(): Promise<void> {
    this.state.set({ kind: 'loading' });
    try {
      const [list, vehicles] = await Promise.all([
        firstValueFrom(this.api.list(this.teamId(), this.showArchived())),
        firstValueFrom(this.vehiclesApi.list(this.teamId(), false)).catch(() => [] as VehicleSummary[]),
      ]);
      this.vehicles.set(vehicles);
      this.state.set({ kind: 'ready', list });
    } catch (error) {
      this.state.set({ kind: 'error', message: apiProblem(error).message });
    }
  }

  protected toggleArchived(event: Event): void {
    this.showArchived.set((event.target as HTMLInputElement).checked);
    void this.load();
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

  protected value(event: Event): string {
    return (event.target as HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement).value;
  }

  protected profileLabel(id: string): string {
    return trackProfiles[id as TrackProfileId]?.label ?? id;
  }
}
