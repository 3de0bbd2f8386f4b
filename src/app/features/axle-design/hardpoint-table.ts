import { ChangeDetectionStrategy, Component, computed, effect, ElementRef, inject, input, output, signal } from '@angular/core';
import type { Corner, Vec3 } from '../../../../shared/schema/corner';
import { formatNumber } from '../../charts/chart-types';
import { hardpointRows, HardpointRow, linkRows } from './hardpoint-model';
import { parseDecimal, readPastedBlock } from './hardpoint-io';
import { cornerUnusualValues } from '../../../../shared/schema/corner-ranges';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { fromDisplayUnits, inDisplayUnits, unitLabel } from '../../core/format/quantities';
import { formatNum } from '../../core/format/num';
import { MatError, MatFormField } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { ErrorState } from '../../core/forms/error-state';
import { UnitsTextPipe } from '../../core/format/units-text-pipe';

export interface PointEdit {
  readonly key: string;
  readonly value: Vec3;
}

const AXES = ['x', 'y', 'z'] as const;

/**
 * The hardpoints of a corner as an editable table (left corner, in the user's
 * length unit: mm, or inches converted to mm on commit), with
 * the link lengths beside it. Each cell is a compact Material form field
 * (`matInput`); an edit is committed on the input's change event (Enter or
 * leaving the field), Escape restores the shown value, text that is not a
 * number puts the field in its error state with the message beside it; a
 * block pasted from a spreadsheet fills the rows from the cell it lands in.
 * Read-only users see plain text.
 */
@Component({
  selector: 'rw-hardpoint-table',
  imports: [MatFormField, MatInput, MatError, ErrorState, UnitsTextPipe],
  templateUrl: './hardpoint-table.html',
  styleUrl: './hardpoint-table.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class HardpointTable {
  readonly corner = input.required<Corner>();
  readonly editable = input<boolean>(false);
  /** Keys to mark as changed since the last saved revision. */
  readonly changed = input<readonly string[]>([]);

  /** Key of the selected row (e.g. `points.upperOuter`), shared with the 3D view. */
  readonly selectedKey = input<string | null>(null);
  /** A row was selected (its point name clicked or one of its cells focused). */
  readonly rowSelected = output<string>();

  readonly pointEdited = output<PointEdit>();
  /** Several points at once (a pasted block); applied as one undo step. */
  readonly pointsPasted = output<ReadonlyMap<string, Vec3>>();

  protected readonly axes = AXES;
  private readonly units = inject(DISPLAY_UNITS);
  /** The user's length unit ("mm" or "in"). */
  protected readonly unit = computed(() => unitLabel('length', this.units()));
  protected readonly rows = computed(() => hardpointRows(this.corner()));
  protected readonly links = computed(() => linkRows(this.corner()));
  protected readonly changedSet = computed(() => new Set(this.changed()));
  /** Possible but unusual values (shared/schema/ranges.ts), by row key: shown beside the point, never refused. */
  protected readonly unusual = computed(() => {
    const byRow = new Map<string, string[]>();
    for (const w of cornerUnusualValues(this.corner())) {
      const key = w.path.replace(/\[\d\]$/, '');
      byRow.set(key, [...(byRow.get(key) ?? []), w.message]);
    }
    return byRow;
  });
  /** Cells holding text that is not a number: `key:axis` → message. */
  protected readonly invalid = signal<ReadonlyMap<string, string>>(new Map());
  protected readonly pasteMessage = signal<string | null>(null);

  private readonly element = inject<ElementRef<HTMLElement>>(ElementRef);

  constructor() {
    // A point picked elsewhere (the 3D view) brings its row into view.
    effect(() => {
      const key = this.selectedKey();
      if (!key) return;
      const row = this.element.nativeElement.querySelector(`tr[data-key="${key}"]`);
      if (row && 'scrollIntoView' in row) (row as HTMLElement).scrollIntoView?.({ block: 'nearest' });
    });
  }

  protected select(key: string): void {
    if (key !== this.selectedKey()) this.rowSelected.emit(key);
  }

  /** A stored coordinate (mm) as shown and typed: in the user's unit, 8 significant figures. */
  protected format(v: number): string {
    return formatNumber(inDisplayUnits(v, 'length', this.units()), 8);
  }

  /** A link length: to 0.01 mm, or 0.001 in. */
  protected linkLength(mm: number): string {
    return formatNum(mm, { kind: 'length', decimals: this.units() === 'imperial' ? 3 : 2 }, this.units());
  }

  /** A typed value in the user's unit, in mm. */
  private stored(v: number): number {
    return fromDisplayUnits(v, 'length', this.units());
  }

  protected cellId(row: HardpointRow, axis: number): string {
    return `hp-${row.key.replace('.', '-')}-${AXES[axis]}`;
  }

  protected errorFor(row: HardpointRow, axis: number): string | undefined {
    return this.invalid().get(`${row.key}:${axis}`);
  }

  protected commit(row: HardpointRow, axis: number, event: Event): void {
    const target = event.target as HTMLInputElement;
    const value = parseDecimal(target.value);
    const cell = `${row.key}:${axis}`;
    const next = new Map(this.invalid());
    if (value === null) {
      next.set(cell, `${row.name} ${AXES[axis]}: "${target.value}" is not a number in ${this.unit()}.`);
      this.invalid.set(next);
      return;
    }
    next.delete(cell);
    this.invalid.set(next);
    if (this.stored(value) === row.value[axis] || target.value === this.format(row.value[axis]!)) return;
    const updated: Vec3 = [row.value[0], row.value[1], row.value[2]];
    updated[axis] = this.stored(value);
    this.pointEdited.emit({ key: row.key, value: updated });
  }

  /** Restores the shown value when Escape is pressed in a cell. */
  protected revert(row: HardpointRow, axis: number, event: Event): void {
    const target = event.target as HTMLInputElement;
    target.value = this.format(row.value[axis]!);
    const next = new Map(this.invalid());
    next.delete(`${row.key}:${axis}`);
    this.invalid.set(next);
  }

  protected paste(rowIndex: number, axis: number, event: ClipboardEvent): void {
    const text = event.clipboardData?.getData('text/plain') ?? '';
    if (!/[\t\n;]/.test(text.trim())) return; // a single value: let the input take it
    event.preventDefault();
    const result = this.applyBlock(text, rowIndex, axis);
    this.pasteMessage.set(result);
  }

  /**
   * Fills points from a pasted block starting at (rowIndex, axis). Rows with
   * a point label go to that point; unlabelled rows fill downward. Returns a
   * message for the user; nothing is applied if any cell is bad.
   */
  applyBlock(text: string, rowIndex: number, axis: number): string {
    const rows = this.rows();
    const block = readPastedBlock(text).rows;
    const updates = new Map<string, Vec3>();
    const errors: string[] = [];
    block.forEach((b, i) => {
      const target = b.label
        ? rows.find((r) => [r.key, r.key.split('.')[1], r.name].some((n) => n?.toLowerCase() === b.label!.toLowerCase()))
        : rows[rowIndex + i];
      const startAxis = b.label ? 0 : axis;
      if (!target) {
        errors.push(b.label ? `Pasted row ${i + 1}: "${b.label}" is not a point of this corner.` : `Pasted row ${i + 1} runs past the last point.`);
        return;
      }
      const value: Vec3 = [...(updates.get(target.key) ?? target.value)] as Vec3;
      b.values.forEach((v, k) => {
        const a = startAxis + k;
        if (a > 2) return;
        if (v === null) errors.push(`Pasted row ${i + 1} (${target.name}), ${AXES[a]}: not a number.`);
        else value[a] = this.stored(v);
      });
      if (startAxis + b.values.length > 3) errors.push(`Pasted row ${i + 1} has more columns than x, y, z.`);
      updates.set(target.key, value);
    });
    if (errors.length > 0) return `Nothing pasted. ${errors.join(' ')}`;
    if (updates.size === 0) return 'Nothing to paste.';
    this.pointsPasted.emit(updates);
    return `Pasted ${updates.size} point${updates.size === 1 ? '' : 's'}.`;
  }
}
