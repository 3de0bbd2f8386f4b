import { ChangeDetectionStrategy, Component, ElementRef, computed, inject, input, signal, viewChild } from '@angular/core';
import { DomSanitizer } from '@angular/platform-browser';
import { RouterLink } from '@angular/router';
import { MatAnchor, MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { ConfigurationsApi } from '../configurations/configurations-api';
import { SafetyCaution } from '../safety-caution';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';

/**
 * `/teams/:teamId/configurations/:configurationId/record`: the configuration
 * review record, laid out for filing. The record itself is one document made
 * by the server (both axles' inputs, curves, budget, bump cost, cautions and
 * their acknowledgements, rig evidence and waivers, reviewers, dates and the
 * approval snapshot's fingerprint) with its own print stylesheet; this page
 * shows it, prints it and offers the PDF that the server's Chromium prints
 * from the same document, so screen, paper and PDF are one layout.
 */
@Component({
  selector: 'rw-review-record-page',
  imports: [RouterLink, MatButton, MatAnchor, MatProgressBar, SafetyCaution],
  template: `
    <div class="rw-page rw-record-page">
      <header class="rw-page-header rw-record-toolbar">
        <h1>Review record</h1>
        <div class="rw-record-actions">
          <button mat-flat-button type="button" (click)="print()" [disabled]="!loaded()">
            <span class="material-symbols-outlined" aria-hidden="true">print</span> Print
          </button>
          <a mat-stroked-button [href]="pdfUrl()" download data-testid="record-pdf">
            <span class="material-symbols-outlined" aria-hidden="true">picture_as_pdf</span> Download PDF
          </a>
          <a mat-button [routerLink]="['/teams', teamId(), 'configurations', configurationId()]">Back to the configuration</a>
        </div>
      </header>
      <rw-safety-caution />
      <p class="rw-muted rw-record-units" data-testid="record-units">
        @if (units() === 'imperial') {
          Figures are in inch/pound units (in, lb, lbf, deg), your display setting.
        } @else {
          Figures are in SI units (mm, kg, N, deg), your display setting.
        }
        The record names its units, and its approval fingerprint is taken from the stored SI values, so a copy in either
        system identifies the same approved state.
      </p>
      @if (!loaded()) {
        <mat-progress-bar mode="indeterminate" aria-label="Preparing the review record" />
        <p class="rw-state" role="status">Preparing the review record (both axles are computed now)…</p>
      }
      <iframe
        #frame
        class="rw-record-frame"
        title="Configuration review record"
        [src]="frameUrl()"
        (load)="loaded.set(true)"
        data-testid="record-frame"
      ></iframe>
    </div>
  `,
  styles: `
    .rw-record-toolbar { display: flex; flex-wrap: wrap; gap: 1rem; align-items: center; justify-content: space-between; }
    .rw-record-actions { display: flex; flex-wrap: wrap; gap: 0.5rem; align-items: center; }
    .rw-record-actions .material-symbols-outlined { vertical-align: middle; margin-right: 0.25rem; }
    .rw-record-frame { width: 100%; min-height: 80vh; border: 1px solid var(--mat-sys-outline-variant); background: #fff; }
    @media print {
      .rw-record-toolbar, rw-safety-caution, .rw-record-units { display: none; }
      .rw-record-frame { border: 0; min-height: 0; height: auto; }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReviewRecordPage {
  private readonly api = inject(ConfigurationsApi);
  private readonly sanitizer = inject(DomSanitizer);
  readonly teamId = input.required<string>();
  readonly configurationId = input.required<string>();

  protected readonly units = inject(DISPLAY_UNITS);
  protected readonly loaded = signal(false);
  private readonly frame = viewChild<ElementRef<HTMLIFrameElement>>('frame');

  protected readonly pdfUrl = computed(() => this.api.recordUrl(this.teamId(), this.configurationId(), 'pdf', this.units()));
  /** Our own API's address for the record page (same origin, a document without script under a strict policy). */
  protected readonly frameUrl = computed(() =>
    this.sanitizer.bypassSecurityTrustResourceUrl(this.api.recordUrl(this.teamId(), this.configurationId(), 'html', this.units())),
  );

  /** Prints the record document itself (its print stylesheet), not the app around it. */
  protected print(): void {
    const w = this.frame()?.nativeElement.contentWindow;
    if (w) w.print();
    else window.print();
  }
}
