import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatRadioButton, MatRadioGroup } from '@angular/material/radio';
import { MatOption, MatSelect } from '@angular/material/select';
import type { Corner, Vec3 } from '../../../../shared/schema/corner';
import { loadState, resourceProblem } from '../../core/http/load-state';
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
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { formatNum } from '../../core/format/num';
import { unitLabel } from '../../core/format/quantities';

/** Where the server's reading of the chosen file stands. */
type ImportState =
  /** The frame as entered cannot be used yet (its problems are listed); nothing is sent. */
  | { readonly kind: 'frame' }
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
 * until the whole import is valid and the user accepts it. The upload is a
 * resource (`rxResource`) of the file, the frame and the working corner:
 * a change of any of them reads the file again, and only the latest answer
 * is shown.
 */
@Component({
  selector: 'rw-hardpoint-import',
  imports: [NumPipe, LinkageViews, MatButton, MatFormField, MatLabel, MatInput, MatSelect, MatOption, MatRadioGroup, MatRadioButton],
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

  private readonly chosen = signal<{ readonly name: string; readonly file: Blob } | null>(null);
  protected readonly fileName = computed(() => this.chosen()?.name ?? null);
  protected readonly frame = signal<CadFrame>(IDENTITY_FRAME);
  protected readonly originText = signal<[string, string, string]>(['0', '0', '0']);
  private readonly displayUnits = inject(DISPLAY_UNITS);

  /** The server's reading of the chosen file in the chosen frame, against the working corner. */
  private readonly upload = rxResource({
    params: () => {
      const chosen = this.chosen();
      if (!chosen || this.problems().length > 0) return undefined;
      return { chosen, frame: this.frame(), corner: this.corner(), teamId: this.teamId(), designId: this.designId() };
    },
    stream: ({ params: p }) => this.api.preview(p.teamId, p.designId, p.chosen.file, p.chosen.name, p.frame, p.corner),
  });
  private readonly uploadState = loadState(this.upload);

  protected readonly state = computed<ImportState | null>(() => {
    if (!this.chosen()) return null;
    if (this.problems().length > 0) return { kind: 'frame' };
    const s = this.uploadState();
    if (s.status === 'loading') return { kind: 'reading' };
    if (s.status === 'ready') return { kind: 'ready', preview: s.value };
    const p = resourceProblem(this.upload.error());
    const details = (p.details ?? {}) as { errors?: string[]; fields?: { path: string; message: string }[] };
    if (p.code === 'import_rows' && details.errors) return { kind: 'rows', errors: details.errors };
    if (p.code === 'import_geometry' && details.fields) return { kind: 'geometry', problems: details.fields.map((f) => f.message) };
    return { kind: 'refused', message: p.message };
  });

  protected readonly originProblems = computed(() =>
    this.originText()
      .map((t, i) => (parseDecimal(t) === null ? `CAD origin along Rollwise ${'xyz'[i]}: "${t}" is not a number; write it in millimetres, e.g. 12.5 or 12,5.` : null))
      .filter((m): m is string => m !== null),
  );

  protected readonly problems = computed(() => [...frameProblems(this.frame()), ...this.originProblems()]);

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
    const input = event.target as HTMLInputElement;
    const file = input.files?.[0];
    if (file) this.read(file.name, file);
    // The same file chosen again (after fixing it on disk) must fire a new change.
    input.value = '';
  }

  /** Sends the file to the server with the frame and the working corner; the answer replaces any earlier one. */
  read(name: string, file: Blob): void {
    this.chosen.set({ name, file });
  }

  /** The same as choosing a file holding `text` (for pasted text and tests). */
  readText(name: string, text: string): void {
    this.read(name, new Blob([text], { type: /\.json$/i.test(name) ? 'application/json' : 'text/csv' }));
  }

  /** How far an imported point moves, in the user's length unit. */
  protected moved(mm: number): string {
    const u = this.displayUnits();
    return `${formatNum(mm, { kind: 'length' }, u)} ${unitLabel('length', u)}`;
  }

  private changeFrame(change: (f: CadFrame) => CadFrame): void {
    this.frame.update(change);
  }

  protected usePreset(index: number | string): void {
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
  }

  protected apply(): void {
    const m = this.mapped();
    if (m && this.canApply()) this.applied.emit(m);
  }
}
