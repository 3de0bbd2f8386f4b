import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { MatButton } from '@angular/material/button';
import type { Proposal } from '../features-api';
import { AxleDesignStore } from './axle-design-store';
import { LocalTimePipe } from '../../core/time/local-time';

/** What a proposal's origin says in figures: the roll steer it reaches and the understeer change. */
export function proposalSummary(p: Proposal): string {
  const o = p.origin as { achievedRollSteerCoefficient?: number; understeerChangeDegPerG?: number | null } | null;
  const parts: string[] = [];
  if (o && typeof o.achievedRollSteerCoefficient === 'number') parts.push(`ε ${o.achievedRollSteerCoefficient.toFixed(4)} deg/deg`);
  if (o && typeof o.understeerChangeDegPerG === 'number') parts.push(`understeer change ${o.understeerChangeDegPerG.toFixed(3)} deg/g`);
  return parts.join(', ');
}

/** The editor's open proposals (from the handling-intent screen), each to accept as a new revision or reject. */
@Component({
  selector: 'rw-design-proposals',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [LocalTimePipe, MatButton],
  template: `
    @if (store.openProposals().length > 0) {
      <section class="rw-proposals" aria-labelledby="rw-proposals-title">
        <h3 id="rw-proposals-title">Proposed geometry waiting for a designer</h3>
        @if (store.proposalError(); as m) {
          <p class="rw-form-error" role="alert">{{ m }}</p>
        }
        <ul>
          @for (p of store.openProposals(); track p.id) {
            <li [attr.data-proposal]="p.id">
              From {{ p.authorName ?? 'an engineer' }} on revision {{ p.baseRevision }}, {{ p.createdAt | localTime }}:
              {{ p.message ?? '(no note)' }} @if (summary(p); as s) { ({{ s }}) }
              @if (canAccept()) {
                <button mat-flat-button type="button" (click)="store.decide(p, 'accept')" [disabled]="store.deciding() || store.dirty()">Accept as new revision</button>
                <button mat-stroked-button type="button" (click)="store.decide(p, 'reject')" [disabled]="store.deciding()">Reject</button>
                @if (store.dirty()) { <span class="rw-muted">Save or undo your edits before accepting.</span> }
              }
            </li>
          }
        </ul>
      </section>
    }
  `,
})
export class DesignProposals {
  protected readonly store = inject(AxleDesignStore);
  readonly canAccept = input.required<boolean>();
  protected readonly summary = proposalSummary;
}
