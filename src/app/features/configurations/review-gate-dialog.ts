import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import type { CriticalCaution, GateBody, GatesAnswer } from './configurations-api';
import type { AxleName } from '../../../../shared/schema/axle';

export interface ReviewGateDialogData {
  /** `sign-off`: a reason per Critical caution; `validate`: a waiver reason per axle without rig evidence. */
  readonly mode: 'sign-off' | 'validate';
  readonly configurationName: string;
  readonly gates: GatesAnswer;
}

/** Shortest reason the server accepts (routes/review-gates.ts). */
const MIN_REASON = 3;
const AXLE_WORDS = { front: 'Front axle', rear: 'Rear axle' } as const;

interface Item {
  readonly key: string;
  readonly axle: AxleName;
  readonly title: string;
  readonly detail: string;
  readonly code: string;
}

/**
 * The gate before a sign-off or the move to validated. Sign-off: each Critical
 * caution of the revision, as the server measured it, with a reason field;
 * the button stays inactive until every reason is written. Validated: the rig
 * evidence per axle against the team's tolerance, and a waiver reason for each
 * axle without it. Closes with the body to send (GateBody), or nothing.
 */
@Component({
  selector: 'rw-review-gate-dialog',
  imports: [MatDialogModule, MatFormFieldModule, MatInputModule, MatButtonModule],
  template: `
    <h2 mat-dialog-title>{{ title }}</h2>
    <form (submit)="$event.preventDefault(); confirm()" novalidate>
      <mat-dialog-content>
        <p class="rw-gate-intro">{{ intro }}</p>
        @if (data.mode === 'validate') {
          <ul class="rw-gate-evidence" data-testid="rig-evidence">
            @for (a of data.gates.rig.axles; track a.axle) {
              <li>
                <span class="material-symbols-outlined" aria-hidden="true">{{ a.satisfied ? 'fact_check' : 'pending_actions' }}</span>
                <span>{{ axleWords[a.axle] }}, design revision {{ a.designRevision }}: {{ evidenceWords(a) }}</span>
              </li>
            }
          </ul>
        }
        @for (item of items; track item.key; let i = $index) {
          <div class="rw-gate-item" [attr.data-code]="item.code" [attr.data-axle]="item.axle">
            <p class="rw-gate-title"><span class="material-symbols-outlined" aria-hidden="true">{{ data.mode === 'sign-off' ? 'report' : 'rule' }}</span><strong>{{ item.title }}</strong></p>
            @if (item.detail) { <p class="rw-gate-detail">{{ item.detail }}</p> }
            <mat-form-field appearance="outline" class="rw-gate-reason">
              <mat-label>{{ data.mode === 'sign-off' ? 'Why this is acceptable' : 'Why it counts as validated without rig evidence' }}</mat-label>
              <textarea matInput rows="2" maxlength="1000" [attr.name]="'reason-' + i" [value]="reasons()[item.key] ?? ''" (input)="setReason(item.key, $event)" (blur)="touched.set(true)" required></textarea>
              <mat-hint [class.rw-gate-missing]="touched() && !reasonOk(item.key)">{{ reasonOk(item.key) ? 'Kept in the review record with your name.' : 'Required: write the reason (at least a few words).' }}</mat-hint>
            </mat-form-field>
          </div>
        } @empty {
          <p>{{ data.mode === 'sign-off' ? 'No Critical caution on this revision: nothing to acknowledge.' : 'Both axles have rig evidence within tolerance: no waiver needed.' }}</p>
        }
        <p class="rw-gate-tolerance">Team rig tolerance: toe {{ data.gates.rig.tolerance.toeDeg }}°, camber {{ data.gates.rig.tolerance.camberDeg }}°.</p>
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button mat-button type="button" mat-dialog-close>Cancel</button>
        <button mat-flat-button type="submit" [disabled]="!complete()">{{ confirmLabel }}</button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `
    .rw-gate-item { margin: 0.75rem 0; padding-left: 0.75rem; border-left: 3px solid var(--mat-sys-outline); }
    .rw-gate-title { display: flex; gap: 0.4rem; align-items: center; margin: 0; }
    .rw-gate-detail { margin: 0.25rem 0; color: var(--mat-sys-on-surface-variant); }
    .rw-gate-reason { width: 100%; min-width: 24rem; }
    .rw-gate-evidence { list-style: none; padding: 0; }
    .rw-gate-evidence li { display: flex; gap: 0.4rem; align-items: flex-start; margin: 0.25rem 0; }
    .rw-gate-missing { color: var(--rw-caution-critical); font-weight: 600; }
    .rw-gate-tolerance { color: var(--mat-sys-on-surface-variant); font: var(--mat-sys-body-small); }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReviewGateDialog {
  protected readonly data = inject<ReviewGateDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<ReviewGateDialog, GateBody>>(MatDialogRef);
  protected readonly axleWords = AXLE_WORDS;
  protected readonly title = this.data.mode === 'sign-off' ? `Sign off ${this.data.configurationName}` : `Mark ${this.data.configurationName} validated`;
  protected readonly confirmLabel = this.data.mode === 'sign-off' ? 'Sign off' : 'Mark validated';
  protected readonly intro =
    this.data.mode === 'sign-off'
      ? 'Each Critical caution of this revision needs your written reason before you sign off. The reasons are kept in the review record with your name.'
      : 'Validated needs rig evidence within the team’s tolerance for each axle, or a recorded waiver with its reason.';

  protected readonly items: readonly Item[] =
    this.data.mode === 'sign-off'
      ? this.data.gates.critical.map((c: CriticalCaution) => ({
          key: `${c.axle}:${c.code}`,
          axle: c.axle,
          code: c.code,
          title: `${AXLE_WORDS[c.axle]}: ${c.message}`,
          detail: c.value !== null && c.threshold !== null ? `Measured ${round(c.value)} ${c.unit ?? ''}, Critical from ${round(c.threshold)} ${c.unit ?? ''}.` : '',
        }))
      : this.data.gates.rig.axles
          .filter((a) => !a.satisfied)
          .map((a) => ({ key: a.axle, axle: a.axle, code: 'rig-waiver', title: `${AXLE_WORDS[a.axle]}: waive the rig evidence`, detail: '' }));

  protected readonly reasons = signal<Readonly<Partial<Record<string, string>>>>({});
  protected readonly touched = signal(false);
  protected readonly complete = computed(() => this.items.every((i) => (this.reasons()[i.key] ?? '').trim().length >= MIN_REASON));

  protected reasonOk(key: string): boolean {
    return (this.reasons()[key] ?? '').trim().length >= MIN_REASON;
  }

  protected setReason(key: string, event: Event): void {
    const value = (event.target as HTMLTextAreaElement).value;
    this.reasons.update((r) => ({ ...r, [key]: value }));
  }

  protected evidenceWords(a: { satisfied: boolean; measurements: readonly { within: boolean }[] }): string {
    const n = a.measurements.length;
    if (a.satisfied) return `rig evidence within tolerance (${a.measurements.filter((m) => m.within).length} of ${n} measurements).`;
    return n ? `${n} rig measurement${n === 1 ? '' : 's'}, none within tolerance.` : 'no rig measurement yet.';
  }

  protected confirm(): void {
    this.touched.set(true);
    if (!this.complete()) return;
    const reason = (key: string) => (this.reasons()[key] ?? '').trim();
    this.ref.close(
      this.data.mode === 'sign-off'
        ? { acknowledgements: this.items.map((i) => ({ axle: i.axle, code: i.code, reason: reason(i.key) })) }
        : { waivers: this.items.map((i) => ({ axle: i.axle, reason: reason(i.key) })) },
    );
  }
}

function round(v: number): string {
  return String(Number(v.toPrecision(3))).replace('-', '−');
}
