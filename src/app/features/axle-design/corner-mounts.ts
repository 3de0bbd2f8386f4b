import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { MatError, MatFormField, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatCheckbox, type MatCheckboxChange } from '@angular/material/checkbox';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatButton } from '@angular/material/button';
import type { Corner } from '../../../../shared/schema/corner';
import type { Attachment } from '../../../../shared/schema/corner-rules';
import { issueWords, wordNumber, type FigureWords } from '../../../../shared/schema/issue-words';
import { CORNER_RANGES, unusualValue } from '../../../../shared/schema/ranges';
import { formatNumber } from '../../charts/chart-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { inDisplayUnits, unitLabel } from '../../core/format/quantities';
import { SelectErrorState } from '../../core/forms/select-error-state';
import { ErrorState } from '../../core/forms/error-state';
import { inputValue } from '../../core/forms/dom-events';
import type { SettingEdit } from './corner-settings';
import { ATTACHMENT_WORDS, STEERING_KIND_WORDS, complianceMounts, cornerAttachments, type ComplianceMount, type MountRate, type SteeringKind } from '../../../../shared/io/corner-inputs';
import {
  editIssues,
  ruleLabels,
  steeringFrom,
  steeringSlots,
  tupleRule,
  typedSetting,
  withSetting,
  type SettingSlot,
  type SettingValue,
} from './corner-settings-model';

const RATE = CORNER_RANGES.complianceRateNPerMm;

/**
 * A steering being chosen, not yet in the corner: ticking Steered on a corner with none (`steer`), or switching a
 * steered corner to the other kind (`switch`); the kind (none chosen yet) and the text typed into each of its fields.
 */
interface SteeringDraft {
  readonly reason: 'steer' | 'switch';
  readonly kind: SteeringKind | null;
  readonly texts: ReadonlyMap<string, string>;
}

/** The rows of a steering's fields: one per stroke, point or axis, each field with its id (`steering.rackStroke[0]`). */
interface DraftRow {
  readonly path: string;
  readonly title: string;
  readonly slots: readonly (SettingSlot & { readonly id: string })[];
}

const ROW_TITLES: Readonly<Record<string, string>> = {
  'steering.rackStroke': 'Stroke',
  'steering.rackAxis': 'Rack axis',
  'steering.angularStrokeDeg': 'Stroke',
  'steering.armAxisPoint': 'Arm pivot point',
  'steering.armAxisDirection': 'Arm axis',
};

/**
 * The corner's inputs that are choices or compliance, beside "Wheel, steering
 * and axes": whether the corner is steered (or has a fixed toe link) and by
 * what (a steering rack or a steering-box arm: ticking Steered on a corner
 * without one, or choosing the other kind, asks for that kind's stroke and
 * axis in the user's units and sends them, with steered, as one change once
 * every value passes the corner's rules), which
 * link of a five-link corner is the toe link, what the spring's (or
 * pushrod's) outer end and the anti-roll bar's drop link ride on (only the
 * parts the corner type has), and the compliance rates: each bushing's radial
 * and axial rate, each single link's own axial stiffness and the steering's
 * rate at the rack. A rate left out is rigid and says so; its Compliant box makes it
 * compliant (both rates of a bushing are asked for before it is committed) or
 * rigid again. Rates in the user's unit (N/mm or lbf/in). Every change is
 * checked with the corner's own rules (shared/schema/corner-rules.ts) before
 * it is sent, and refused beside its control in words. Read-only users see
 * the values as text.
 */
@Component({
  selector: 'rw-corner-mounts',
  imports: [MatFormField, MatLabel, MatSuffix, MatError, MatInput, MatSelect, MatOption, MatCheckbox, MatButton, ErrorState, SelectErrorState],
  template: `
    <section class="rw-corner-mounts" aria-labelledby="rw-corner-mounts-title">
      <h3 id="rw-corner-mounts-title">Attachments, steering and compliance</h3>
      <fieldset data-group="steering">
        <legend>Steering</legend>
        @if (editable()) {
          <mat-checkbox data-setting="steered" [checked]="corner().steered || draft()?.reason === 'steer'" (change)="setSteered($event)">Steered</mat-checkbox>
        } @else {
          <p class="rw-setting-text" data-setting="steered">{{ corner().steered ? 'Steered' : 'Not steered' }}</p>
        }
        <p class="rw-muted">{{ steeringNote() }}</p>
        @if (errors().get('steered'); as e) { <p class="rw-form-error" role="alert" data-error="steered">{{ e }}</p> }
        @if (shownKind(); as k) {
          @if (editable()) {
            <mat-form-field class="rw-choice-field" appearance="outline" subscriptSizing="dynamic" data-setting="steering.kind">
              <mat-label>Steered by</mat-label>
              <mat-select #kind [value]="k === 'none' ? null : k" placeholder="Choose a rack or an arm" (selectionChange)="chooseKind(kind, $event.value)">
                @for (o of kinds; track o) { <mat-option [value]="o">{{ kindWords[o] }}</mat-option> }
              </mat-select>
            </mat-form-field>
          } @else if (k !== 'none') {
            <p class="rw-setting-text" data-setting="steering.kind">Steered by: {{ kindWords[k] }}</p>
          }
        }
        @if (draft(); as d) {
          <div class="rw-steering-draft" data-group="steering-draft" role="group" aria-label="The new steering">
            @if (!d.kind) {
              <p class="rw-muted" role="status">Choose a steering rack or a steering-box arm; until its values are given the corner stays as it is.</p>
            } @else {
              <p class="rw-muted" role="status">{{ draftNote(d.kind) }} Nothing changes until every value is given and applied.</p>
              @for (r of draftRows(); track r.path) {
                <div class="rw-draft-row" [attr.data-row]="r.path">
                  <span class="rw-mount-name">{{ r.title }}</span>
                  @for (f of r.slots; track f.id) {
                    <mat-form-field appearance="outline" subscriptSizing="dynamic" [attr.data-draft]="f.id">
                      <mat-label>{{ f.label }}</mat-label>
                      <input matInput inputmode="decimal" autocomplete="off" [rwErrorState]="!!draftErrors().get(f.id)" [value]="d.texts.get(f.id) ?? ''" (change)="typeDraft(f, $event)" />
                      @if (unitOf(f)) { <span matTextSuffix>{{ unitOf(f) }}</span> }
                      <mat-error role="alert">{{ draftErrors().get(f.id) }}</mat-error>
                    </mat-form-field>
                  }
                </div>
                @if (draftErrors().get(r.path); as e) { <p class="rw-form-error" role="alert" [attr.data-error]="r.path">{{ e }}</p> }
              }
              @if (draftErrors().get('steering'); as e) { <p class="rw-form-error" role="alert" data-error="steering">{{ e }}</p> }
            }
            <div class="rw-draft-actions">
              <button mat-flat-button type="button" data-action="apply-steering" [disabled]="!d.kind" (click)="applyDraft()">Apply the steering</button>
              <button mat-button type="button" data-action="cancel-steering" (click)="cancelDraft()">Cancel</button>
            </div>
          </div>
        }
        @if (toeLink(); as t) {
          @if (editable()) {
            <mat-form-field appearance="outline" subscriptSizing="dynamic" data-setting="toeLink">
              <mat-label>Toe link</mat-label>
              <mat-select #toe [value]="t" [rwErrorState]="errors().has('toeLink')" (selectionChange)="chooseToeLink(toe, $event.value)">
                @for (n of links; track n) { <mat-option [value]="n">Link {{ n }}</mat-option> }
              </mat-select>
              @if (errors().get('toeLink'); as e) { <mat-error role="alert" data-error="toeLink">{{ e }}</mat-error> }
            </mat-form-field>
          } @else {
            <p class="rw-setting-text" data-setting="toeLink">Toe link: link {{ t }}</p>
          }
        }
      </fieldset>

      @if (attachments().length > 0) {
        <fieldset data-group="attachments">
          <legend>What the parts ride on</legend>
          <p class="rw-muted">The part of the suspension each end is carried by; only the parts this corner type has are offered.</p>
          @for (f of attachments(); track f.path) {
            @if (editable()) {
              <mat-form-field class="rw-choice-field" appearance="outline" subscriptSizing="dynamic" [attr.data-setting]="f.path">
                <mat-label>{{ f.label }}</mat-label>
                <mat-select #g [value]="f.value" [rwErrorState]="errors().has(f.path)" (selectionChange)="chooseAttachment(g, f.path, $event.value)">
                  @for (o of f.options; track o) { <mat-option [value]="o">{{ words[o] }}</mat-option> }
                </mat-select>
                @if (errors().get(f.path); as e) { <mat-error role="alert" [attr.data-error]="f.path">{{ e }}</mat-error> }
              </mat-form-field>
            } @else {
              <p class="rw-setting-text" [attr.data-setting]="f.path">{{ f.label }}: {{ words[f.value] }}</p>
            }
          }
        </fieldset>
      }

      <fieldset data-group="compliance">
        <legend>Compliance</legend>
        <p class="rw-muted">
          Rates in {{ rateUnit() }}. A mount without a rate is rigid. Bushings: radial across the axis, axial along the arm's pivot
          axis, the link or the kingpin. Links: the link's own stretch. Steering: the rack mounts and column, as a rate at the rack.
        </p>
        @for (g of mountGroups(); track g.name) {
          <h4>{{ g.name }}</h4>
          @for (m of g.mounts; track m.path) {
            <div class="rw-mount" [attr.data-mount]="m.path">
              <span class="rw-mount-name">{{ m.label }}</span>
              @if (editable()) {
                <mat-checkbox [checked]="compliant(m)" (change)="setCompliant(m, $event.checked)"><span class="rw-visually-hidden">{{ m.label }}: </span>Compliant</mat-checkbox>
              }
              @if (!compliant(m)) { <span class="rw-rigid">Rigid</span> }
              @if (compliant(m) && editable()) {
                @for (r of m.rates; track r.label) {
                  <mat-form-field appearance="outline" subscriptSizing="dynamic" [attr.data-rate]="rateId(m, r)">
                    <mat-label>{{ r.label }}</mat-label>
                    <input matInput inputmode="decimal" autocomplete="off" [rwErrorState]="!!errors().get(rateId(m, r))" [value]="shownRate(m, r)" (change)="commitRate(m, r, $event)" />
                    <span matTextSuffix>{{ rateUnit() }}</span>
                    <mat-error role="alert">{{ errors().get(rateId(m, r)) }}</mat-error>
                  </mat-form-field>
                }
                @if (isPending(m)) { <p class="rw-muted" role="status">Enter {{ m.rates.length > 1 ? 'both rates' : 'the rate' }}; until then the mount stays rigid.</p> }
              } @else if (!editable() && !rigid(m)) {
                <span class="rw-setting-text">{{ readOnlyRates(m) }}</span>
              }
            </div>
            @for (w of unusual(m); track $index) { <p class="rw-unusual" role="note">Unusual: {{ w }}</p> }
          }
        }
      </fieldset>
    </section>
  `,
  styles: `
    :host { display: block; }
    fieldset { border: 1px solid var(--mat-sys-outline-variant); border-radius: 8px; margin: 0 0 0.75rem; padding: 0.25rem 0.75rem 0.75rem; }
    legend { font: var(--mat-sys-title-small); padding: 0 0.25rem; }
    h4 { font: var(--mat-sys-label-large); margin: 0.75rem 0 0.25rem; }
    .rw-mount { display: flex; flex-wrap: wrap; align-items: center; gap: 0.25rem 1rem; margin: 0.25rem 0; }
    .rw-mount-name { min-width: 16rem; }
    mat-form-field { width: 11rem; margin: 0.25rem 1rem 0.25rem 0; }
    .rw-choice-field { width: 24rem; }
    .rw-setting-text { margin: 0.25rem 1rem 0.25rem 0; }
    .rw-rigid { font: var(--mat-sys-label-large); }
    .rw-muted { color: var(--mat-sys-on-surface-variant); font: var(--mat-sys-body-small); margin: 0.25rem 0 0.5rem; }
    .rw-unusual { font: var(--mat-sys-body-small); margin: 0 0 0.25rem; }
    .rw-steering-draft { border-left: 3px solid var(--mat-sys-primary); padding: 0.25rem 0 0.25rem 0.75rem; margin: 0.5rem 0; }
    .rw-draft-row { display: flex; flex-wrap: wrap; align-items: center; gap: 0.25rem 0; margin: 0.25rem 0; }
    .rw-draft-actions { display: flex; gap: 0.5rem; margin-top: 0.5rem; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CornerMounts {
  readonly corner = input.required<Corner>();
  readonly editable = input<boolean>(false);
  /** One change, in stored units, for the editor's store (`AxleDesignStore.editSetting`: one undo step). */
  readonly settingEdited = output<SettingEdit>();

  private readonly units = inject(DISPLAY_UNITS);
  protected readonly words = ATTACHMENT_WORDS;
  protected readonly links = [1, 2, 3, 4, 5] as const;
  protected readonly rateUnit = computed(() => unitLabel('linearRate', this.units()));
  protected readonly attachments = computed(() => cornerAttachments(this.corner()));
  protected readonly toeLink = computed(() => {
    const c = this.corner();
    return c.type === 'five-link' ? c.toeLink : null;
  });
  protected readonly steeringNote = computed(() => {
    const c = this.corner();
    if (c.steered) return c.type === 'five-link' ? `The toe link (link ${c.toeLink}) moves with the steering.` : 'The tie rod\'s inner end moves with the steering.';
    return c.type === 'five-link' ? `Link ${c.toeLink} is a fixed toe link: its body end does not move.` : 'A fixed toe link: the tie rod\'s inner end is fixed to the body.';
  });
  protected readonly mountGroups = computed(() => {
    const out: { name: string; mounts: ComplianceMount[] }[] = [];
    for (const m of complianceMounts(this.corner())) {
      const g = out.find((x) => x.name === m.group);
      if (g) g.mounts.push(m);
      else out.push({ name: m.group, mounts: [m] });
    }
    return out;
  });

  /** Refusals by control (`steered`, `toeLink`, an attachment path, a rate's id): the words beside it. */
  protected readonly errors = signal<ReadonlyMap<string, string>>(new Map());
  /** Mounts switched to compliant whose rates are not all given yet, with the rates typed so far (stored units). */
  private readonly pending = signal<ReadonlyMap<string, ReadonlyMap<string, number>>>(new Map());

  protected rateId(m: ComplianceMount, r: MountRate): string {
    return r.key ? `${m.path}.${r.key}` : m.path;
  }

  protected rigid(m: ComplianceMount): boolean {
    return m.rates.every((r) => r.value === undefined);
  }

  protected isPending(m: ComplianceMount): boolean {
    return this.pending().has(m.path);
  }

  protected compliant(m: ComplianceMount): boolean {
    return !this.rigid(m) || this.isPending(m);
  }

  /** A rate as shown and typed: in the user's unit, 8 significant figures; a pending one as typed; empty until given. */
  protected shownRate(m: ComplianceMount, r: MountRate): string {
    const v = r.value ?? this.pending().get(m.path)?.get(this.rateId(m, r));
    return v === undefined ? '' : formatNumber(inDisplayUnits(v, 'linearRate', this.units()), 8);
  }

  protected readOnlyRates(m: ComplianceMount): string {
    return m.rates.map((r) => `${r.label.toLowerCase()} ${this.shownRate(m, r)} ${this.rateUnit()}`).join(', ');
  }

  /** Possible but unusual rates (shared/schema/ranges.ts), noted, never refused. */
  protected unusual(m: ComplianceMount): string[] {
    const shown = (v: number) => ({ value: wordNumber(inDisplayUnits(v, 'linearRate', this.units())), unit: this.rateUnit() });
    return m.rates.flatMap((r) => {
      const w = r.value === undefined ? null : unusualValue(RATE, r.value, shown);
      return w ? [`${m.rates.length > 1 ? `${m.label}, ${r.label.toLowerCase()}` : m.label}: ${w}`] : [];
    });
  }

  protected readonly kinds = ['rack', 'arm'] as const;
  protected readonly kindWords = STEERING_KIND_WORDS;
  /** A steering being chosen (null when none is): nothing of it is in the corner until it is applied. */
  protected readonly draft = signal<SteeringDraft | null>(null);
  /** Refusals in the steering being chosen, by field id (`steering.rackStroke[0]`), row (`steering.rackStroke`) or `steering`. */
  protected readonly draftErrors = signal<ReadonlyMap<string, string>>(new Map());

  /** The kind the select shows: the one being chosen, the corner's own when steered, 'none' while ticked without one; null: no select. */
  protected readonly shownKind = computed((): SteeringKind | 'none' | null => {
    const d = this.draft();
    if (d) return d.kind ?? 'none';
    const c = this.corner();
    return c.steered && c.steering ? c.steering.kind : null;
  });

  protected readonly draftRows = computed((): DraftRow[] => {
    const kind = this.draft()?.kind;
    if (!kind) return [];
    const rows: DraftRow[] = [];
    for (const slot of steeringSlots(kind)) {
      const f = { ...slot, id: `${slot.path}[${slot.index ?? 0}]` };
      const row = rows.find((r) => r.path === slot.path);
      if (row) rows[rows.indexOf(row)] = { ...row, slots: [...row.slots, f] };
      else rows.push({ path: slot.path, title: ROW_TITLES[slot.path] ?? slot.label, slots: [f] });
    }
    return rows;
  });

  protected draftNote(kind: SteeringKind): string {
    return kind === 'rack'
      ? `Give the rack's stroke in ${unitLabel('length', this.units())}, from its end toward the right (at or below 0) to its end toward the left (at or above 0). The rack moves along the lateral axis (0, 1, 0) unless you give another direction.`
      : `Give the arm's stroke in degrees, both ends (one at or below 0, the other at or above 0), its pivot point in ${unitLabel('length', this.units())} (vehicle axes) and its pivot axis direction.`;
  }

  protected unitOf(f: SettingSlot): string {
    return f.kind === 'length' ? unitLabel('length', this.units()) : f.kind === 'angle' ? 'deg' : '';
  }

  protected setSteered(event: MatCheckboxChange): void {
    const c = this.corner();
    if (event.checked && !c.steering) {
      // No rack or arm to steer with: ask for one instead of making up its geometry.
      this.setError('steered', null);
      this.startDraft('steer', null);
      return;
    }
    if (!event.checked && this.draft()?.reason === 'steer') {
      this.cancelDraft();
      return;
    }
    if (!event.checked) this.cancelDraft();
    if (!this.send('steered', 'steered', event.checked, 'Steered')) event.source.checked = this.corner().steered;
  }

  protected chooseKind(select: MatSelect, kind: SteeringKind): void {
    const d = this.draft();
    const own = this.corner().steered ? this.corner().steering?.kind : undefined;
    if (d?.reason !== 'steer' && kind === own) {
      this.cancelDraft();
      return;
    }
    if (d?.kind === kind) return;
    this.startDraft(d?.reason ?? 'switch', kind);
    select.value = kind;
  }

  private startDraft(reason: SteeringDraft['reason'], kind: SteeringKind | null): void {
    // The rack's direction is the corner format's own default (lateral), shown and editable, never hidden.
    const texts = new Map<string, string>(kind === 'rack' ? [['steering.rackAxis[0]', '0'], ['steering.rackAxis[1]', '1'], ['steering.rackAxis[2]', '0']] : []);
    this.draft.set({ reason, kind, texts });
    this.draftErrors.set(new Map());
  }

  protected cancelDraft(): void {
    this.draft.set(null);
    this.draftErrors.set(new Map());
  }

  /** A field of the steering being chosen: kept as typed, and refused beside it at once when it is not a possible value. */
  protected typeDraft(f: SettingSlot & { readonly id: string }, event: Event): void {
    const d = this.draft();
    if (!d) return;
    const text = inputValue(event).trim();
    this.draft.set({ ...d, texts: new Map(d.texts).set(f.id, text) });
    const errors = new Map(this.draftErrors());
    errors.delete(f.path);
    errors.delete('steering');
    const typed = text === '' ? null : this.typedDraft(f, text);
    if (typed && 'problem' in typed) errors.set(f.id, typed.problem);
    else errors.delete(f.id);
    this.draftErrors.set(errors);
  }

  private typedDraft(f: SettingSlot, text: string) {
    return typedSetting(text, f.label, f.range, f.kind === 'length' ? 'length' : null, this.unitOf(f), this.units());
  }

  /**
   * Checks every value of the steering being chosen (each beside its field, all at once), then the steering as a
   * whole with the corner's own rules; sends it as one change (steered, with its rack or arm) only when all pass.
   */
  protected applyDraft(): void {
    const d = this.draft();
    if (!d?.kind) return;
    const kind = d.kind;
    const errors = new Map<string, string>();
    const values = new Map<string, number>();
    for (const r of this.draftRows()) {
      for (const f of r.slots) {
        const text = d.texts.get(f.id) ?? '';
        const typed = text === '' ? { problem: `${f.label}: enter a value${this.unitOf(f) ? ` in ${this.unitOf(f)}` : ''}.` } : this.typedDraft(f, text);
        if ('problem' in typed) errors.set(f.id, typed.problem);
        else values.set(f.id, typed.value);
      }
      const tuple = r.slots.map((f) => values.get(f.id));
      if (tuple.every((v) => v !== undefined)) {
        const rule = tupleRule(r.path, r.slots[0]?.kind ?? 'length', tuple);
        if (rule) errors.set(r.path, `${r.title}: ${rule}.`);
      }
    }
    if (errors.size === 0) {
      const steering = steeringFrom(kind, (path, i) => values.get(`${path}[${i}]`) ?? NaN);
      const corner = this.corner();
      const steered = withSetting(corner, 'steering', null, steering);
      // Named as on the steered corner (its tie rod, not a fixed toe link).
      const labels = ruleLabels(steered);
      for (const issue of editIssues(corner, 'steering', null, steering)) {
        // A rule on a point (the toe link's body end on the arm's axis) belongs beside the arm's pivot point.
        const row = issue.path.startsWith('points.') ? 'steering.armAxisPoint' : this.draftRows().some((r) => r.path === issue.path) ? issue.path : 'steering';
        const words = issueWords({ code: 'custom', path: issue.path.split('.'), message: issue.message }, steered, labels, this.figureWords);
        errors.set(row, [errors.get(row), `${ROW_TITLES[row] ?? STEERING_KIND_WORDS[kind]}: ${words}.`].filter(Boolean).join(' '));
      }
      if (errors.size === 0) {
        this.cancelDraft();
        this.setError('steered', null);
        this.settingEdited.emit({ path: 'steering', index: null, value: steering });
        return;
      }
    }
    this.draftErrors.set(errors);
  }

  protected chooseToeLink(select: MatSelect, link: number): void {
    if (!this.send('toeLink', 'toeLink', link, 'Toe link')) select.value = this.toeLink();
  }

  protected chooseAttachment(select: MatSelect, path: string, on: Attachment): void {
    const field = this.attachments().find((f) => f.path === path);
    if (field && !this.send(path, path, on, field.label.replace(/ rides on$/, ''))) select.value = field.value;
  }

  protected setCompliant(m: ComplianceMount, on: boolean): void {
    const pending = new Map(this.pending());
    pending.delete(m.path);
    const errors = new Map(this.errors());
    for (const r of m.rates) errors.delete(this.rateId(m, r));
    this.errors.set(errors);
    if (on) pending.set(m.path, new Map());
    this.pending.set(pending);
    if (!on && !this.rigid(m)) this.send(m.path, m.path, undefined, m.label);
  }

  protected commitRate(m: ComplianceMount, r: MountRate, event: Event): void {
    const id = this.rateId(m, r);
    const text = inputValue(event).trim();
    const typed = typedSetting(text, m.rates.length > 1 ? `${m.label}, ${r.label.toLowerCase()}` : m.label, RATE, 'linearRate', this.rateUnit(), this.units());
    if ('problem' in typed) {
      this.setError(id, typed.problem);
      return;
    }
    this.setError(id, null);
    if (!this.rigid(m)) {
      if (typed.value !== r.value) this.send(id, id, typed.value, m.label);
      return;
    }
    // A rigid mount becomes compliant once every one of its rates is given (a bushing has two), as one change.
    const given = new Map(this.pending().get(m.path) ?? []).set(id, typed.value);
    const values = m.rates.map((x) => given.get(this.rateId(m, x)));
    if (values.some((v) => v === undefined)) {
      this.pending.set(new Map(this.pending()).set(m.path, given));
      return;
    }
    const value: SettingValue = m.rates.length === 1 ? values[0] : Object.fromEntries(m.rates.map((x, i) => [x.key!, values[i]!]));
    if (this.send(id, m.path, value, m.label)) {
      const pending = new Map(this.pending());
      pending.delete(m.path);
      this.pending.set(pending);
    }
  }

  /** Checks a change with the corner's rules; sends it, or puts the rules' words beside its control. True when sent. */
  private send(errorKey: string, path: string, value: SettingValue, label: string): boolean {
    const issues = editIssues(this.corner(), path, null, value);
    if (issues.length > 0) {
      const labels = ruleLabels(this.corner());
      const words = issues.map((i) => issueWords({ code: 'custom', path: i.path.split('.'), message: i.message }, this.corner(), labels, this.figureWords));
      this.setError(errorKey, `${label}: ${words.join('; ')}.`);
      return false;
    }
    this.setError(errorKey, null);
    this.settingEdited.emit({ path, index: null, value });
    return true;
  }

  /** A figure of a rule's message in the user's units (lengths in inches for an inch/pound user). */
  private readonly figureWords: FigureWords = (v, unit) =>
    unit === 'mm' ? { value: wordNumber(inDisplayUnits(v, 'length', this.units())), unit: unitLabel('length', this.units()) } : { value: wordNumber(v), unit };

  private setError(key: string, message: string | null): void {
    const next = new Map(this.errors());
    if (message) next.set(key, message);
    else next.delete(key);
    this.errors.set(next);
  }
}
