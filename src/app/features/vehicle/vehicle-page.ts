import { ChangeDetectionStrategy, Component, computed, effect, inject, input, linkedSignal, signal, untracked } from '@angular/core';
import { AbstractControl, FormControl, FormGroup, ReactiveFormsModule, ValidationErrors } from '@angular/forms';
import { RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatCheckbox } from '@angular/material/checkbox';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { catchError, firstValueFrom, forkJoin, map, merge, of, switchMap } from 'rxjs';
import { antiRollBarSchema, vehicleSchema } from '../../../../shared/schema/vehicle';
import { unusualValue, vehicleRangeFor } from '../../../../shared/schema/ranges';
import { wordNumber } from '../../../../shared/schema/issue-words';
import { AuthService } from '../../core/auth/auth-service';
import { apiProblem } from '../../core/http/api-error';
import { loadState } from '../../core/http/load-state';
import { TeamAccess } from '../../core/teams/team-access';
import { FeaturesApi, revisionAuthor, RevisionRow, VehicleRecord } from '../features-api';
import { parseDecimal } from '../axle-design/hardpoint-io';
import { ALL_VEHICLE_FIELDS, BarMode, barModeOf, readPath, VEHICLE_FIELD_GROUPS, VehicleField, vehicleIssuePlace, vehicleIssueText, writePath } from './vehicle-fields';
import type { AxleName } from '../../../../shared/schema/axle';
import { rxResource, toSignal } from '@angular/core/rxjs-interop';
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
  protected readonly units = signal<Units>('si');
  private unitsModule: UnitsModule | null = null;

  /** The vehicle as stored, with the team's permissions (and the unit table when the user reads inch/pound). */
  private readonly loaded = rxResource({
    params: () => ({ teamId: this.teamId(), vehicleId: this.vehicleId() }),
    stream: ({ params: p }) =>
      forkJoin([this.api.vehicle(p.teamId, p.vehicleId), this.access.load(p.teamId)]).pipe(
        switchMap(async ([vehicle]) => {
          if (this.auth.displayUnits() === 'imperial') await this.useUnits('imperial', false);
          return vehicle;
        }),
      ),
  });
  protected readonly state = loadState(this.loaded);
  /** The revision the form was filled from: the one loaded, then the one saved or taken over. */
  protected readonly vehicle = linkedSignal<VehicleRecord | null>(() => (this.loaded.hasValue() ? this.loaded.value() : null));

  private readonly designList = rxResource({
    params: () => ({ teamId: this.teamId(), vehicleId: this.vehicleId() }),
    stream: ({ params: p }) => this.api.axleDesigns(p.teamId, p.vehicleId),
  });
  protected readonly designs = loadState(this.designList);

  private readonly revisionList = rxResource({
    params: () => ({ teamId: this.teamId(), vehicleId: this.vehicleId() }),
    stream: ({ params: p }) => this.api.vehicleRevisions(p.teamId, p.vehicleId).pipe(catchError(() => of([] as RevisionRow[]))),
  });
  protected readonly revisions = computed<readonly RevisionRow[]>(() => (this.revisionList.hasValue() ? this.revisionList.value() : []));

  /** The author of the revision shown, as the revision list names it (the record's last writer until the list is there). */
  protected readonly revisionAuthor = computed(() => revisionAuthor(this.vehicle(), this.revisions()));

  protected readonly saving = signal(false);
  protected readonly saveError = signal<string | null>(null);
  protected readonly saveIssues = signal<readonly string[]>([]);
  protected readonly notice = signal<string | null>(null);
  protected readonly stale = signal<VehicleRecord | null>(null);

  protected readonly editable = computed(() => this.access.can('vehicle:edit'));

  protected readonly form = new FormGroup<Record<string, FormControl<string>>>({});
  protected readonly rollGravityTerm = new FormControl<boolean>(true, { nonNullable: true });
  /** How each axle's anti-roll bar is given: only that kind's fields are shown, validated and saved. */
  protected readonly barMode: Readonly<Record<AxleName, FormControl<BarMode>>> = {
    front: new FormControl<BarMode>('none', { nonNullable: true }),
    rear: new FormControl<BarMode>('none', { nonNullable: true }),
  };
  protected readonly message = new FormControl<string>('', { nonNullable: true });

  private readonly designsShown = computed(() => {
    const d = this.designs();
    return d.status === 'ready' ? d.value : [];
  });
  protected readonly frontDesigns = computed(() => this.designsShown().filter((d) => d.axle === 'front'));
  protected readonly rearDesigns = computed(() => this.designsShown().filter((d) => d.axle === 'rear'));

  /**
   * The form's state as a signal, read again from the form on each of its
   * events (value, status, pristine, touched): what `dirty` and the unusual-value
   * notes are computed from. Programmatic fills and enables emit events too.
   */
  private readonly formState = toSignal(
    merge(this.form.events, this.rollGravityTerm.events, this.barMode.front.events, this.barMode.rear.events).pipe(map(() => this.readFormState())),
    { initialValue: this.readFormState() },
  );

  /** True when the form differs from the stored revision. */
  readonly dirty = computed(() => this.formState().dirty);

  constructor() {
    // Each loaded vehicle (on arrival, and when the router reuses this page for another vehicle) fills the form.
    effect(() => {
      if (!this.loaded.hasValue()) return;
      const vehicle = this.loaded.value();
      untracked(() => this.adopt(vehicle));
    });
    for (const axle of ['front', 'rear'] as const) {
      this.barMode[axle].valueChanges.subscribe(() => this.applyBarMode());
    }
    for (const field of ALL_VEHICLE_FIELDS) {
      this.form.addControl(
        field.path,
        new FormControl<string>('', {
          nonNullable: true,
          validators: [...(field.required ? [requiredText] : []), numberText, (c: AbstractControl<string>) => this.rangeCheck(field, c)],
        }),
      );
    }
  }

  private readFormState(): {
    dirty: boolean;
    values: Readonly<Record<string, string>>;
    invalid: ReadonlySet<string>;
    barMode: Readonly<Record<AxleName, BarMode>>;
  } {
    const invalid = new Set(Object.entries(this.form.controls).flatMap(([path, c]) => (c.invalid ? [path] : [])));
    const dirty = this.form.dirty || this.rollGravityTerm.dirty || this.barMode.front.dirty || this.barMode.rear.dirty;
    return { dirty, values: this.form.getRawValue(), invalid, barMode: { front: this.barMode.front.value, rear: this.barMode.rear.value } };
  }

  /** Closing or reloading the tab with unsaved entries asks first. */
  protected warnBeforeUnload(event: BeforeUnloadEvent): void {
    if (this.dirty()) event.preventDefault();
  }

  private adopt(vehicle: VehicleRecord): void {
    this.vehicle.set(vehicle);
    this.fillForm(vehicle.data);
    for (const axle of ['front', 'rear'] as const) this.barMode[axle].setValue(barModeOf(vehicle.data, axle), { emitEvent: false });
    if (!this.editable()) {
      this.form.disable();
      this.rollGravityTerm.disable();
      this.barMode.front.disable();
      this.barMode.rear.disable();
    } else {
      this.barMode.front.enable();
      this.barMode.rear.enable();
      this.applyBarMode();
    }
    this.form.markAsPristine();
    this.rollGravityTerm.markAsPristine();
    this.barMode.front.markAsPristine();
    this.barMode.rear.markAsPristine();
  }

  private fillForm(data: unknown): void {
    for (const field of ALL_VEHICLE_FIELDS) {
      const stored = readPath(data, field.path);
      this.form.controls[field.path]!.setValue(typeof stored === 'number' ? this.formatForDisplay(field, stored) : '');
    }
    const gravity = readPath(data, 'options.rollGravityTerm');
    this.rollGravityTerm.setValue(gravity !== false);
  }

  protected barControl(groupId: string): FormControl<BarMode> {
    return this.barMode[groupId === 'rear' ? 'rear' : 'front'];
  }

  /** Whether a field is offered: a bar field only for the way its axle's bar is given. */
  protected shown(field: VehicleField): boolean {
    if (!field.bar) return true;
    const axle = field.path.startsWith('rear.') ? 'rear' : 'front';
    return this.formState().barMode[axle] === field.bar;
  }

  /** Enables the bar fields of each axle's chosen kind and disables the others (which are neither checked nor saved). */
  private applyBarMode(): void {
    if (!this.editable()) return;
    for (const field of ALL_VEHICLE_FIELDS) {
      const control = this.form.controls[field.path]!;
      const axle = field.path.startsWith('rear.') ? 'rear' : 'front';
      const on = !field.bar || this.barMode[axle].value === field.bar;
      if (on && control.disabled) control.enable({ emitEvent: false });
      if (!on && control.enabled) control.disable({ emitEvent: false });
    }
    this.form.updateValueAndValidity();
  }

  protected unitLabel(field: VehicleField): string {
    if (this.units() === 'imperial' && field.storedUnit && this.unitsModule) {
      const target = this.unitsModule.IMPERIAL_UNITS[field.storedUnit];
      // mathjs text as the screen writes it: 'lbf ft / deg' → 'lbf·ft/deg', 'deg^-1 lbf^-1' → '1/(deg·lbf)'.
      if (target) return target.replace(/^(\w+)\^-1 (\w+)\^-1$/, '1/($1 $2)').replace(/ \/ /g, '/').replace(/\^2/g, '²').replace(/ /g, '·');
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
   * vehicle mass (typical 150 to 3500 kg)": shown beside the field, never refused, its figures in the units the form shows.
   */
  protected unusualText(field: VehicleField): string | null {
    const state = this.formState();
    const range = vehicleRangeFor(field.path);
    const shown = parseDecimal(state.values[field.path] ?? '');
    if (!range || shown === null || state.invalid.has(field.path)) return null;
    const unit = this.unitLabel(field);
    return unusualValue(range, this.toStored(field, shown), (v) => ({ value: wordNumber(this.displayValue(field, v)), unit: unit === 'ratio' ? '' : unit }));
  }

  /**
   * A number outside what is possible for the field (shared/schema/ranges.ts), in the user's words and
   * units: "5 is outside −1 to 1 deg/deg".
   */
  private rangeCheck(field: VehicleField, control: AbstractControl<string>): ValidationErrors | null {
    const range = vehicleRangeFor(field.path);
    const shown = parseDecimal(control.value ?? '');
    if (!range || shown === null) return null;
    const stored = this.toStored(field, shown);
    const below = range.minExclusive ? stored <= range.min : stored < range.min;
    if (!below && stored <= range.max) return null;
    const [lo, hi] = [range.min, range.max].map((v) => wordNumber(this.displayValue(field, v)));
    const unit = this.unitLabel(field);
    const unitText = unit === 'ratio' ? '' : ` ${unit}`;
    const text = control.value.trim();
    return {
      range: range.minExclusive ? `${text} is outside the possible range: more than ${lo} and at most ${hi}${unitText}` : `${text} is outside ${lo} to ${hi}${unitText}`,
    };
  }

  private displayValue(field: VehicleField, stored: number): number {
    const target = this.displayUnit(field);
    return target ? this.unitsModule!.convertValue(stored, field.storedUnit!, target) : stored;
  }

  /** What is wrong with a field, in the user's words (shown beside it; every field at once). */
  protected errorText(field: VehicleField): string {
    const control = this.form.controls[field.path]!;
    const errors = control.errors ?? {};
    if (errors['required']) return `${field.label} is required.`;
    if (errors['number']) return `"${control.value.trim()}" is not a number (use a decimal point or comma).`;
    if (errors['range']) return `${String(errors['range'])}.`;
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
    // The bar is kept only in the kind chosen: the other kind's values are dropped.
    for (const axle of ['front', 'rear'] as const) {
      const mode = this.barMode[axle].value;
      for (const field of ALL_VEHICLE_FIELDS) {
        if (field.bar && field.path.startsWith(`${axle}.`) && field.bar !== mode) writePath(data, field.path, undefined);
      }
    }
    data['options'] = { ...((data['options']) ?? {}), rollGravityTerm: this.rollGravityTerm.value };
    const check = vehicleSchema.safeParse(data);
    if (!check.success) {
      const general: string[] = [];
      for (const issue of this.issuesOf(check.error.issues, data)) {
        const path = issue.path.map(String).join('.');
        const control = this.form.controls[path];
        if (control?.enabled) {
          const words = control.value.trim() === '' ? 'Needed here: it goes with the other entries of this group.' : `${vehicleIssueText(issue.message)}.`;
          control.setErrors({ ...(control.errors ?? {}), schema: words.charAt(0).toUpperCase() + words.slice(1) });
          control.markAsTouched();
        } else general.push(`${vehicleIssuePlace(issue.path)}: ${vehicleIssueText(issue.message)}.`);
      }
      this.saveIssues.set(general);
      this.saveError.set('The vehicle data does not pass its checks; nothing was saved.');
      return;
    }
    await this.put(data, vehicle.revision);
  }

  /**
   * The schema's issues, with an anti-roll bar that fits neither kind (one issue for the whole bar) replaced by
   * the issues of the kind chosen, each on its own field.
   */
  private issuesOf(
    issues: readonly { path: readonly PropertyKey[]; message: string; code?: string }[],
    data: Record<string, unknown>,
  ): { path: readonly PropertyKey[]; message: string }[] {
    return issues.flatMap((issue) => {
      const [axle, key] = issue.path.map(String);
      if (key !== 'antiRollBar' || issue.path.length !== 2 || (axle !== 'front' && axle !== 'rear')) return [issue];
      const kind = antiRollBarSchema.options[this.barMode[axle].value === 'rate' ? 0 : 1];
      const own = kind.safeParse(readPath(data, `${axle}.antiRollBar`));
      return own.success ? [issue] : own.error.issues.map((i) => ({ path: [axle, 'antiRollBar', ...i.path], message: i.message }));
    });
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
      this.revisionList.reload();
    } catch (error) {
      const problem = apiProblem(error);
      if (problem.status === 409) {
        const current = (problem.details as { current?: VehicleRecord } | undefined)?.current;
        this.stale.set(current && 'revision' in current ? current : await firstValueFrom(this.api.vehicle(this.teamId(), this.vehicleId())));
      } else if (problem.status === 400) {
        const fields = (problem.details as { fields?: { path: string; message: string }[] } | undefined)?.fields ?? [];
        this.saveIssues.set(
          fields.map((f) => `${vehicleIssuePlace(f.path.replace(/^data\./, '').split('.'))}: ${vehicleIssueText(f.message.replace(/^[\w.]+: /, ''))}.`),
        );
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
    this.revisionList.reload();
  }

  protected discard(): void {
    const v = this.vehicle();
    if (v) this.adopt(v);
    this.notice.set('Entries reset to the stored revision.');
  }
}
