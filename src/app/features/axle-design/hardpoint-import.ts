import { ChangeDetectionStrategy, Component, computed, input, output, signal } from '@angular/core';
import { cornerSchema, type Corner, type Vec3 } from '../../../../shared/schema/corner';
import { formatNumber } from '../../charts/chart-types';
import {
  AXIS_DIRECTIONS,
  AxisDirection,
  CadFrame,
  FRAME_PRESETS,
  frameProblems,
  IDENTITY_FRAME,
  isRightHanded,
  LENGTH_UNITS,
  LengthUnit,
  mapCadPoints,
} from './cad-frame';
import { readHardpointCsv, readHardpointJson, parseDecimal, HardpointImport as ImportResult } from './hardpoint-io';
import { getPoint, pointName, withPoints } from './hardpoint-model';
import { LinkageViews } from './linkage-views';
import { MatButton } from '@angular/material/button';

/**
 * Import of hardpoints from a CSV or JSON file, optionally from another CAD
 * frame (origin offset, axis directions, units, side). Shows every problem
 * by row, previews the mapped points over the current ones, and applies
 * nothing until the whole import is valid and the user accepts it.
 */
@Component({
  selector: 'rw-hardpoint-import',
  imports: [LinkageViews, MatButton],
  templateUrl: './hardpoint-import.html',
  styleUrl: './hardpoint-import.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class HardpointImport {
  readonly corner = input.required<Corner>();
  readonly applied = output<ReadonlyMap<string, Vec3>>();
  readonly cancelled = output<void>();

  protected readonly directions = AXIS_DIRECTIONS;
  protected readonly presets = FRAME_PRESETS;
  protected readonly units = Object.entries(LENGTH_UNITS).map(([id, u]) => ({ id: id as LengthUnit, label: u.label }));

  protected readonly fileName = signal<string | null>(null);
  protected readonly parsed = signal<ImportResult | null>(null);
  protected readonly frame = signal<CadFrame>(IDENTITY_FRAME);
  protected readonly originText = signal<[string, string, string]>(['0', '0', '0']);

  protected readonly originProblems = computed(() =>
    this.originText()
      .map((t, i) => (parseDecimal(t) === null ? `Origin ${'xyz'[i]}: "${t}" is not a number.` : null))
      .filter((m): m is string => m !== null),
  );

  protected readonly problems = computed(() => [...frameProblems(this.frame()), ...this.originProblems()]);
  protected readonly leftHanded = computed(() => frameProblems(this.frame()).length === 0 && !isRightHanded(this.frame()));

  /** Points after the frame mapping, or null while there is nothing valid to map. */
  protected readonly mapped = computed<Map<string, Vec3> | null>(() => {
    const p = this.parsed();
    if (!p?.ok || this.problems().length > 0) return null;
    return mapCadPoints(p.points, this.frame());
  });

  /** Geometry rules of the corner checked on the imported result (each names its point). */
  protected readonly geometryProblems = computed(() => {
    const m = this.mapped();
    if (!m) return [];
    const r = cornerSchema.safeParse(withPoints(this.corner(), m));
    return r.success ? [] : r.error.issues.map((i) => i.message);
  });

  protected readonly previewRows = computed(() => {
    const m = this.mapped();
    if (!m) return [];
    return [...m].map(([key, p]) => {
      const current = getPoint(this.corner(), key)!;
      const moved = Math.hypot(p[0] - current[0], p[1] - current[1], p[2] - current[2]);
      return { key, name: pointName(key, this.corner()), current, mapped: p, movedMm: moved };
    });
  });

  protected readonly canApply = computed(() => this.mapped() !== null && this.geometryProblems().length === 0);

  protected fmt(v: number): string {
    return formatNumber(v, 7);
  }

  protected async chooseFile(event: Event): Promise<void> {
    const file = (event.target as HTMLInputElement).files?.[0];
    if (!file) return;
    this.readText(file.name, await file.text());
  }

  /** Parses file text (JSON by extension or a leading brace, CSV otherwise). */
  readText(name: string, text: string): void {
    this.fileName.set(name);
    const isJson = /\.json$/i.test(name) || /^\uFEFF?\s*\{/.test(text);
    this.parsed.set(isJson ? readHardpointJson(text, this.corner()) : readHardpointCsv(text, this.corner()));
  }

  protected usePreset(index: string): void {
    const preset = FRAME_PRESETS[Number(index)];
    if (preset) this.frame.update((f) => ({ ...f, axes: preset.axes }));
  }

  protected presetIndex(): number {
    const a = this.frame().axes;
    return FRAME_PRESETS.findIndex((p) => p.axes.every((d, i) => d === a[i]));
  }

  protected setAxis(i: number, value: string): void {
    this.frame.update((f) => {
      const axes = [...f.axes] as [AxisDirection, AxisDirection, AxisDirection];
      axes[i] = value as AxisDirection;
      return { ...f, axes };
    });
  }

  protected setUnit(value: string): void {
    this.frame.update((f) => ({ ...f, unit: value as LengthUnit }));
  }

  protected setSide(value: 'left' | 'right'): void {
    this.frame.update((f) => ({ ...f, side: value }));
  }

  protected setOrigin(i: number, text: string): void {
    const next = [...this.originText()] as [string, string, string];
    next[i] = text;
    this.originText.set(next);
    const values = next.map(parseDecimal);
    if (values.every((v) => v !== null)) this.frame.update((f) => ({ ...f, originMm: values as Vec3 }));
  }

  protected apply(): void {
    const m = this.mapped();
    if (m && this.canApply()) this.applied.emit(m);
  }
}
