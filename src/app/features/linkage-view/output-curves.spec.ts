import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, type TestRequest } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { By } from '@angular/platform-browser';
import type { DisplayUnits } from '../../core/api-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { exampleVehicles } from '../../../../shared/balance/examples';
import { serve, settle } from '../configurations/spec-backend';
import { OutputCurves } from './output-curves';
import { LineChart } from '../../charts/line-chart';
import { outputCurves, type OutputCurveRow } from '../../../../shared/kinematics/output-curves';
import type { Corner } from '../../../../shared/schema/corner';
import type { AxleName } from '../../../../shared/schema/axle';

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

async function setUp(units: DisplayUnits = 'si', corner: Corner = exampleCorners.fsFrontWishbone, axle: AxleName = 'front') {
  TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting(), { provide: DISPLAY_UNITS, useValue: signal(units) }] });
  const fixture = TestBed.createComponent(OutputCurves);
  const ref = fixture.componentRef;
  ref.setInput('corner', corner);
  ref.setInput('axle', axle);
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

/**
 * Every per-pose output of issue 15 §3, one by one, named as the user reads it in the picker: the unit its axis must
 * carry in each unit system (written here, not read from the component's table), the sweep it is drawn against and
 * the axle whose words it carries (anti-squat is the rear axle's drive anti feature).
 */
const OUTPUTS: readonly { title: string; key: keyof OutputCurveRow; si: string; imperial: string; axis?: 'steer'; axle?: AxleName }[] = [
  { title: 'Toe', key: 'toeDeg', si: 'deg', imperial: 'deg' },
  { title: 'Camber', key: 'camberDeg', si: 'deg', imperial: 'deg' },
  { title: 'Caster', key: 'casterDeg', si: 'deg', imperial: 'deg' },
  { title: 'Kingpin inclination', key: 'kingpinInclinationDeg', si: 'deg', imperial: 'deg' },
  { title: 'Scrub radius', key: 'scrubRadiusMm', si: 'mm', imperial: 'in' },
  { title: 'Mechanical trail', key: 'mechanicalTrailMm', si: 'mm', imperial: 'in' },
  { title: 'Half-track change', key: 'halfTrackChangeMm', si: 'mm', imperial: 'in' },
  { title: 'Wheelbase change', key: 'wheelbaseChangeMm', si: 'mm', imperial: 'in' },
  { title: 'Roll centre height', key: 'rollCentreHeightMm', si: 'mm', imperial: 'in' },
  { title: 'Roll centre lateral migration', key: 'rollCentreYMm', si: 'mm', imperial: 'in' },
  { title: 'Spring motion ratio', key: 'springMotionRatio', si: 'mm/mm', imperial: 'mm/mm' },
  { title: 'Anti-roll bar motion ratio', key: 'barMotionRatio', si: 'mm/mm', imperial: 'mm/mm' },
  { title: 'Anti-dive', key: 'antiBrakePercent', si: '%', imperial: '%' },
  { title: 'Anti-lift in drive', key: 'antiDrivePercent', si: '%', imperial: '%' },
  { title: 'Anti-lift in braking', key: 'antiBrakePercent', si: '%', imperial: '%', axle: 'rear' },
  { title: 'Anti-squat', key: 'antiDrivePercent', si: '%', imperial: '%', axle: 'rear' },
  { title: 'Ackermann', key: 'ackermannPercent', si: '%', imperial: '%', axis: 'steer' },
];

/** 1 in = 25.4 mm exactly (NIST SP 811). */
const MM_PER_IN = 25.4;

describe('OutputCurves, each output by name', () => {
  beforeAll(async () => {
    await import('./views-engine');
  });

  for (const units of ['si', 'imperial'] as const) {
    for (const o of OUTPUTS) {
      const axle = o.axle ?? 'front';
      it(`${o.title} (${axle} axle, ${units}): picked alone, drawn in ${o[units]} against ${o.axis === 'steer' ? 'rack travel' : 'wheel travel'}, the engine's values`, async () => {
        const corner = axle === 'front' ? exampleCorners.fsFrontWishbone : exampleCorners.fsRearWishbone;
        const { fixture, el } = await setUp(units, corner, axle);
        if (o.axis === 'steer') {
          Array.from(el.querySelectorAll<HTMLButtonElement>('[data-testid="curve-axis"] button')).find((b) => b.textContent.includes('Rack travel'))!.click();
          await until(fixture, () => (el.querySelector('[data-chart] .rw-axis-label-x')?.textContent ?? '').includes('Rack travel'));
        }
        // Picked by its name in the picker, alone: every other output cleared first.
        const picker = el.querySelector('[data-testid="curve-picker"]')!;
        for (const host of Array.from(picker.querySelectorAll('mat-checkbox'))) {
          const input = host.querySelector<HTMLInputElement>('input[type="checkbox"]')!;
          if (input.checked) input.click();
        }
        fixture.detectChanges();
        const host = Array.from(picker.querySelectorAll('mat-checkbox')).find((h) => h.textContent.trim().replace(/\s+\(against rack travel\)$/, '') === o.title);
        expect(host, `the picker offers ${o.title}`).toBeDefined();
        host!.querySelector<HTMLInputElement>('input[type="checkbox"]')!.click();
        await until(fixture, () => charts(el).length === 1);
        expect(charts(el)).toEqual([host!.getAttribute('data-output')]);
        const chart = el.querySelector('[data-chart]')!;
        expect(chart.querySelector('figcaption')!.textContent.trim().startsWith(`${o.title} against`)).toBe(true);
        // The axis labels carry the units of the user's system.
        const xUnit = units === 'si' ? 'mm' : 'in';
        expect(chart.querySelector('.rw-axis-label-x')!.textContent.trim()).toMatch(new RegExp(`\\(${xUnit}\\)$`));
        expect(chart.querySelector('.rw-axis-label-y')!.textContent.replace(/\s+/g, ' ').trim()).toMatch(new RegExp(`\\(${o[units].replace('/', '\\/')}\\)$`));

        // The engine's own answer for the same geometry, sweep and vehicle figures (the served vehicle's wheelbase and CG height).
        const v = exampleVehicles.tur26Ember;
        const figures = { wheelbaseMm: v.wheelbaseMm, anti: { axle, cgHeightMm: v.cgHeightMm, wheelbaseMm: v.wheelbaseMm } };
        const rows = outputCurves(corner, o.axis === 'steer' ? { axis: 'steer', travelMm: 0, ...figures } : { axis: 'travel', range: { from: -25, to: 25, step: 2.5 }, rackMm: 0, ...figures }).rows;
        const inUnits = (v: number, unit: string) => (unit === 'in' ? v / MM_PER_IN : v);
        const expected = rows
          .filter((r) => typeof r[o.key] === 'number' && Number.isFinite(r[o.key]))
          .map((r) => ({ x: inUnits(r.x, xUnit), y: inUnits(r[o.key] as number, o[units]) }));
        expect(expected.length).toBeGreaterThan(1);
        const drawn = fixture.debugElement.queryAll(By.directive(LineChart)).map((d) => d.componentInstance as LineChart);
        expect(drawn).toHaveLength(1);
        const series = drawn[0]!.series();
        expect(series.map((s) => s.name)).toEqual(['Revision 3 (shown)']);
        const points = series[0]!.points;
        expect(points).toHaveLength(expected.length);
        points.forEach((p, i) => {
          expect(p.x).toBeCloseTo(expected[i]!.x, 9);
          expect(p.y).toBeCloseTo(expected[i]!.y, 9);
        });
      });
    }
  }
});
