import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { DisplayUnits } from '../../core/api-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import type { Corner, Vec3 } from '../../../../shared/schema/corner';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { renderComponent } from '../../../testing/render';
import { HardpointTable, PointEdit } from './hardpoint-table';

const example = exampleCorners.fsFrontWishbone;
const inner = example.points.tieRodInner;
const outer = example.points.tieRodOuter;

function setUp(editable: boolean, corner: Corner = exampleCorners.fsFrontWishbone) {
  const fixture = renderComponent(HardpointTable, { corner, editable });
  const edits: PointEdit[] = [];
  const pastes: ReadonlyMap<string, Vec3>[] = [];
  fixture.componentInstance.pointEdited.subscribe((e) => edits.push(e));
  fixture.componentInstance.pointsPasted.subscribe((p) => pastes.push(p));
  return { fixture, el: fixture.nativeElement as HTMLElement, edits, pastes };
}

describe('HardpointTable', () => {
  it('lists points in plain words with labelled coordinate inputs', () => {
    const { el } = setUp(true);
    const names = Array.from(el.querySelectorAll('.rw-hardpoint-table tbody th[scope="row"]')).map((th) => th.textContent.trim());
    expect(names).toContain('Tie rod, inner end (rack)');
    expect(names).toContain('Upper ball joint');
    const z = el.querySelector<HTMLInputElement>('input[aria-label="Tie rod, inner end (rack), z in mm"]')!;
    expect(Number(z.value)).toBe(inner[2]);
  });

  it('notes a possible but unusual point beside its row, without refusing it', () => {
    expect(setUp(true).el.querySelector('.rw-unusual')).toBeNull();
    const corner = structuredClone(exampleCorners.fsFrontWishbone);
    if (corner.type !== 'double-wishbone') throw new Error('example changed');
    const lo = corner.points.lowerOuter;
    // A kingpin of 800 mm (typical 120 to 600 mm, shared/schema/ranges.ts; common practice, from memory).
    corner.points.upperOuter = [lo[0], lo[1], lo[2] + 800];
    const { el } = setUp(true, corner);
    const row = el.querySelector('tr[data-key="points.upperOuter"]')!;
    expect(row.querySelector('.rw-unusual')!.textContent.trim()).toBe('Unusual: 800 mm is unusual for a kingpin length (typical 120 to 600 mm)');
  });

  it('notes an unusual point in inches for an inch-pound user (1 in = 25.4 mm exactly)', () => {
    TestBed.overrideProvider(DISPLAY_UNITS, { useValue: signal<DisplayUnits>('imperial') });
    const corner = structuredClone(exampleCorners.fsFrontWishbone);
    if (corner.type !== 'double-wishbone') throw new Error('example changed');
    const lo = corner.points.lowerOuter;
    corner.points.upperOuter = [lo[0], lo[1], lo[2] + 800];
    const row = setUp(true, corner).el.querySelector('tr[data-key="points.upperOuter"]')!;
    // 800 mm = 31.5 in; the typical 120 to 600 mm = 4.724 to 23.62 in (4 significant figures, as lengths are shown).
    expect(row.querySelector('.rw-unusual')!.textContent.trim()).toBe('Unusual: 31.5 in is unusual for a kingpin length (typical 4.724 to 23.62 in)');
  });

  it('commits an edit on change, with a decimal comma accepted', () => {
    const { el, edits } = setUp(true);
    const z = el.querySelector<HTMLInputElement>('#hp-points-tieRodInner-z')!;
    z.value = '172,5';
    z.dispatchEvent(new Event('change'));
    expect(edits).toEqual([{ key: 'points.tieRodInner', value: [inner[0], inner[1], 172.5] }]);
  });

  it('refuses text that is not a number and says which cell', () => {
    const { fixture, el, edits } = setUp(true);
    const z = el.querySelector<HTMLInputElement>('#hp-points-tieRodInner-z')!;
    z.value = '17o';
    z.dispatchEvent(new Event('change'));
    fixture.detectChanges();
    expect(edits).toEqual([]);
    expect(z.getAttribute('aria-invalid')).toBe('true');
    expect(el.querySelector('[role="alert"]')!.textContent).toContain('Tie rod, inner end (rack) z: "17o" is not a number');
  });

  it('edits in compact Material form fields: the error sits in the cell\'s own field, Escape restores the value and clears it', async () => {
    const { fixture, el, edits } = setUp(true);
    const z = el.querySelector<HTMLInputElement>('#hp-points-tieRodInner-z')!;
    const field = z.closest('mat-form-field')!;
    expect(z.classList).toContain('mat-mdc-input-element');
    expect(field.closest('tr')!.getAttribute('data-key')).toBe('points.tieRodInner');
    z.value = 'abc';
    z.dispatchEvent(new Event('change'));
    fixture.detectChanges();
    await fixture.whenStable();
    expect(field.classList).toContain('mat-form-field-invalid');
    const error = field.querySelector('mat-error')!;
    expect(error.textContent).toContain('"abc" is not a number in mm');
    expect(z.getAttribute('aria-describedby')).toContain(error.id);
    // Other cells stay valid.
    expect(el.querySelectorAll('.mat-form-field-invalid')).toHaveLength(1);

    z.dispatchEvent(new KeyboardEvent('keydown', { key: 'Escape' }));
    fixture.detectChanges();
    await fixture.whenStable();
    expect(Number(z.value)).toBe(inner[2]);
    expect(field.classList).not.toContain('mat-form-field-invalid');
    expect(field.querySelector('mat-error')).toBeNull();
    expect(z.getAttribute('aria-invalid')).toBe('false');
    expect(edits).toEqual([]);
  });

  it('selects a row when one of its fields takes the focus, and marks the row the 3D view selected', () => {
    const { fixture, el } = setUp(true);
    const picked: string[] = [];
    fixture.componentInstance.rowSelected.subscribe((k) => picked.push(k));
    el.querySelector<HTMLInputElement>('#hp-points-upperOuter-y')!.dispatchEvent(new FocusEvent('focusin', { bubbles: true }));
    expect(picked).toEqual(['points.upperOuter']);
    fixture.componentRef.setInput('selectedKey', 'points.lowerOuter');
    fixture.detectChanges();
    const selected = [...el.querySelectorAll('tr.rw-selected')];
    expect(selected.map((r) => r.getAttribute('data-key'))).toEqual(['points.lowerOuter']);
    expect(selected[0]!.querySelectorAll('mat-form-field')).toHaveLength(3);
  });

  it('applies a pasted spreadsheet block downward from the cell it lands in', () => {
    const { fixture, pastes } = setUp(true);
    const rows = fixture.componentInstance['rows']();
    const start = rows.findIndex((r) => r.key === 'points.tieRodInner');
    const message = fixture.componentInstance.applyBlock('-50\t205\t165\n-61\t566\t171\n', start, 0);
    expect(message).toBe('Pasted 2 points.');
    expect([...pastes[0]!]).toEqual([
      ['points.tieRodInner', [-50, 205, 165]],
      ['points.tieRodOuter', [-61, 566, 171]],
    ]);
  });

  it('pastes nothing when one pasted cell is bad', () => {
    const { fixture, pastes } = setUp(true);
    const message = fixture.componentInstance.applyBlock('1\t2\tx\n', 0, 0);
    expect(message).toContain('Nothing pasted');
    expect(pastes).toEqual([]);
  });

  it('shows link lengths at design', () => {
    const { el } = setUp(false);
    const tie = Array.from(el.querySelectorAll('.rw-link-table tbody tr')).find((tr) => tr.textContent.includes('Tie rod'))!;
    // The straight-line distance between the two ends, to 0.01 mm.
    const length = Math.hypot(outer[0] - inner[0], outer[1] - inner[1], outer[2] - inner[2]);
    expect(tie.querySelector('td')!.textContent.trim()).toBe(length.toFixed(2));
  });

  it('offers no inputs to a read-only user', () => {
    const { el } = setUp(false);
    expect(el.querySelectorAll('input').length).toBe(0);
    expect(el.querySelectorAll('.rw-coordinate-text').length).toBeGreaterThan(0);
  });

  it('shows and takes coordinates in inches for an inch-pound user, storing mm', () => {
    TestBed.overrideProvider(DISPLAY_UNITS, { useValue: signal<DisplayUnits>('imperial') });
    const { fixture, el, edits } = setUp(true);
    const z = el.querySelector<HTMLInputElement>('input[aria-label="Tie rod, inner end (rack), z in in"]')!;
    // 1 in = 25.4 mm exactly (NIST SP 811).
    expect(Number(z.value)).toBeCloseTo(inner[2] / 25.4, 6);
    expect(el.querySelector('.rw-hardpoint-table caption')!.textContent).toContain('left corner (in;');
    z.value = '6';
    z.dispatchEvent(new Event('change'));
    fixture.detectChanges();
    expect(edits).toHaveLength(1);
    expect(edits[0]!.key).toBe('points.tieRodInner');
    expect(edits[0]!.value.slice(0, 2)).toEqual([inner[0], inner[1]]);
    expect(edits[0]!.value[2]).toBeCloseTo(152.4, 9);
  });
});
