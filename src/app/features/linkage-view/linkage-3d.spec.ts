import { ChangeDetectionStrategy, Component, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { By } from '@angular/platform-browser';
import type { Corner } from '../../../../shared/schema/corner';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { HardpointTable } from '../axle-design/hardpoint-table';
import { Linkage3d } from './linkage-3d';
import { linkagePairs } from './linkage-pairs';
import { settle } from '../../../testing/settle';

/** The editor's wiring of the 3D view and the hardpoint table (axle-design-page.html): one selected key, both ways. */
@Component({
  imports: [Linkage3d, HardpointTable],
  template: `
    <rw-linkage-3d [corner]="corner" [selectedKey]="selected()" (picked)="selected.set($event)" />
    <rw-hardpoint-table [corner]="corner" [selectedKey]="selected()" (rowSelected)="selected.set($event)" />
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
class Host {
  readonly corner: Corner = exampleCorners.fsFrontWishbone;
  readonly selected = signal<string | null>(null);
}

async function setUp() {
  const fixture = TestBed.createComponent(Host);
  fixture.detectChanges();
  await settle();
  const view = fixture.debugElement.query(By.directive(Linkage3d)).componentInstance as Linkage3d;
  return { fixture, el: fixture.nativeElement as HTMLElement, view };
}

describe('Linkage3d with the hardpoint table', () => {
  it('a point picked in the 3D view selects its table row', async () => {
    const { fixture, el, view } = await setUp();
    expect(el.querySelector('tr.rw-selected')).toBeNull();
    view.picked.emit('points.upperOuter');
    fixture.detectChanges();
    await settle();
    const rows = el.querySelectorAll('tr.rw-selected');
    expect(rows).toHaveLength(1);
    expect(rows[0]!.getAttribute('data-key')).toBe('points.upperOuter');
    expect(rows[0]!.getAttribute('aria-current')).toBe('true');
    expect(el.querySelector('[data-testid="picked-point"]')!.textContent).toBe('Upper ball joint');
  });

  it('selecting a table row highlights the point in the 3D view', async () => {
    const { fixture, el } = await setUp();
    el.querySelector<HTMLElement>('tr[data-key="points.lowerOuter"] th')!.click();
    fixture.detectChanges();
    await settle();
    expect(fixture.componentInstance.selected()).toBe('points.lowerOuter');
    expect(el.querySelector('[data-testid="picked-point"]')!.textContent).toBe('Lower ball joint');
    expect(el.querySelector('tr.rw-selected')!.getAttribute('data-key')).toBe('points.lowerOuter');
  });

  it('says so instead of drawing when the browser gives no WebGL context (jsdom has none)', async () => {
    const { el } = await setUp();
    expect(el.querySelector('[data-testid="no-webgl"]')!.textContent).toContain('no 3D graphics context');
    expect(el.querySelector('canvas')).toBeNull();
    expect(el.querySelector<HTMLButtonElement>('[data-testid="animate-sweep"]')!.disabled).toBe(true);
  });
});

describe('linkagePairs', () => {
  it('joins only points each example corner has, and draws every link and the spin axis', () => {
    for (const corner of Object.values(exampleCorners)) {
      const points = Object.keys(corner.points);
      const pairs = linkagePairs(corner).filter(([a, b]) => points.includes(a) && points.includes(b));
      const links = pairs.filter((p) => p[2] === 'link').length;
      // domain.md "From hardpoints to a corner's motion": a double wishbone has two arm legs each and a tie rod, a strut
      // the lower arm's two legs, the tie rod and the strut, a five-link five links.
      expect(links).toBe(corner.type === 'strut' ? 4 : 5);
      expect(pairs.some(([a, b]) => a === 'spindle' && b === 'wheelCentre')).toBe(true);
    }
  });
});
