import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { MatError, MatFormField, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatButton } from '@angular/material/button';
import type { Corner } from '../../../../shared/schema/corner';
import { unusualValue } from '../../../../shared/schema/ranges';
import { wordNumber } from '../../../../shared/schema/issue-words';
import { formatNumber } from '../../charts/chart-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { inDisplayUnits, unitLabel } from '../../core/format/quantities';
import { ErrorState } from '../../core/forms/error-state';
import { inputValue } from '../../core/forms/dom-events';
import { changedSettings, cornerSettings, settingRule, typedSetting, type SettingField, type SettingValue } from './corner-settings-model';

/**
 * A setting committed in stored units: the path, the tuple component (null for a plain value) and the value
 * (undefined: a rate back to rigid). The editor's store applies it as one undo step (`AxleDesignStore.editSetting`).
 */
export interface SettingEdit {
  readonly path: string;
  readonly index: number | null;
  readonly value: SettingValue;
}

/**
 * The corner's inputs that are not hardpoint positions, beside the hardpoint
 * table: the wheel's loaded radius, the steering rack's stroke and axis (or
 * the steering arm's), the rocker axis and the anti-roll bar axis. Lengths in
 * the user's unit (mm, or inches stored as mm), angles in degrees, axes as
 * directions. Each field commits on its change event (Enter or leaving it);
 * text that is not a number, a value outside what is possible, a stroke that
 * misses straight ahead or an axis of no direction is refused beside the field
 * in words and sends nothing. Read-only users see the values as text.
 */
@Component({
  selector: 'rw-corner-settings',
  imports: [MatFormField, MatLabel, MatSuffix, MatError, MatInput, MatButton, ErrorState],
  template: `
    <section class="rw-corner-settings" aria-labelledby="rw-corner-settings-title">
      <h3 id="rw-corner-settings-title">Wheel, steering and axes</h3>
      @for (g of groups(); track g.id) {
        <fieldset [attr.data-group]="g.id">
          <legend>{{ g.title }}</legend>
          <p class="rw-muted">{{ g.note }}</p>
          <div class="rw-setting-fields">
            @for (f of g.fields; track fieldId(f)) {
              @if (editable()) {
                <mat-form-field appearance="outline" subscriptSizing="dynamic" [attr.data-setting]="fieldId(f)">
                  <mat-label>{{ f.label }}</mat-label>
                  <input matInput inputmode="decimal" autocomplete="off" [rwErrorState]="!!errors().get(fieldId(f))" [value]="shown(f)" (change)="commit(f, $event)" />
                  @if (unit(f)) { <span matTextSuffix>{{ unit(f) }}</span> }
                  <mat-error role="alert">{{ errors().get(fieldId(f)) }}</mat-error>
                </mat-form-field>
              } @else {
                <p class="rw-setting-text" [attr.data-setting]="fieldId(f)">{{ f.label }}: {{ shown(f) }} {{ unit(f) }}</p>
              }
            }
          </div>
          @for (w of unusual(g.id); track $index) { <p class="rw-unusual" role="note">Unusual: {{ w }}</p> }
        </fieldset>
      }
      @if (editable()) {
        <button mat-stroked-button type="button" [disabled]="!edited()" (click)="restore()">Restore the saved values</button>
      }
    </section>
  `,
  styles: `
    :host { display: block; }
    fieldset { border: 1px solid var(--mat-sys-outline-variant); border-radius: 8px; margin: 0 0 0.75rem; padding: 0.25rem 0.75rem 0.75rem; }
    legend { font: var(--mat-sys-title-small); padding: 0 0.25rem; }
    .rw-setting-fields { display: flex; flex-wrap: wrap; gap: 0.5rem 1rem; }
    mat-form-field { width: 14rem; }
    .rw-setting-text { margin: 0.25rem 1rem 0.25rem 0; }
    .rw-muted { color: var(--mat-sys-on-surface-variant); font: var(--mat-sys-body-small); margin: 0 0 0.5rem; }
    .rw-unusual { font: var(--mat-sys-body-small); margin: 0.5rem 0 0; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CornerSettings {
  readonly corner = input.required<Corner>();
  readonly editable = input<boolean>(false);
  /** The saved revision's corner, to tell edited settings from saved ones. */
  readonly saved = input<Corner | null>(null);
  readonly settingEdited = output<SettingEdit>();
  /** Put back the saved revision's settings (the points stay). */
  readonly restored = output<void>();

  private readonly units = inject(DISPLAY_UNITS);
  protected readonly groups = computed(() => cornerSettings(this.corner()));
  /** Refused entries by field: the message beside the field. */
  protected readonly errors = signal<ReadonlyMap<string, string>>(new Map());

  /** Whether any setting differs from the saved revision. */
  protected readonly edited = computed(() => {
    const s = this.saved();
    return !!s && changedSettings(this.corner(), s).length > 0;
  });

  protected restore(): void {
    this.errors.set(new Map());
    this.restored.emit();
  }

  protected fieldId(f: SettingField): string {
    return f.index === null ? f.path : `${f.path}[${f.index}]`;
  }

  protected unit(f: SettingField): string {
    return f.kind === 'length' ? unitLabel('length', this.units()) : f.kind === 'angle' ? 'deg' : '';
  }

  /** A stored value as shown and typed: lengths in the user's unit; 8 significant figures, as the hardpoint table. */
  protected shown(f: SettingField): string {
    return formatNumber(f.kind === 'length' ? inDisplayUnits(f.value, 'length', this.units()) : f.value, 8);
  }

  /** Possible but unusual values of a group's fields (shared/schema/ranges.ts), noted, never refused. */
  protected unusual(groupId: string): string[] {
    const group = this.groups().find((g) => g.id === groupId);
    return (group?.fields ?? []).flatMap(
      (f) => unusualValue(f.range, f.value, (v) => ({ value: wordNumber(f.kind === 'length' ? inDisplayUnits(v, 'length', this.units()) : v), unit: this.unit(f) })) ?? [],
    );
  }

  protected commit(f: SettingField, event: Event): void {
    const text = inputValue(event).trim();
    const typed = typedSetting(text, f.label, f.range, f.kind === 'length' ? 'length' : null, this.unit(f), this.units());
    let problem = 'problem' in typed ? typed.problem : null;
    const value = 'value' in typed ? typed.value : NaN;
    if (!problem) {
      const rule = settingRule(this.corner(), f, value);
      if (rule) problem = `${f.label}: ${rule}.`;
    }
    const next = new Map(this.errors());
    if (problem) next.set(this.fieldId(f), problem);
    else next.delete(this.fieldId(f));
    this.errors.set(next);
    if (problem || value === f.value) return;
    this.settingEdited.emit({ path: f.path, index: f.index, value });
  }
}
