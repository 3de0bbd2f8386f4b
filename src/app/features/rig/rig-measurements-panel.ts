import { browserTimeZone, formatLocalTime } from '../../core/time/local-time';
import { ChangeDetectionStrategy, Component, computed, DestroyRef, effect, inject, input, signal, untracked } from '@angular/core';
import { of, Subscription } from 'rxjs';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButton } from '@angular/material/button';
import { MatCheckbox } from '@angular/material/checkbox';
import { MatFormField, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatDialog } from '@angular/material/dialog';
import { confirmAction } from '../../core/layout/confirm-dialog';
import {
  CAMBER_SIGNS,
  CAMBER_UNITS,
  readRigCsv,
  TOE_SIGNS,
  TOE_UNITS,
  TRAVEL_SIGNS,
  TRAVEL_UNITS,
  type CamberUnit,
  type RigMapping,
  type ToeUnit,
  type TravelUnit,
} from '../../../../shared/io/rig-measurement';
import type { RigBasis, RigComparison, RigStats } from '../../../../shared/rig/compare';
import { LineChart } from '../../charts/line-chart';
import { type LineSeries } from '../../charts/chart-types';
import { apiProblem } from '../../core/http/api-error';
import { loadState, type LoadState } from '../../core/http/load-state';
import { CautionList } from '../intent/caution-list';
import { SafetyCaution } from '../safety-caution';
import { RigApi, type RigMeasurementDetail, type RigMeasurementSummary, type RigPreviewAnswer, type RigTarget } from './rig-api';
import { DISPLAY_UNITS, NumPipe } from '../../core/format/num-pipe';
import { fromDisplayUnits, inDisplayUnits, unitLabel } from '../../core/format/quantities';
import { formatNum } from '../../core/format/num';
import { inputValue } from '../../core/forms/dom-events';
import type { AxleName } from '../../../../shared/schema/axle';

/** The reference diameter toe in mm at the rim is read with, mm (the check the panel makes before the file is read). */
const RIM_DIAMETER_MM = { min: 100, max: 2000 } as const;

/** Where the upload of a new file stands. */
type UploadState =
  | { readonly kind: 'reading'; readonly fileName: string }
  | { readonly kind: 'mapping'; readonly preview: RigPreviewAnswer }
  | { readonly kind: 'storing'; readonly preview: RigPreviewAnswer }
  /** The server named bad lines: nothing was stored. */
  | { readonly kind: 'rows'; readonly fileName: string; readonly errors: readonly string[]; readonly preview: RigPreviewAnswer | null }
  /** The upload or the store was refused for another reason (binary, too big, unreachable travel, permission…). */
  | { readonly kind: 'refused'; readonly fileName: string; readonly message: string; readonly preview: RigPreviewAnswer | null };

const UNIT_WORDS: Readonly<Record<string, string>> = {
  mm: 'mm',
  in: 'in',
  deg: 'degrees',
  arcmin: 'minutes of arc',
  'mm-at-rim': 'mm at the rim',
  'bump-positive': 'bump positive',
  'rebound-positive': 'rebound positive',
  'toe-in-positive': 'toe-in positive',
  'toe-out-positive': 'toe-out positive',
  'top-out-positive': 'top outboard positive',
  'top-in-positive': 'top inboard positive',
};

/**
 * Bump-steer rig measurements of one configuration (front or rear axle) or
 * of one axle design revision (a baseline of the current car): upload a
 * CSV, map its columns, units and signs (checked here with the shared
 * reader while you choose, then read again and compared by the server),
 * store it, list what is stored, and show measured against predicted with
 * the RMS and largest difference, the team's tolerance caution and the
 * safety caution. docs/rig-measurements.md.
 */
@Component({
  selector: 'rw-rig-measurements',
  imports: [NumPipe, MatButton, MatCheckbox, MatFormField, MatLabel, MatSuffix, MatInput, MatSelect, MatOption, LineChart, CautionList, SafetyCaution],
  templateUrl: './rig-measurements-panel.html',
  styleUrl: './rig-measurements-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RigMeasurementsPanel {
  private readonly api = inject(RigApi);
  private readonly dialog = inject(MatDialog);
  /** The user's unit system: the charts' travel axes, the travel and rack figures follow it (angles are deg in both). */
  private readonly units = inject(DISPLAY_UNITS);
  protected readonly lengthUnit = computed(() => unitLabel('length', this.units()));

  readonly teamId = input.required<string>();
  /** Compare with this configuration (its current revision); the axle is chosen in the panel, starting from `axle`. */
  readonly configurationId = input<string | null>(null);
  /** Without a configuration: compare with this axle design as a baseline (at `designRevision`, default its current one). */
  readonly designId = input<string | null>(null);
  readonly designRevision = input<number | null>(null);
  readonly axle = input<AxleName>('front');
  /** The caller holds `vehicle:manage` (upload and delete); the server checks it again. */
  readonly canEdit = input<boolean>(true);
  /** The caller holds `members:manage` (set the team's rig tolerance). */
  readonly canSetTolerance = input<boolean>(false);

  protected readonly travelUnits = TRAVEL_UNITS;
  protected readonly toeUnits = TOE_UNITS;
  protected readonly camberUnits = CAMBER_UNITS;
  protected readonly travelSigns = TRAVEL_SIGNS;
  protected readonly toeSigns = TOE_SIGNS;
  protected readonly camberSigns = CAMBER_SIGNS;
  protected readonly words = UNIT_WORDS;

  /** What is stored for the configuration or design, loaded again for new inputs and after a store or a delete. */
  private readonly listResource = rxResource({
    params: () => ({ team: this.teamId(), config: this.configurationId(), design: this.designId() }),
    stream: ({ params: p }) =>
      !p.config && !p.design ? of<RigMeasurementSummary[]>([]) : this.api.list(p.team, p.config ? { configurationId: p.config } : { designId: p.design! }),
  });
  protected readonly list = loadState(this.listResource);
  protected readonly selected = signal<LoadState<RigMeasurementDetail> | null>(null);
  /** The team's rig tolerance (set again by an owner's save). */
  private readonly toleranceResource = rxResource({
    params: () => ({ team: this.teamId() }),
    stream: ({ params: p }) => this.api.tolerance(p.team),
  });
  protected readonly tolerance = loadState(this.toleranceResource);
  protected readonly upload = signal<UploadState | null>(null);
  protected readonly actionError = signal<string | null>(null);

  // The mapping being chosen.
  protected readonly hasHeader = signal(true);
  protected readonly travelColumn = signal(0);
  protected readonly toeColumn = signal(1);
  /** -1: the file has no camber. */
  protected readonly camberColumn = signal(-1);
  protected readonly travelUnit = signal<TravelUnit>('mm');
  protected readonly toeUnit = signal<ToeUnit>('deg');
  protected readonly camberUnit = signal<CamberUnit>('deg');
  /** Reference diameter of toe in mm at the rim, mm (typed in the user's length unit); null until given. */
  protected readonly rimDiameterMm = signal<number | null>(null);
  /** The text typed for the diameter is a number or empty (else the field keeps the text and the diameter counts as missing). */
  private readonly rimDiameterTyped = signal(true);
  protected readonly travelSign = signal<(typeof TRAVEL_SIGNS)[number]>('bump-positive');
  protected readonly toeSign = signal<(typeof TOE_SIGNS)[number]>('toe-in-positive');
  protected readonly camberSign = signal<(typeof CAMBER_SIGNS)[number]>('top-out-positive');
  // What it is compared with.
  protected readonly chosenAxle = signal<AxleName>('front');
  protected readonly side = signal<'left' | 'right'>('left');
  /** Rack position, mm (typed in the user's length unit). */
  protected readonly rackPositionMm = signal<number>(0);
  /** The text typed for the rack position is a number (else the field keeps the text and the mapping names the problem). */
  private readonly rackTyped = signal(true);
  protected readonly basis = signal<RigBasis>('change');
  protected readonly name = signal('');
  protected readonly toleranceToeText = signal('');
  protected readonly toleranceCamberText = signal('');

  private file: Blob | null = null;
  private readonly fileText = signal<string | null>(null);
  private requests = new Subscription();

  constructor() {
    inject(DestroyRef).onDestroy(() => this.requests.unsubscribe());
    effect(() => {
      this.teamId();
      this.configurationId();
      this.designId();
      this.chosenAxle.set(this.axle());
      untracked(() => this.selected.set(null));
    });
    // The tolerance fields start from the tolerance loaded or saved.
    effect(() => {
      const t = this.tolerance();
      if (t.status !== 'ready') return;
      untracked(() => {
        this.toleranceToeText.set(String(t.value.toeDeg));
        this.toleranceCamberText.set(String(t.value.camberDeg));
      });
    });
  }

  /** Where new measurements go; null when the panel has nothing to attach to. */
  protected readonly target = computed<RigTarget | null>(() => {
    const config = this.configurationId();
    if (config) return { kind: 'configuration', configurationId: config, axle: this.chosenAxle() };
    const design = this.designId();
    if (design) {
      const rev = this.designRevision();
      return rev ? { kind: 'baseline', designId: design, designRevision: rev } : { kind: 'baseline', designId: design };
    }
    return null;
  });

  protected readonly preview = computed<RigPreviewAnswer | null>(() => {
    const u = this.upload();
    if (!u) return null;
    return u.kind === 'mapping' || u.kind === 'storing' ? u.preview : u.kind === 'rows' || u.kind === 'refused' ? u.preview : null;
  });

  protected readonly rackMm = computed(() => (this.rackTyped() ? this.rackPositionMm() : null));

  /** A stored length (mm) as its field shows it and it is typed: in the user's unit, 8 significant figures (as the hardpoint table). */
  protected shown(mm: number | null): string {
    return formatNum(mm, { kind: 'length', sig: 8, missing: '' }, this.units());
  }

  /** A length field's text in the user's unit, in mm (1 in = 25.4 mm): null when empty, NaN when not a number. */
  private typedMm(event: Event): number | null {
    const text = inputValue(event).trim().replace(',', '.');
    if (text === '') return null;
    const typed = Number(text);
    return Number.isFinite(typed) ? fromDisplayUnits(typed, 'length', this.units()) : Number.NaN;
  }

  protected commitRack(event: Event): void {
    const mm = this.typedMm(event);
    this.rackTyped.set(mm !== null && Number.isFinite(mm));
    if (mm !== null && Number.isFinite(mm)) this.rackPositionMm.set(mm);
  }

  protected commitRimDiameter(event: Event): void {
    const mm = this.typedMm(event);
    this.rimDiameterTyped.set(mm === null || Number.isFinite(mm));
    if (mm === null || Number.isFinite(mm)) this.rimDiameterMm.set(mm);
  }

  protected readonly mapping = computed<RigMapping | null>(() => {
    const rim = this.rimDiameterTyped() ? this.rimDiameterMm() : null;
    const camber = this.camberColumn();
    const m: RigMapping = {
      hasHeader: this.hasHeader(),
      travelColumn: this.travelColumn(),
      toeColumn: this.toeColumn(),
      camberColumn: camber >= 0 ? camber : null,
      travelUnit: this.travelUnit(),
      toeUnit: this.toeUnit(),
      travelSign: this.travelSign(),
      toeSign: this.toeSign(),
      ...(camber >= 0 ? { camberUnit: this.camberUnit(), camberSign: this.camberSign() } : {}),
      ...(this.toeUnit() === 'mm-at-rim' && rim !== null ? { rimDiameterMm: rim } : {}),
    };
    return m;
  });

  /** Problems of the mapping itself, before the file is read with it. */
  protected readonly mappingProblems = computed<string[]>(() => {
    const m = this.mapping()!;
    const out: string[] = [];
    const cols = [m.travelColumn, m.toeColumn, ...(m.camberColumn != null ? [m.camberColumn] : [])];
    if (new Set(cols).size !== cols.length) out.push('Travel, toe and camber must be different columns.');
    const units = this.units();
    const length = (mm: number) => formatNum(mm, { kind: 'length' }, units);
    const unit = this.lengthUnit();
    if (m.toeUnit === 'mm-at-rim' && (m.rimDiameterMm === undefined || m.rimDiameterMm < RIM_DIAMETER_MM.min || m.rimDiameterMm > RIM_DIAMETER_MM.max)) {
      out.push(`Toe in mm at the rim needs the reference diameter, ${length(RIM_DIAMETER_MM.min)} to ${length(RIM_DIAMETER_MM.max)} ${unit}.`);
    }
    if (this.rackMm() === null) out.push(`The rack position must be a number (${unit}).`);
    return out;
  });

  /** The file read with the chosen mapping by the same reader the server uses: converted rows or the bad lines. */
  protected readonly localRead = computed(() => {
    const text = this.fileText();
    if (text === null || this.mappingProblems().length > 0) return null;
    return readRigCsv(text, this.mapping()!);
  });

  protected readonly convertedRows = computed(() => {
    const r = this.localRead();
    return r?.ok ? r.points.slice(0, 8) : [];
  });

  protected readonly canStore = computed(
    () => this.upload()?.kind === 'mapping' && this.target() !== null && this.mappingProblems().length === 0 && this.localRead()?.ok === true,
  );

  protected readonly comparison = computed<RigComparison | null>(() => {
    const s = this.selected();
    return s?.status === 'ready' ? s.value.comparison : null;
  });

  private overlay(pick: 'toe' | 'camber'): LineSeries[] {
    const c = this.comparison();
    if (!c || (pick === 'camber' && !c.camber)) return [];
    const units = this.units();
    const travel = (mm: number) => inDisplayUnits(mm, 'length', units);
    const measured = c.points
      .map((p) => ({ x: travel(p.travelMm), y: pick === 'toe' ? p.toe.measuredDeg : p.camber!.measuredDeg }))
      .sort((a, b) => a.x - b.x);
    return [
      { name: `Predicted ${pick}`, points: c.predicted.map((p) => ({ x: travel(p.travelMm), y: pick === 'toe' ? p.toeDeg : p.camberDeg })) },
      { name: `Measured ${pick}`, points: measured, style: 'points' },
    ];
  }

  protected readonly toeSeries = computed(() => this.overlay('toe'));
  protected readonly camberSeries = computed(() => this.overlay('camber'));
  protected readonly basisWords = computed(() => (this.comparison()?.basis === 'absolute' ? 'as measured' : 'change from design height'));

  /** Stored in UTC, shown in the browser's zone (named in the column header). */
  protected readonly timeZone = browserTimeZone();
  protected localTime(iso: string): string {
    return formatLocalTime(iso, this.timeZone);
  }

  protected statsRows(c: RigComparison): { label: string; s: RigStats }[] {
    return [{ label: 'Toe', s: c.toe }, ...(c.camber ? [{ label: 'Camber', s: c.camber }] : [])];
  }

  protected columnName(i: number): string {
    return this.preview()?.columns[i] ?? `Column ${i + 1}`;
  }

  private refresh(): void {
    this.listResource.reload();
  }

  protected chooseFile(event: Event): void {
    const file = (event.target as HTMLInputElement).files?.[0];
    if (file) void this.read(file.name, file);
  }

  /** The same as choosing a file holding `text` (for tests and pasted text). */
  readText(name: string, text: string): Promise<void> {
    return this.read(name, new Blob([text], { type: 'text/csv' }));
  }

  private async read(name: string, file: Blob): Promise<void> {
    this.file = file;
    this.upload.set({ kind: 'reading', fileName: name });
    let text: string | null = null;
    try {
      text = await file.text();
    } catch {
      text = null;
    }
    this.fileText.set(text);
    this.requests.add(
      this.api.preview(this.teamId(), file, name).subscribe({
        next: (p) => {
          this.applyProposal(p);
          this.name.set(name.replace(/\.(csv|txt|tsv)$/i, ''));
          this.upload.set({ kind: 'mapping', preview: p });
        },
        error: (e: unknown) => this.refusal(name, e, null),
      }),
    );
  }

  private refusal(fileName: string, e: unknown, preview: RigPreviewAnswer | null): void {
    const p = apiProblem(e);
    const errors = (p.details as { errors?: string[] } | undefined)?.errors;
    if (p.code === 'rig_rows' && errors) this.upload.set({ kind: 'rows', fileName, errors, preview });
    else this.upload.set({ kind: 'refused', fileName, message: p.message, preview });
  }

  private applyProposal(p: RigPreviewAnswer): void {
    const m = p.proposed;
    this.hasHeader.set(p.hasHeader);
    this.travelColumn.set(m?.travelColumn ?? 0);
    this.toeColumn.set(m?.toeColumn ?? Math.min(1, p.columns.length - 1));
    this.camberColumn.set(m?.camberColumn ?? -1);
    this.travelUnit.set(m?.travelUnit ?? 'mm');
    this.toeUnit.set(m?.toeUnit ?? 'deg');
    this.camberUnit.set(m?.camberUnit ?? 'deg');
    this.travelSign.set(m?.travelSign ?? 'bump-positive');
    this.toeSign.set(m?.toeSign ?? 'toe-in-positive');
    this.camberSign.set(m?.camberSign ?? 'top-out-positive');
  }

  protected setText(sig: { set(v: string): void }, event: Event): void {
    sig.set((event.target as HTMLInputElement).value);
  }

  /** Sends the file with the mapping; the server reads it again, compares and stores it whole, or refuses it. */
  store(): void {
    const u = this.upload();
    const target = this.target();
    const mapping = this.mapping();
    if (u?.kind !== 'mapping' || !target || !mapping || !this.file || !this.canStore()) return;
    this.upload.set({ kind: 'storing', preview: u.preview });
    const name = this.name().trim();
    const options = { ...(name ? { name } : {}), side: this.side(), rackMm: this.rackMm() ?? 0, basis: this.basis() };
    this.requests.add(
      this.api.create(this.teamId(), this.file, u.preview.fileName, mapping, target, options).subscribe({
        next: (created) => {
          this.upload.set(null);
          this.file = null;
          this.fileText.set(null);
          this.refresh();
          this.show(created.id);
        },
        error: (e: unknown) => {
          this.refusal(u.preview.fileName, e, u.preview);
        },
      }),
    );
  }

  /** Back to the mapping after a refusal of the store (the file is kept). */
  protected backToMapping(): void {
    const p = this.preview();
    if (p) this.upload.set({ kind: 'mapping', preview: p });
  }

  protected cancelUpload(): void {
    this.upload.set(null);
    this.file = null;
    this.fileText.set(null);
  }

  show(id: string): void {
    this.selected.set({ status: 'loading' });
    this.requests.add(
      this.api.get(this.teamId(), id).subscribe({
        next: (d) => this.selected.set({ status: 'ready', value: d }),
        error: (e: unknown) => this.selected.set({ status: 'error', message: apiProblem(e).message }),
      }),
    );
  }

  protected remove(row: RigMeasurementSummary): void {
    this.requests.add(
      confirmAction(this.dialog, {
        title: 'Delete rig measurement?',
        message: `"${row.name}" (${row.fileName}) and its points are removed for good; the activity log keeps a line saying who deleted it.`,
        confirmLabel: 'Delete measurement',
      }).subscribe((confirmed) => {
        if (!confirmed) return;
        this.actionError.set(null);
        this.requests.add(
          this.api.remove(this.teamId(), row.id).subscribe({
            next: () => {
              const s = this.selected();
              if (s?.status === 'ready' && s.value.id === row.id) this.selected.set(null);
              this.refresh();
            },
            error: (e: unknown) => this.actionError.set(apiProblem(e).message),
          }),
        );
      }),
    );
  }

  protected readonly toleranceProblem = computed(() => {
    const t = Number(this.toleranceToeText().replace(',', '.'));
    const c = Number(this.toleranceCamberText().replace(',', '.'));
    return t > 0 && t <= 5 && c > 0 && c <= 5 ? null : 'Each tolerance must be a number above 0 and at most 5°.';
  });

  protected saveTolerance(): void {
    if (this.toleranceProblem()) return;
    const t = { toeDeg: Number(this.toleranceToeText().replace(',', '.')), camberDeg: Number(this.toleranceCamberText().replace(',', '.')) };
    this.actionError.set(null);
    this.requests.add(
      this.api.setTolerance(this.teamId(), t).subscribe({
        next: (v) => {
          this.toleranceResource.set(v);
          const s = this.selected();
          if (s?.status === 'ready') this.show(s.value.id);
        },
        error: (e: unknown) => this.actionError.set(apiProblem(e).message),
      }),
    );
  }
}
