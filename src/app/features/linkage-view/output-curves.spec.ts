import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, type TestRequest } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { DisplayUnits } from '../../core/api-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { exampleVehicles } from '../../../../shared/balance/examples';
import { serve, settle } from '../configurations/spec-backend';
import { OutputCurves } from './output-curves';

const TEAM = '/api/teams/t1';

/** A rig file of the design (invented): toe and camber of the left wheel at five travels. */
const RIG = {
  id: 'm1',
  name: 'Shaker run 3',
  fileName: 'shaker-3.csv',
  attachedTo: 'baseline',
  configurationId: null,
  configurationRevision: null,
  axle: 'front',
  designId: 'd1',
  designName: 'Front',
  designRevision: 3,
  side: 'left',
  rackMm: 0,
  basis: 'change',
  pointCount: 5,
  hasCamber: true,
  note: null,
  authorName: 'Ines Varga',
  createdAt: '2026-11-20T09:00:00Z',
};
const RIG_POINTS = [-20, -10, 0, 10, 20].map((t, i) => ({ travelMm: t, toeDeg: 0.01 * t, camberDeg: -1 - 0.02 * t, line: i + 2 }));

async function setUp(units: DisplayUnits = 'si') {
  TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting(), { provide: DISPLAY_UNITS, useValue: signal(units) }] });
  const fixture = TestBed.createComponent(OutputCurves);
  const ref = fixture.componentRef;
  ref.setInput('corner', exampleCorners.fsFrontWishbone);
  ref.setInput('axle', 'front');
  ref.setInput('teamId', 't1');
  ref.setInput('designId', 'd1');
  ref.setInput('vehicleId', 'v1');
  ref.setInput('revision', 3);
  ref.setInput('revisions', [
    { revision: 3, message: null, authorName: 'Ines Varga', createdAt: '2026-11-02T10:00:00Z' },
    { revision: 2, message: 'lower tie rod', authorName: 'Ines Varga', createdAt: '2026-11-01T10:00:00Z' },
  ]);
  fixture.detectChanges();
  const backend = TestBed.inject(HttpTestingController);
  await serve(backend, {
    [`GET ${TEAM}/vehicles/v1`]: { id: 'v1', name: 'Kestrel', archived: false, revision: 1, data: exampleVehicles.tur26Ember, updatedAt: '', updatedByName: null },
    [`GET ${TEAM}/rig-measurements`]: (req: TestRequest) => {
      expect(req.request.params.get('designId')).toBe('d1');
      return [RIG];
    },
  });
  const el = fixture.nativeElement as HTMLElement;
  await until(fixture, () => el.querySelectorAll('[data-chart]').length > 0);
  return { fixture, el, backend };
}

/** Waits (event loop turns, no timers) until the engine's answer is drawn. */
async function until(fixture: { detectChanges(): void; whenStable(): Promise<unknown> }, ready: () => boolean): Promise<void> {
  for (let i = 0; i < 200 && !ready(); i++) {
    await settle();
    fixture.detectChanges();
    await fixture.whenStable();
  }
  expect(ready()).toBe(true);
}

const charts = (el: HTMLElement) => Array.from(el.querySelectorAll('[data-chart]')).map((c) => c.getAttribute('data-chart'));
const box = (el: HTMLElement, key: string) => el.querySelector<HTMLInputElement>(`[data-output="${key}"] input[type="checkbox"]`)!;

describe('OutputCurves', () => {
  // Under jsdom the engine runs in the page from a lazily imported module; load it once first so each spec waits only on
  // the engine's work, not on the module's first compilation.
  beforeAll(async () => {
    await import('./views-engine');
  });

  it('draws the default outputs against wheel travel, and the picker shows and hides series', async () => {
    const { fixture, el } = await setUp();
    expect(charts(el)).toEqual(['toeDeg', 'camberDeg', 'rollCentreHeightMm']);
    expect(el.querySelector('[data-chart="toeDeg"] .rw-axis-label-x')!.textContent).toContain('Wheel travel, both wheels, + bump (mm)');

    box(el, 'toeDeg').click();
    box(el, 'casterDeg').click();
    fixture.detectChanges();
    await fixture.whenStable();
    expect(charts(el)).toEqual(['camberDeg', 'casterDeg', 'rollCentreHeightMm']);
    // One series per geometry: the design being edited.
    expect(el.querySelectorAll('[data-chart="casterDeg"] g.rw-series')).toHaveLength(1);

    Array.from(el.querySelectorAll<HTMLButtonElement>('button')).find((b) => b.textContent.includes('Toe, camber and roll centre only'))!.click();
    fixture.detectChanges();
    await fixture.whenStable();
    expect(charts(el)).toEqual(['toeDeg', 'camberDeg', 'rollCentreHeightMm']);
  });

  it('Ackermann is drawn only against rack travel, with the vehicle wheelbase', async () => {
    const { fixture, el } = await setUp();
    box(el, 'ackermannPercent').click();
    fixture.detectChanges();
    expect(charts(el)).not.toContain('ackermannPercent');
    const rack = Array.from(el.querySelectorAll<HTMLButtonElement>('[data-testid="curve-axis"] button')).find((b) => b.textContent.includes('Rack travel'))!;
    rack.click();
    await until(fixture, () => charts(el).includes('ackermannPercent'));
    expect(el.querySelector('[data-chart="ackermannPercent"] .rw-axis-label-x')!.textContent).toContain('Rack travel');
  });

  it('overlays a saved revision as a second series', async () => {
    const { fixture, el, backend } = await setUp();
    const older = structuredClone(exampleCorners.fsFrontWishbone);
    older.points.tieRodInner = [older.points.tieRodInner[0], older.points.tieRodInner[1], older.points.tieRodInner[2] - 10];
    el.querySelector<HTMLInputElement>('[data-overlay="r:2"] input[type="checkbox"]')!.click();
    await serve(backend, { [`GET ${TEAM}/axle-designs/d1/revisions/2`]: { revision: 2, name: 'Front', corner: older } });
    await until(fixture, () => el.querySelectorAll('[data-chart="toeDeg"] g.rw-series').length === 2);
    const names = Array.from(el.querySelectorAll('[data-chart="toeDeg"] g.rw-series')).map((g) => g.getAttribute('data-series'));
    expect(names).toEqual(['Revision 3 (shown)', 'Revision 2']);
    // The revision being edited is not offered as its own overlay.
    expect(el.querySelector('[data-overlay="r:3"]')).toBeNull();
  });

  it('overlays an open proposal, fetched with its geometry, named by its author and base revision', async () => {
    const { fixture, el, backend } = await setUp();
    const proposed = structuredClone(exampleCorners.fsFrontWishbone);
    proposed.points.tieRodInner = [proposed.points.tieRodInner[0], proposed.points.tieRodInner[1], proposed.points.tieRodInner[2] + 6];
    const listed = { id: 'p7', designId: 'd1', baseRevision: 3, status: 'open' as const, message: 'rear roll steer target', origin: null, authorName: 'Oskar Brandt', createdAt: '2026-11-03T10:00:00Z', decidedByName: null, decidedAt: null, acceptedRevision: null };
    fixture.componentRef.setInput('proposals', [listed]);
    fixture.detectChanges();
    const box = el.querySelector<HTMLInputElement>('[data-overlay="p:p7"] input[type="checkbox"]')!;
    expect(box.closest('[data-overlay]')!.textContent.trim()).toBe('Proposal by Oskar Brandt on revision 3');
    box.click();
    // The list carries no geometry: the proposal itself is read.
    await serve(backend, { [`GET ${TEAM}/axle-designs/d1/proposals/p7`]: { ...listed, corner: proposed } });
    await until(fixture, () => el.querySelectorAll('[data-chart="toeDeg"] g.rw-series').length === 2);
    const names = Array.from(el.querySelectorAll('[data-chart="toeDeg"] g.rw-series')).map((g) => g.getAttribute('data-series'));
    expect(names).toEqual(['Revision 3 (shown)', 'Proposal by Oskar Brandt on revision 3']);
    // A raised tie-rod inner point gives the proposal its own toe curve: not the shown one drawn twice.
    const paths = Array.from(el.querySelectorAll('[data-chart="toeDeg"] g.rw-series path.rw-series-line')).map((p) => p.getAttribute('d'));
    expect(paths).toHaveLength(2);
    expect(paths[0]).not.toBe(paths[1]);
  });

  it('draws lengths in inches for an inch-pound user: the travel axis and the roll centre height', async () => {
    const { el } = await setUp('imperial');
    expect(el.querySelector('[data-chart="toeDeg"] .rw-axis-label-x')!.textContent).toContain('Wheel travel, both wheels, + bump (in)');
    expect(el.querySelector('[data-chart="rollCentreHeightMm"]')!.textContent).toContain('Roll centre above the ground (in)');
    // Toe stays in degrees in both systems.
    expect(el.querySelector('[data-chart="toeDeg"]')!.textContent).toContain('(deg)');
  });

  it('overlays a rig measurement of the design as measured points on the toe and camber charts against travel only', async () => {
    const { fixture, el, backend } = await setUp();
    const box = el.querySelector<HTMLInputElement>('[data-rig="m1"] input[type="checkbox"]')!;
    expect(box.closest('[data-rig]')!.textContent).toContain('Rig: Shaker run 3 (left wheel, as measured)');
    box.click();
    await serve(backend, { [`GET ${TEAM}/rig-measurements/m1`]: { ...RIG, mapping: {}, points: RIG_POINTS, comparison: {}, engineVersion: 'x' } });
    await until(fixture, () => el.querySelectorAll('[data-chart="toeDeg"] g.rw-series').length === 2);
    const series = (key: string) => Array.from(el.querySelectorAll(`[data-chart="${key}"] g.rw-series`)).map((g) => g.getAttribute('data-series'));
    expect(series('toeDeg')).toEqual(['Revision 3 (shown)', 'Rig: Shaker run 3 (left wheel, as measured)']);
    expect(series('camberDeg')).toEqual(['Revision 3 (shown)', 'Rig: Shaker run 3 (left wheel, as measured)']);
    // Measured points, no line: one marker per point of the file.
    const rig = el.querySelector('[data-chart="toeDeg"] g.rw-series[data-series^="Rig:"]')!;
    expect(rig.querySelector('path.rw-series-line')).toBeNull();
    // A roll-centre chart has no rig data.
    expect(series('rollCentreHeightMm')).toEqual(['Revision 3 (shown)']);
    // Against body roll the rig (measured against travel) is not drawn.
    Array.from(el.querySelectorAll<HTMLButtonElement>('[data-testid="curve-axis"] button')).find((b) => b.textContent.includes('Body roll'))!.click();
    await until(fixture, () => (el.querySelector('[data-chart="toeDeg"] .rw-axis-label-x')?.textContent ?? '').includes('Body roll'));
    expect(series('toeDeg')).toEqual(['Revision 3 (shown)']);
  });

  it('shows curves only with the request that produced them: out of date while new inputs solve, and says the range used', async () => {
    const { fixture, el } = await setUp();
    expect(el.querySelector('[data-testid="curves-basis"]')!.textContent.trim()).toBe('Swept over -25 to 25 mm of wheel travel; rack at 0 mm.');
    // 7 mm steps from −10 mm stop at 25 mm (−10 + 5 × 7), short of the 30 mm asked for: the wording says 25.
    fixture.componentRef.setInput('travelRange', { from: -10, to: 30, step: 7 });
    fixture.detectChanges();
    // The new range is being solved: the charts on screen are still the old ones, and say so.
    expect(el.querySelector('[data-testid="curves-out-of-date"]')!.textContent).toContain('Swept over -25 to 25 mm');
    expect(el.querySelector('.rw-curves-result')!.classList).toContain('rw-out-of-date');
    await until(fixture, () => el.querySelector('[data-testid="curves-out-of-date"]') === null);
    expect(el.querySelector('[data-testid="curves-basis"]')!.textContent.trim()).toBe('Swept over -10 to 25 mm of wheel travel; rack at 0 mm.');
    expect(el.querySelector('.rw-curves-result')!.classList).not.toContain('rw-out-of-date');
  });
});
