import { TestBed } from '@angular/core/testing';
import type { Vec3 } from '../../../../shared/schema/corner';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { HardpointImport } from './hardpoint-import';

function setUp() {
  const fixture = TestBed.createComponent(HardpointImport);
  fixture.componentRef.setInput('corner', exampleCorners.fsFrontWishbone);
  fixture.detectChanges();
  const applied: ReadonlyMap<string, Vec3>[] = [];
  fixture.componentInstance.applied.subscribe((m) => applied.push(m));
  return { fixture, el: fixture.nativeElement as HTMLElement, applied };
}

function applyButton(el: HTMLElement): HTMLButtonElement {
  return Array.from(el.querySelectorAll('button')).find((b) => b.textContent!.includes('Apply import'))!;
}

describe('HardpointImport', () => {
  it('previews a good file and applies it only on request', () => {
    const { fixture, el, applied } = setUp();
    fixture.componentInstance.readText('tie-rod.csv', 'point;x (mm);y (mm);z (mm)\ntieRodInner;-55;210;170,5\n');
    fixture.detectChanges();
    expect(applied).toEqual([]);
    expect(el.querySelectorAll('.rw-preview-table tbody tr').length).toBe(1);
    expect(el.querySelectorAll('rw-linkage-views .rw-overlay').length).toBeGreaterThan(0);
    applyButton(el).click();
    expect([...applied[0]!]).toEqual([['points.tieRodInner', [-55, 210, 170.5]]]);
  });

  it('names the bad row and keeps Apply disabled', () => {
    const { fixture, el, applied } = setUp();
    fixture.componentInstance.readText('bad.csv', 'point,x,y,z\ntieRodInner,-55,210,160\nlowerOuter,2,five,130\n');
    fixture.detectChanges();
    expect(el.querySelector('.rw-import-errors')!.textContent).toContain('Line 3 (lowerOuter): y "five" is not a number.');
    expect(applyButton(el).disabled).toBe(true);
    applyButton(el).click();
    expect(applied).toEqual([]);
  });

  it('maps points from a z-down, y-right CAD frame in metres before applying', () => {
    const { fixture, el, applied } = setUp();
    // The tie-rod inner point [-55, 210, 150] mm written in a frame with
    // y to the right and z down, in metres, origin at the Rollwise origin.
    fixture.componentInstance.readText('cad.csv', 'point,x,y,z\ntieRodInner,-0.055,-0.21,-0.15\n');
    fixture.detectChanges();
    const preset = el.querySelector<HTMLSelectElement>('fieldset select')!;
    preset.value = '2'; // x forward, y right, z down
    preset.dispatchEvent(new Event('change'));
    const unit = Array.from(el.querySelectorAll<HTMLSelectElement>('fieldset select')).at(-1)!;
    unit.value = 'm';
    unit.dispatchEvent(new Event('change'));
    fixture.detectChanges();
    applyButton(el).click();
    expect([...applied[0]!]).toEqual([['points.tieRodInner', [-55, 210, 150]]]);
  });

  it('refuses an import that breaks the corner geometry, naming the point', () => {
    const { fixture, el } = setUp();
    // Tie rod outer on top of the inner point: the tie rod has no length.
    const [x, y, z] = exampleCorners.fsFrontWishbone.points.tieRodInner;
    fixture.componentInstance.readText('zero.csv', `point,x,y,z\ntieRodOuter,${x},${y},${z}\n`);
    fixture.detectChanges();
    expect(el.textContent).toContain('points.tieRodOuter coincides with points.tieRodInner');
    expect(applyButton(el).disabled).toBe(true);
  });
});
