import { ChangeDetectionStrategy, Component, computed, DestroyRef, inject, input, output, signal } from '@angular/core';
import { Subscription } from 'rxjs';
import type { Corner, Vec3 } from '../../../../shared/schema/corner';
import { apiProblem } from '../../core/http/api-error';
import {
  AXIS_DIRECTIONS,
  AxisDirection,
  CadFrame,
  FRAME_PRESETS,
  frameProblems,
  IDENTITY_FRAME,
  LENGTH_UNITS,
  LengthUnit,
} from './cad-frame';
import { parseDecimal } from './hardpoint-io';
import { HardpointImportApi, ImportPreview } from './hardpoint-import-api';
import { LinkageViews } from './linkage-views';
import { MatButton } from '@angular/material/button';
import { NumPipe } from '../../core/format/num-pipe';
import { inputValue } from '../../core/forms/dom-events';

/** Where the server's reading of the chosen file stands. */
type ImportState =
  | { readonly kind: 'reading' }
  | { readonly kind: 'ready'; readonly preview: ImportPreview }
  /** Some rows are bad (each named by its line): nothing of the file can be used. */
  | { readonly kind: 'rows'; readonly errors: readonly string[] }
  /** The file was read, but the points it gives break the corner's rules. */
  | { readonly kind: 'geometry'; readonly problems: readonly string[] }
  /** The upload itself was refused (binary, too large, network…). */
  | { readonly kind: 'refused'; readonly message: string };

/**
 * Import of hardpoints from a CSV or JSON file, optionally from another CAD
 * frame (origin offset, axis directions, units, side). The file is uploaded
 * with the frame and the working corner; the server reads, maps and checks
 * it (shared/io) and answers the preview. Every bad row is shown by line,
 * the moved points are drawn over the current ones, and nothing is applied
 * until the whole import is valid and the user accepts it.
 */
@Component({
  selector: 'rw-hardpoint-import',
  imports: [NumPipe, LinkageViews, MatButton],
  templateUrl: './hardpoint-import.html',
  styleUrl: './hardpoint-import.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class HardpointImport {
  protected readonly inputValue = inputValue;
  private readonly api = inject(HardpointImportApi);

  readonly corner = input.required<Corner>();
  readonly teamId = input.required<string>();
  readonly designId = input.required<string>();
  readonly applied = output<ReadonlyMap<string, Vec3>>();
  readonly cancelled = output<void>();

  protected readonly directions = AXIS_DIRECTIONS;
  protected readonly presets = FRAME_PRESETS;
  protected readonly units = Object.entries(LENGTH_UNITS).map(([id, u]) => ({ id: id as LengthUnit, label: u.label }));

  protected readonly fileName = signal<string | null>(null);
  private file: Blob | null = null;
  private request: Subscription | null = null;
  protected readonly state = signal<ImportState | null>(null);
  protected readonly frame = signal<CadFrame>(IDENTITY_FRAME);
  protected readonly originText = signal<[string, string, string]>(['0', '0', '0']);

  constructor() {
    inject(DestroyRef).onDestroy(() => this.request?.unsubscribe());
  }

  protected readonly originProblems = computed(() =>
    this.originText()
      .map((t, i) => (parseDecimal(t) === null ? `Origin ${'xyz'[i]}: "${t}" is not a number.` : null))
      .filter((m): m is string => m !== null),
  );

  protected readonly problems = computed(() => [...frameProblems(this.frame()), ...this.originProblems()]);

  /** The file was read (well or with geometry problems): the frame can be chosen and the file read again. */
  protected readonly readable = computed(() => {
    const k = this.state()?.kind;
    return k === 'reading' || k === 'ready' || k === 'geometry';
  });

  protected readonly preview = computed(() => {
    const s = this.state();
    return s?.kind === 'ready' && this.problems().length === 0 ? s.preview : null;
  });

  /** The moved points in Rollwise's frame, drawn over the current ones. */
  protected readonly mapped = computed<Map<string, Vec3> | null>(() => {
    const p = this.preview();
    return p ? new Map(p.changedPoints.map((c) => [c.key, c.imported])) : null;
  });

  protected readonly canApply = computed(() => (this.mapped()?.size ?? 0) > 0);

  protected chooseFile(event: Event): void {
    const file = (event.target as HTMLInputElement).files?.[0];
    if (file) this.read(file.name, file);
  }

  /** Sends the file to the server with the frame and the working corner; the answer replaces any earlier one. */
  read(name: string, file: Blob): void {
    this.fileName.set(name);
    this.file = file;
    this.upload();
  }

  /** The same as choosing a file holding `text` (for pasted text and tests). */
  readText(name: string, text: string): void {
    this.read(name, new Blob([text], { type: /\.json$/i.test(name) ? 'application/json' : 'text/csv' }));
  }

  private upload(): void {
    this.request?.unsubscribe();
    const name = this.fileName();
    if (!this.file || !name || this.problems().length > 0) return;
    this.state.set({ kind: 'reading' });
    this.request = this.api.preview(this.teamId(), this.designId(), this.file, name, this.frame(), this.corner()).subscribe({
      next: (preview) => this.state.set({ kind: 'ready', preview }),
      error: (err: unknown) => {
        const p = apiProblem(err);
        const details = (p.details ?? {}) as { errors?: string[]; fields?: { path: string; message: string }[] };
        if (p.code === 'import_rows' && details.errors) this.state.set({ kind: 'rows', errors: details.errors });
        else if (p.code === 'import_geometry' && details.fields) this.state.set({ kind: 'geometry', problems: details.fields.map((f) => f.message) });
        else this.state.set({ kind: 'refused', message: p.message });
      },
    });
  }

  private changeFrame(change: (f: CadFrame) => CadFrame): void {
    this.frame.update(change);
    this.upload();
  }

  protected usePreset(index: string): void {
    const preset = FRAME_PRESETS[Number(index)];
    if (preset) this.changeFrame((f) => ({ ...f, axes: preset.axes }));
  }

  protected presetIndex(): number {
    const a = this.frame().axes;
    return FRAME_PRESETS.findIndex((p) => p.axes.every((d, i) => d === a[i]));
  }

  protected setAxis(i: number, value: string): void {
    this.changeFrame((f) => {
      const axes = [...f.axes] as [AxisDirection, AxisDirection, AxisDirection];
      axes[i] = value as AxisDirection;
      return { ...f, axes };
    });
  }

  protected setUnit(value: string): void {
    this.changeFrame((f) => ({ ...f, unit: value as LengthUnit }));
  }

  protected setSide(value: 'left' | 'right'): void {
    this.changeFrame((f) => ({ ...f, side: value }));
  }

  protected setOrigin(i: number, text: string): void {
    const next = [...this.originText()] as [string, string, string];
    next[i] = text;
    this.originText.set(next);
    const values = next.map(parseDecimal);
    if (values.every((v) => v !== null)) this.changeFrame((f) => ({ ...f, originMm: values as Vec3 }));
    else this.request?.unsubscribe();
  }

  protected apply(): void {
    const m = this.mapped();
    if (m && this.canApply()) this.applied.emit(m);
  }
}
