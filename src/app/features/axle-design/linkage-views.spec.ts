import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { DisplayUnits } from '../../core/api-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import type { Corner, Vec3 } from '../../../../shared/schema/corner';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { boxesOverlap, placeLabels, scaleBarLength, type Box } from './drawing-layout';
import { HardpointTable } from './hardpoint-table';
import { renderComponent } from '../../../testing/render';
import { LinkageViews } from './linkage-views';

const units = signal<DisplayUnits>('si');

function draw(corner: Corner, contactPatch: Vec3 | null = null): HTMLElement {
  TestBed.configureTestingModule({ providers: [{ provide: DISPLAY_UNITS, useValue: units }] });
  return renderComponent(LinkageViews, { corner, contactPatch }).nativeElement as HTMLElement;
}

const num = (el: Element, name: string) => Number(el.getAttribute(name));
const boxOf = (r: Element): Box => ({ x: num(r, 'x'), y: num(r, 'y'), w: num(r, 'width'), h: num(r, 'height') });
/** The left wheel's contact patch below the wheel centre (enough for the half-track dimension). */
const patchUnder = (c: Corner): Vec3 => [c.points.wheelCentre[0], c.points.wheelCentre[1], 0];

const PROJECT: Record<string, (p: Vec3) => [number, number]> = {
  front: (p) => [p[1], p[2]],
  side: (p) => [-p[0], p[2]],
  top: (p) => [-p[1], p[0]],
};

describe('LinkageViews', () => {
  beforeEach(() => units.set('si'));

  it('draws each view with a scale bar whose length is its stated length at the drawing’s own scale', () => {
    const corner = exampleCorners.fsFrontWishbone;
    const el = draw(corner);
    const views = el.querySelectorAll('[data-view]');
    expect(views).toHaveLength(3);
    for (const view of Array.from(views)) {
      const name = view.getAttribute('data-view')!;
      // The drawing's scale from two drawn points, measured independently of the scale bar: drawing units per mm.
      const a = view.querySelector('circle[data-key="points.lowerFront"]')!;
      const b = view.querySelector('circle[data-key="points.upperOuter"]')!;
      const [ax, ay] = PROJECT[name]!(corner.points.lowerFront);
      const [bx, by] = PROJECT[name]!(corner.points.upperOuter);
      const perMm = Math.hypot(num(b, 'cx') - num(a, 'cx'), num(b, 'cy') - num(a, 'cy')) / Math.hypot(bx - ax, by - ay);
      // The same scale across and up (no stretch): dx and dy each match.
      expect(Math.abs(num(b, 'cx') - num(a, 'cx'))).toBeCloseTo(Math.abs(bx - ax) * perMm, 6);

      const bar = view.querySelector('[data-testid="scale-bar"]')!;
      const [line] = Array.from(bar.querySelectorAll('line'));
      const stated = /^([\d.]+) mm$/.exec(bar.querySelector('text')!.textContent.trim());
      expect(stated, 'the scale bar states its length in mm').not.toBeNull();
      expect((num(line!, 'x2') - num(line!, 'x1')) / perMm).toBeCloseTo(Number(stated![1]), 6);
    }
  });

  it('states the scale bar and dimensions in inches for an inch-pound user', () => {
    units.set('imperial');
    const el = draw(exampleCorners.fsFrontWishbone, patchUnder(exampleCorners.fsFrontWishbone));
    const front = el.querySelector('[data-view="front"]')!;
    const bar = front.querySelector('[data-testid="scale-bar"]')!;
    const stated = /^([\d.]+) in$/.exec(bar.querySelector('text')!.textContent.trim());
    expect(stated).not.toBeNull();
    // 1 in = 25.4 mm exactly (NIST SP 811): the bar's length in mm is the stated inches × 25.4.
    expect(Number(bar.getAttribute('data-length-mm'))).toBeCloseTo(Number(stated![1]) * 25.4, 9);
    const halfTrack = front.querySelector('[data-dim="half-track"] text')!.textContent.trim();
    // The left contact patch's y (mm) in inches, to the length's 4 significant figures.
    const yIn = exampleCorners.fsFrontWishbone.points.wheelCentre[1] / 25.4;
    expect(halfTrack).toBe(`Half track ${Number(yIn.toPrecision(4))} in`);
  });

  it('dimensions the steering link’s pickup heights above the ground and its length', () => {
    const corner = exampleCorners.fsFrontWishbone;
    const el = draw(corner, patchUnder(corner));
    const text = (view: string, dim: string) => el.querySelector(`[data-view="${view}"] [data-dim="${dim}"] text`)?.textContent?.trim();
    expect(text('front', 'inner-height')).toBe(`${Number(corner.points.tieRodInner[2].toPrecision(4))} mm`);
    expect(text('front', 'outer-height')).toBe(`${Number(corner.points.tieRodOuter[2].toPrecision(4))} mm`);
    const [i, o] = [corner.points.tieRodInner, corner.points.tieRodOuter];
    expect(text('top', 'steer-length')).toBe(`${Number(Math.hypot(o[0] - i[0], o[1] - i[1], o[2] - i[2]).toPrecision(4))} mm`);
    expect(text('side', 'centre-height')).toBe(`${Number(corner.points.wheelCentre[2].toPrecision(4))} mm`);
  });

  for (const [name, corner] of Object.entries(exampleCorners)) {
    for (const u of ['si', 'imperial'] as const) {
      it(`never overlaps two labels (point numbers, dimensions, scale) on the ${name} drawings (${u})`, () => {
        units.set(u);
        const el = draw(corner, patchUnder(corner));
        for (const view of Array.from(el.querySelectorAll('[data-view]'))) {
          const boxes = Array.from(view.querySelectorAll('rect[data-label]')).map((r) => ({ id: r.getAttribute('data-label')!, box: boxOf(r) }));
          // Every linkage point is numbered, plus the dimension texts and the scale.
          expect(boxes.filter((b) => b.id.startsWith('points.')).length).toBe(Object.keys(corner.points).length);
          for (let i = 0; i < boxes.length; i++) {
            for (let j = i + 1; j < boxes.length; j++) {
              expect(boxesOverlap(boxes[i]!.box, boxes[j]!.box), `${view.getAttribute('data-view')}: ${boxes[i]!.id} and ${boxes[j]!.id} overlap`).toBe(false);
            }
          }
        }
      });
    }
  }

  it('numbers each point as its row in the hardpoint table', () => {
    const corner = exampleCorners.roadRearFiveLink;
    const el = draw(corner);
    const table = renderComponent(HardpointTable, { corner });
    const rows = (table.nativeElement as HTMLElement).querySelectorAll('tr[data-key]');
    expect(rows.length).toBeGreaterThan(10);
    for (const row of Array.from(rows)) {
      const key = row.getAttribute('data-key')!;
      if (!key.startsWith('points.')) continue;
      const label = el.querySelector(`[data-view="front"] [data-point="${key}"] text`)!;
      expect(label.textContent.trim(), key).toBe(row.querySelector('.rw-point-no')!.textContent.trim());
    }
  });
});

describe('drawing layout', () => {
  it('picks a round scale-bar length not above the target, in the user’s unit', () => {
    expect(scaleBarLength(130, 'si')).toEqual({ mm: 100, shown: 100 });
    expect(scaleBarLength(260, 'si')).toEqual({ mm: 200, shown: 200 });
    expect(scaleBarLength(49, 'si')).toEqual({ mm: 20, shown: 20 });
    // 130 mm = 5.12 in: a 5 in bar, 127 mm.
    expect(scaleBarLength(130, 'imperial')).toEqual({ mm: 127, shown: 5 });
  });

  it('spreads the labels of points that coincide so that none overlaps another', () => {
    const requests = Array.from({ length: 12 }, (_, i) => ({ key: `p${i}`, text: String(i + 1), x: 100, y: 100 }));
    const placed = placeLabels(requests, { x: 0, y: 0, w: 300, h: 200 }, [{ x: 90, y: 80, w: 40, h: 14 }]);
    expect(placed).toHaveLength(12);
    for (let i = 0; i < placed.length; i++) {
      expect(boxesOverlap(placed[i]!.box, { x: 90, y: 80, w: 40, h: 14 })).toBe(false);
      for (let j = i + 1; j < placed.length; j++) expect(boxesOverlap(placed[i]!.box, placed[j]!.box)).toBe(false);
    }
  });
});
