import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { AbstractControl, FormControl, FormGroup, ReactiveFormsModule, ValidationErrors } from '@angular/forms';
import { RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatCheckbox } from '@angular/material/checkbox';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { firstValueFrom, map, merge } from 'rxjs';
import { vehicleSchema } from '../../../../shared/schema/vehicle';
import { unusualValue, vehicleRangeFor } from '../../../../shared/schema/ranges';
import { AuthService } from '../../core/auth/auth-service';
import { apiProblem } from '../../core/http/api-error';
import { TeamAccess } from '../../core/teams/team-access';
import { AxleDesignSummary, FeaturesApi, RevisionRow, VehicleRecord } from '../features-api';
import { parseDecimal } from '../axle-design/hardpoint-io';
import { ALL_VEHICLE_FIELDS, readPath, VEHICLE_FIELD_GROUPS, VehicleField, writePath } from './vehicle-fields';
import { routeKey } from '../route-params';
import { toSignal } from '@angular/core/rxjs-interop';
import { LocalTimePipe } from '../../core/time/local-time';

type Units = 'si' | 'imperial';
type UnitsModule = typeof import('../../../../shared/schema/units');

function numberText(control: AbstractControl<string>): ValidationErrors | null {
  const text = (control.value ?? '').trim();
  if (text === '') return null;
  return parseDecimal(text) === null ? { number: true } : null;
}

function requiredText(control: AbstractControl<string>): ValidationErrors | null {
  return (control.value ?? '').trim() === '' ? { required: true } : null;
}

/**
 * Vehicle page: the balance model's vehicle data in grouped forms (units
 * shown, SI or inch/pound for display), its axle designs and its revision
 * history. Values are stored in SI; inch/pound entries are converted by the
 * shared unit table (mathjs, loaded only when inch/pound is chosen).
 */
@Component({
  selector: 'rw-vehicle-page',
  imports: [
    LocalTimePipe,
    RouterLink,
    ReactiveFormsModule,
    MatButton,
    MatFormFieldModule,
    MatInput,
    MatCheckbox,
    MatButtonToggleGroup,
    MatButtonToggle,
  ],
  templateUrl: './vehicle-page.html',
  styleUrl: './vehicle-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(window:beforeunload)': 'warnBeforeUnload($event)' },
})
export class VehiclePage {
  private readonly api = inject(FeaturesApi);
  private readonly access = inject(TeamAccess);
  private readonly auth = inject(AuthService);

  readonly teamId = input.required<string>();
  readonly vehicleId = input.required<string>();

  protected readonly groups = VEHICLE_FIELD_GROUPS;
  protected readonly loading = signal(true);
  protected readonly loadError = signal<string | null>(null);
  protected readonly vehicle = signal<VehicleRecord | null>(null);
  protected readonly designs = signal<readonly AxleDesignSummary[] | null>(null);
  protected readonly designsError = signal<string | null>(null);
  protected readonly revisions = signal<readonly RevisionRow[]>([]);
  protected readonly units = signal<Units>('si');
  private unitsModule: UnitsModule | null = null;

  protected readonly saving = signal(false);
  protected readonly saveError = signal<string | null>(null);
  protected readonly saveIssues = signal<readonly string[]>([]);
  protected readonly notice = signal<string | null>(null);
  protected readonly stale = signal<VehicleRecord | null>(null);

  protected readonly editable = computed(() => this.access.can('vehicle:edit'));

  protected readonly form = new FormGroup<Record<string, FormControl<string>>>({});
  protected readonly rollGravityTerm = new FormControl<boolean>(true, { nonNullable: true });
  protected readonly message = new FormControl<string>('', { nonNullable: true });

  protected readonly frontDesigns = computed(() => (this.designs() ?? []).filter((d) => d.axle === 'front'));
  protected readonly rearDesigns = computed(() => (this.designs() ?? []).filter((d) => d.axle === 'rear'));

  /**
   * The form's state as a signal, read again from the form on each of its
   * events (value, status, pristine, touched): what `dirty` and the unusual-value
   * notes are computed from. Programmatic fills and enables emit events too.
   */
  private readonly formState = toSignal(
    merge(this.form.events, this.rollGravityTerm.events).pipe(map(() => this.readFormState())),
    { initialValue: this.readFormState() },
  );

  /** True when the form differs from the stored revision. */
  readonly dirty = computed(() => this.formState().dirty);

  constructor() {
    // Loads on arrival and again when the router reuses this page for other route parameters.
    effect(() => {
      routeKey(this.teamId(), this.vehicleId());
      untracked(() => {
        void this.load();
      });
    });
    for (const field of ALL_VEHICLE_FIELDS) {
      this.form.addControl(
        field.path,
        new FormControl<string>('', { nonNullable: true, validators: field.required ? [requiredText, numberText] : [numberText] }),
      );
    }
  }

  private readFormState(): { dirty: boolean; values: Readonly<Record<string, string>>; invalid: ReadonlySet<string> } {
    const invalid = new Set(Object.entries(this.form.controls).flatMap(([path, c]) => (c.invalid ? [path] : [])));
    return { dirty: this.form.dirty || this.rollGravityTerm.dirty, values: this.form.getRawValue(), invalid };
  }

  /** Closing or reloading the tab with unsaved entries asks first. */
  protected warnBeforeUnload(event: BeforeUnloadEvent): void {
    if (this.dirty()) event.preventDefault();
  }

  private async load(): Promise<void> {
    this.loading.set(true);
    try {
      const [vehicle] = await Promise.all([
        firstValueFrom(this.api.vehicle(this.teamId(), this.vehicleId())),
        firstValueFrom(this.access.load(this.teamId())),
      ]);
      if (this.auth.displayUnits() === 'imperial') await this.useUnits('imperial', false);
      this.adopt(vehicle);
      this.loadError.set(null);
    } catch (error) {
      this.loadError.set(apiProblem(error).message);
    } finally {
      this.loading.set(false);
    }
    void this.loadDesigns();
    void this.loadRevisions();
  }

  private async loadDesigns(): Promise<void> {
    try {
      this.designs.set(await firstValueFrom(this.api.axleDesigns(this.teamId(), this.vehicleId())));
      this.designsError.set(null);
    } catch (error) {
      this.designsError.set(apiProblem(error).message);
    }
  }

  private async loadRevisions(): Promise<void> {
    try {
      this.revisions.set(await firstValueFrom(this.api.vehicleRevisions(this.teamId(), this.vehicleId())));
    } catch {
      this.revisions.set([]);
    }
  }

  private adopt(vehicle: VehicleRecord): void {
    this.vehicle.set(vehicle);
    this.fillForm(vehicle.data);
    if (!this.editable()) {
      this.form.disable();
      this.rollGravityTerm.disable();
    } else {
      for (const field of ALL_VEHICLE_FIELDS) {
        const control = this.form.controls[field.path]!;
        if (this.barByGeometry(field)) control.disable();
        else control.enable();
      }
    }
    this.form.markAsPristine();
    this.rollGravityTerm.markAsPristine();
  }

  private fillForm(data: unknown): void {
    for (const field of ALL_VEHICLE_FIELDS) {
      const stored = readPath(data, field.path);
      this.form.controls[field.path]!.setValue(typeof stored === 'number' ? this.formatForDisplay(field, stored) : '');
    }
    const gravity = readPath(data, 'options.rollGravityTerm');
    this.rollGravityTerm.setValue(gravity !== false);
  }

  /** The bar's roll rate field is not offered when the bar is given by its geometry (kept as entered). */
  protected barByGeometry(field: VehicleField): boolean {
    if (!field.path.endsWith('antiRollBar.rollRateNmPerDeg')) return false;
    const bar = readPath(this.vehicle()?.data, field.path.replace('.rollRateNmPerDeg', ''));
    return !!bar && typeof bar === 'object' && !('rollRateNmPerDeg' in bar);
  }

  protected unitLabel(field: VehicleField): string {
    if (this.units() === 'imperial' && field.storedUnit && this.unitsModule) {
      const target = this.unitsModule.IMPERIAL_UNITS[field.storedUnit];
      if (target) return target.replace(/ \/ /g, '/').replace(/\^2/g, '²').replace(/ /g, '·');
    }
    return field.plainUnit;
  }

  private displayUnit(field: VehicleField): string | null {
    if (this.units() !== 'imperial' || !field.storedUnit || !this.unitsModule) return null;
    return this.unitsModule.IMPERIAL_UNITS[field.storedUnit] ?? null;
  }

  private formatForDisplay(field: VehicleField, stored: number): string {
    const target = this.displayUnit(field);
    const v = target ? this.unitsModule!.convertValue(stored, field.storedUnit!, target) : stored;
    return String(Number(v.toPrecision(target ? 6 : 12)));
  }

  private toStored(field: VehicleField, shown: number): number {
    const target = this.displayUnit(field);
    return target ? this.unitsModule!.convertValue(shown, target, field.storedUnit!) : shown;
  }

  protected async chooseUnits(units: Units): Promise<void> {
    await this.useUnits(units, true);
  }

  /** Switches display units, converting what is in the form (entries are kept, not reset). */
  private async useUnits(units: Units, convertForm: boolean): Promise<void> {
    if (units === this.units()) return;
    if (units === 'imperial' && !this.unitsModule) this.unitsModule = await import('../../../../shared/schema/units');
    const stored = convertForm ? this.storedValues() : null;
    this.units.set(units);
    if (stored) {
      for (const field of ALL_VEHICLE_FIELDS) {
        const v = stored.get(field.path);
        const control = this.form.controls[field.path]!;
        if (v !== undefined) control.setValue(this.formatForDisplay(field, v));
      }
    }
  }

  /** Valid numbers in the form, in stored units. */
  private storedValues(): Map<string, number> {
    const out = new Map<string, number>();
    for (const field of ALL_VEHICLE_FIELDS) {
      const v = parseDecimal(this.form.controls[field.path]!.value ?? '');
      if (v !== null) out.set(field.path, this.toStored(field, v));
    }
    return out;
  }

  /**
   * A possible but unusual entry (shared/schema/ranges.ts), in the user's words, e.g. "5000 kg is unusual for a
   * vehicle mass (typical 150–3500 kg)": shown beside the field, never refused. The figures are in stored units.
   */
  protected unusualText(field: VehicleField): string | null {
    const state = this.formState();
    const range = vehicleRangeFor(field.path);
    const shown = parseDecimal(state.values[field.path] ?? '');
    if (!range || shown === null || state.invalid.has(field.path)) return null;
    return unusualValue(range, this.toStored(field, shown));
  }

  protected errorText(field: VehicleField): string {
    const errors = this.form.controls[field.path]!.errors ?? {};
    if (errors['required']) return `${field.label} is required.`;
    if (errors['number']) return `${field.label} must be a number (decimal point or comma).`;
    if (errors['schema']) return String(errors['schema']);
    return '';
  }

  protected async save(): Promise<void> {
    const vehicle = this.vehicle();
    if (!vehicle || this.saving()) return;
    this.form.markAllAsTouched();
    this.saveIssues.set([]);
    this.saveError.set(null);
    if (this.form.invalid) {
      this.saveError.set('Some entries need attention (marked below); nothing was saved.');
      return;
    }
    const data = structuredClone((vehicle.data ?? {}) as Record<string, unknown>);
    const stored = this.storedValues();
    for (const field of ALL_VEHICLE_FIELDS) {
      if (this.form.controls[field.path]!.disabled) continue;
      writePath(data, field.path, stored.get(field.path));
    }
    data['options'] = { ...((data['options'] as object | undefined) ?? {}), rollGravityTerm: this.rollGravityTerm.value };
    const check = vehicleSchema.safeParse(data);
    if (!check.success) {
      const general: string[] = [];
      for (const issue of check.error.issues) {
        const path = issue.path.join('.');
        const control = this.form.controls[path];
        if (control) {
          control.setErrors({ ...(control.errors ?? {}), schema: issue.message });
          control.markAsTouched();
        } else general.push(`${path || 'vehicle'}: ${issue.message}`);
      }
      this.saveIssues.set(general);
      this.saveError.set('The vehicle data does not pass its checks; nothing was saved.');
      return;
    }
    await this.put(data, vehicle.revision);
  }

  private async put(data: unknown, baseRevision: number): Promise<void> {
    this.saving.set(true);
    try {
      const saved = await firstValueFrom(
        this.api.saveVehicleData(this.teamId(), this.vehicleId(), data, baseRevision, this.message.value.trim() || undefined),
      );
      this.stale.set(null);
      this.message.setValue('');
      this.adopt(saved);
      this.notice.set(`Saved as revision ${saved.revision}.`);
      void this.loadRevisions();
    } catch (error) {
      const problem = apiProblem(error);
      if (problem.status === 409) {
        const current = (problem.details as { current?: VehicleRecord } | undefined)?.current;
        this.stale.set(current && 'revision' in current ? current : await firstValueFrom(this.api.vehicle(this.teamId(), this.vehicleId())));
      } else if (problem.status === 400) {
        const fields = (problem.details as { fields?: { path: string; message: string }[] } | undefined)?.fields ?? [];
        this.saveIssues.set(fields.map((f) => `${f.path}: ${f.message}`));
        this.saveError.set(problem.message);
      } else this.saveError.set(problem.message);
    } finally {
      this.saving.set(false);
    }
  }

  /** After a stale save: keep the entries and save them over the newer revision. */
  protected async saveMineOverTheirs(): Promise<void> {
    const theirs = this.stale();
    if (!theirs) return;
    this.vehicle.set({ ...this.vehicle()!, revision: theirs.revision, data: theirs.data });
    await this.save();
  }

  /** After a stale save: drop the entries and show the newer revision. */
  protected takeTheirs(): void {
    const theirs = this.stale();
    if (!theirs) return;
    this.stale.set(null);
    this.adopt(theirs);
    this.notice.set(`Showing revision ${theirs.revision}.`);
    void this.loadRevisions();
  }

  protected discard(): void {
    const v = this.vehicle();
    if (v) this.adopt(v);
    this.notice.set('Entries reset to the stored revision.');
  }
}
