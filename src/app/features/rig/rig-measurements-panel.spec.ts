import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { provideHttpClient } from '@angular/common/http';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { sweepCorner } from '../../../../shared/kinematics/sweep';
import { previewRigCsv, readRigCsv, type RigMapping } from '../../../../shared/io/rig-measurement';
import { compareRigMeasurement, DEFAULT_RIG_TOLERANCE } from '../../../../shared/rig/compare';
import { RigMeasurementsPanel } from './rig-measurements-panel';
import { settle } from '../../../testing/settle';
import { signal } from '@angular/core';
import type { DisplayUnits } from '../../core/api-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';

const TEAM = '/api/teams/team-1';
const corner = exampleCorners.fsFrontWishbone;

/** The design's own predicted curve written as a rig file, toe shifted by `offset` deg. */
function engineFile(offset: number): string {
  const s = sweepCorner(corner, { travel: { from: -25, to: 25, step: 5 } });
  return ['Wheel travel (mm),Toe (deg),Camber (deg)', ...s.rows.map((r) => `${r.travelMm},${r.toeDeg + offset},${r.camberDeg}`)].join('\n');
}

function setUp(inputs: Record<string, unknown> = { configurationId: 'config-1' }, units = signal<DisplayUnits>('si')) {
  TestBed.configureTestingModule({
    providers: [
      provideHttpClient(),
      provideHttpClientTesting(),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      { provide: DISPLAY_UNITS, useValue: units },
    ],
  });
  const fixture = TestBed.createComponent(RigMeasurementsPanel);
  fixture.componentRef.setInput('teamId', 'team-1');
  for (const [k, v] of Object.entries(inputs)) fixture.componentRef.setInput(k, v);
  fixture.detectChanges();
  const http = TestBed.inject(HttpTestingController);
  return { fixture, el: fixture.nativeElement as HTMLElement, http };
}

async function answerStart(fixture: ComponentFixture<RigMeasurementsPanel>, http: HttpTestingController, list: unknown[] = []) {
  http.expectOne((r) => r.url === `${TEAM}/rig-measurements`).flush(list);
  http.expectOne(`${TEAM}/rig-tolerance`).flush({ ...DEFAULT_RIG_TOLERANCE, isDefault: true, updatedAt: null, updatedByName: null });
  await drawn(fixture);
}

/** Lets the panel's resources take their answers (a task after the response) and send their next requests, and draws it. */
async function drawn(fixture: ComponentFixture<RigMeasurementsPanel>): Promise<void> {
  await settle();
  fixture.detectChanges();
}

const button = (el: HTMLElement, text: string) => Array.from(el.querySelectorAll('button')).find((b) => b.textContent.includes(text))!;

/** What the server answers, made with the same shared reader and engine it uses. */
function previewAnswer(name: string, text: string) {
  const p = previewRigCsv(text);
  if (!p.ok) throw new Error(p.errors.join('; '));
  return { fileName: name, ...p.preview };
}

const summary = (id: string) => ({
  id,
  name: 'Rig day 1',
  fileName: 'rig.csv',
  attachedTo: 'configuration',
  configurationId: 'config-1',
  configurationRevision: 2,
  axle: 'front',
  designId: 'design-1',
  designName: 'Front baseline',
  designRevision: 3,
  side: 'left',
  rackMm: 0,
  basis: 'absolute',
  pointCount: 11,
  hasCamber: true,
  note: null,
  authorName: 'Dana Quist',
  createdAt: '2026-11-30T10:15:00.000Z',
});

/** Chooses `option` in the Material select named `name`, as a user does (open the list, click the option). */
function pick(fixture: { detectChanges(): void }, el: HTMLElement, name: string, option: string): void {
  (el.querySelector(`mat-select[name=${name}] .mat-mdc-select-trigger`) as HTMLElement).click();
  fixture.detectChanges();
  [...document.querySelectorAll<HTMLElement>('mat-option')].find((o) => o.textContent.trim() === option)!.click();
  fixture.detectChanges();
}

describe('RigMeasurementsPanel', () => {
  it('shows the empty state and the team tolerance once loaded', async () => {
    const { fixture, el, http } = setUp();
    expect(el.textContent).toContain('Loading rig measurements');
    const list = http.expectOne((r) => r.url === `${TEAM}/rig-measurements`);
    expect(list.request.params.get('configurationId')).toBe('config-1');
    list.flush([]);
    http.expectOne(`${TEAM}/rig-tolerance`).flush({ toeDeg: 0.08, camberDeg: 0.3, isDefault: false, updatedAt: '2026-11-01T00:00:00Z', updatedByName: 'Ana Ferreira' });
    await drawn(fixture);
    expect(el.querySelector('.rw-rig-empty')!.textContent).toContain('No rig measurements');
    expect(el.textContent).toContain('toe 0.08°, camber 0.3°');
    expect(el.textContent).toContain('set by Ana Ferreira');
    http.verify();
  });

  it('uploads, maps, stores and shows the overlay with RMS, largest difference, the tolerance caution and the safety caution', async () => {
    const { fixture, el, http } = setUp();
    await answerStart(fixture, http);
    const text = engineFile(0.12);
    await fixture.componentInstance.readText('rig.csv', text);
    const previewReq = http.expectOne(`${TEAM}/rig-measurements/preview`);
    expect((previewReq.request.body as FormData).get('file')).toBeInstanceOf(Blob);
    previewReq.flush(previewAnswer('rig.csv', text));
    fixture.detectChanges();
    // The proposed mapping fills the dropdowns, the file's first rows and the converted values are shown.
    // Column 2 of the file ("camber") is proposed for camber: the select shows its name (once its options are drawn).
    await fixture.whenStable();
    fixture.detectChanges();
    expect(el.querySelector('mat-select[name=camberColumn]')!.textContent.trim()).toBe(previewAnswer('rig.csv', text).columns[2]);
    // One component family: Material fields, selects and checkbox; the file picker is a Material button driving a hidden input.
    expect(el.querySelectorAll('select, input:not(.mat-mdc-input-element):not(.mdc-checkbox__native-control):not([type=file][hidden])').length).toBe(0);
    expect(el.querySelectorAll('.rw-rig-preview tbody tr').length).toBe(8);
    expect(el.querySelectorAll('.rw-rig-converted tbody tr').length).toBe(8);
    pick(fixture, el, 'basis', 'Values as measured');
    button(el, 'Store measurement').click();
    const create = http.expectOne(`${TEAM}/rig-measurements`);
    const body = create.request.body as FormData;
    const mapping = JSON.parse(body.get('mapping') as string) as RigMapping;
    expect(mapping).toMatchObject({ travelColumn: 0, toeColumn: 1, camberColumn: 2, travelUnit: 'mm', toeUnit: 'deg', toeSign: 'toe-in-positive' });
    expect(JSON.parse(body.get('target') as string)).toEqual({ kind: 'configuration', configurationId: 'config-1', axle: 'front' });
    expect(JSON.parse(body.get('options') as string)).toMatchObject({ basis: 'absolute', rackMm: 0, side: 'left', name: 'rig' });
    create.flush({ ...summary('m-1') });
    await drawn(fixture);
    http.expectOne((r) => r.url === `${TEAM}/rig-measurements`).flush([summary('m-1')]);
    const read = readRigCsv(text, mapping);
    if (!read.ok) throw new Error(read.errors.join('; '));
    const comparison = compareRigMeasurement(corner, read.points, { basis: 'absolute' });
    http.expectOne(`${TEAM}/rig-measurements/m-1`).flush({ ...summary('m-1'), mapping, points: read.points, comparison, engineVersion: 'test' });
    fixture.detectChanges();
    // 0.12° toe offset: RMS and largest are the offset (an identity), above the 0.1° default tolerance.
    const toeRow = el.querySelector('.rw-rig-figures tr[data-quantity=Toe]')!;
    expect(toeRow.querySelector('.rw-rig-rms')!.textContent.trim()).toBe('0.12');
    expect(toeRow.querySelector('.rw-rig-largest')!.textContent.trim()).toBe('0.12');
    expect(el.querySelector('rw-caution-list [data-code=rig-toe-disagreement]')).not.toBeNull();
    expect(el.querySelectorAll('rw-line-chart').length).toBe(2);
    const toeChart = el.querySelector('[data-testid=rig-toe-chart]')!;
    expect(Array.from(toeChart.querySelectorAll('.rw-legend li')).map((li) => li.textContent.trim())).toEqual(['Predicted toe', 'Measured toe']);
    // Told apart without colour: the prediction is a solid line, the measurement a square at every measured point and no line.
    expect(toeChart.querySelector('.rw-series-0 .rw-series-line')!.getAttribute('stroke-dasharray')).toBeNull();
    const measured = toeChart.querySelector('svg.rw-chart-svg [data-series="Measured toe"]')!;
    expect(measured.querySelector('.rw-series-line')).toBeNull();
    expect(read.points.length).toBeGreaterThan(7);
    expect(measured.querySelectorAll('.rw-series-marker[data-shape=square]').length).toBe(read.points.length);
    expect(el.querySelector('rw-safety-caution')).not.toBeNull();
    expect(el.querySelector('.rw-rig-preview')).toBeNull();
    http.verify();
  });

  it("draws the travel axes and writes the travel figures in the user's length unit (1 in = 25.4 mm exactly, NIST SP 811)", async () => {
    const units = signal<DisplayUnits>('imperial');
    const { fixture, el, http } = setUp({ configurationId: 'config-1' }, units);
    await answerStart(fixture, http, [summary('m-1')]);
    button(el, 'Show overlay').click();
    const text = engineFile(0.12);
    const mapping: RigMapping = { hasHeader: true, travelColumn: 0, toeColumn: 1, camberColumn: 2, travelUnit: 'mm', toeUnit: 'deg', travelSign: 'bump-positive', toeSign: 'toe-in-positive' };
    const read = readRigCsv(text, mapping);
    if (!read.ok) throw new Error(read.errors.join('; '));
    const comparison = compareRigMeasurement(corner, read.points, { basis: 'absolute' });
    http.expectOne(`${TEAM}/rig-measurements/m-1`).flush({ ...summary('m-1'), mapping, points: read.points, comparison, engineVersion: 'test' });
    fixture.detectChanges();
    const toeChart = el.querySelector('[data-testid=rig-toe-chart]')!;
    // The measured travel runs −25 to 25 mm: ±0.9843 in (25 / 25.4, to the chart's 4 significant figures).
    expect(toeChart.querySelector('desc')!.textContent).toContain('over Wheel travel, + bump -0.9843 to 0.9843 in');
    expect(toeChart.textContent).not.toMatch(/\bmm\b/);
    expect(el.querySelector('.rw-rig-figures thead')!.textContent).toContain('At travel (in)');
    units.set('si');
    fixture.detectChanges();
    expect(el.querySelector('[data-testid=rig-toe-chart] desc')!.textContent).toContain('over Wheel travel, + bump -25 to 25 mm');
    expect(el.querySelector('.rw-rig-figures thead')!.textContent).toContain('At travel (mm)');
    http.verify();
  });

  it("takes the rack position and the rim diameter in the user's length unit and sends mm (1 in = 25.4 mm exactly, NIST SP 811, Appendix B)", async () => {
    const units = signal<DisplayUnits>('imperial');
    const { fixture, el, http } = setUp({ configurationId: 'config-1' }, units);
    await answerStart(fixture, http);
    // Toe as millimetres at the rim (the sweep's toe in degrees stands in for the figures: only the mapping is checked here).
    const text = engineFile(0).replace('Toe (deg)', 'Toe (mm at rim)');
    await fixture.componentInstance.readText('rig.csv', text);
    http.expectOne(`${TEAM}/rig-measurements/preview`).flush(previewAnswer('rig.csv', text));
    await drawn(fixture);
    pick(fixture, el, 'toeUnit', 'mm at the rim');
    const enter = (name: string, value: string) => {
      const input = el.querySelector<HTMLInputElement>(`input[name=${name}]`)!;
      input.value = value;
      input.dispatchEvent(new Event('input'));
      input.dispatchEvent(new Event('change'));
      fixture.detectChanges();
    };
    // The unit is in the fields; the limits are said in it (100 to 2000 mm: 3.937 to 78.74 in, 4 significant figures).
    expect(el.querySelector('input[name=rimDiameter]')!.closest('mat-form-field')!.textContent).toContain('Reference diameter (in)');
    expect(el.querySelector('input[name=rackMm]')!.closest('mat-form-field')!.textContent).toContain('Rack position (in)');
    expect(el.textContent).toContain('Toe in mm at the rim needs the reference diameter, 3.937 to 78.74 in.');
    enter('rimDiameter', '2');
    expect(el.textContent).toContain('Toe in mm at the rim needs the reference diameter, 3.937 to 78.74 in.');
    enter('rimDiameter', '20');
    enter('rackMm', 'left');
    expect(el.textContent).toContain('The rack position must be a number (in).');
    expect(el.querySelector<HTMLInputElement>('input[name=rackMm]')!.value).toBe('left');
    enter('rackMm', '0.5');
    expect(el.textContent).not.toContain('reference diameter,');
    expect(el.textContent).not.toContain('The rack position must be');
    button(el, 'Store measurement').click();
    const create = http.expectOne(`${TEAM}/rig-measurements`);
    const body = create.request.body as FormData;
    expect((JSON.parse(body.get('mapping') as string) as RigMapping).rimDiameterMm).toBeCloseTo(508, 9); // 20 × 25.4
    expect((JSON.parse(body.get('options') as string) as { rackMm: number }).rackMm).toBeCloseTo(12.7, 9); // 0.5 × 25.4
    create.flush({ ...summary('m-2') });
    await drawn(fixture);
    http.expectOne((r) => r.url === `${TEAM}/rig-measurements`).flush([summary('m-2')]);
    // (The stored measurement's overlay is the test above's; here it is answered with a refusal.)
    http.expectOne(`${TEAM}/rig-measurements/m-2`).flush({ error: { code: 'not_found', message: 'Rig measurement not found' } }, { status: 404, statusText: 'Not Found' });
    fixture.detectChanges();
    http.verify();
  });

  it('shows the lines the server refuses and stores nothing', async () => {
    const { fixture, el, http } = setUp({ designId: 'design-1' });
    const list = http.expectOne((r) => r.url === `${TEAM}/rig-measurements`);
    expect(list.request.params.get('designId')).toBe('design-1');
    list.flush([]);
    http.expectOne(`${TEAM}/rig-tolerance`).flush({ ...DEFAULT_RIG_TOLERANCE, isDefault: true, updatedAt: null, updatedByName: null });
    await fixture.componentInstance.readText('bad.csv', 'travel (mm),toe (rad)\n-25,0.0002\n0,0\n25,0.0002\n');
    const errors = ['Line 1: the toe column "toe (rad)" is in a unit Rollwise does not read (deg, arcmin or mm at the rim).'];
    http.expectOne(`${TEAM}/rig-measurements/preview`).flush(previewAnswer('bad.csv', 'travel (mm),toe (rad)\n-25,0.0002\n0,0\n25,0.0002\n'));
    fixture.detectChanges();
    // The shared reader already names the line while mapping; Store stays disabled.
    expect(el.querySelector('.rw-rig-local-errors')!.textContent).toContain(errors[0]);
    expect(button(el, 'Store measurement').disabled).toBe(true);
    fixture.componentInstance.store();
    http.expectNone(`${TEAM}/rig-measurements`);
    http.verify();
  });

  it('shows a refusal of the upload itself (a binary file) with the server message', async () => {
    const { fixture, el, http } = setUp();
    await answerStart(fixture, http);
    await fixture.componentInstance.readText('rig.csv', 'PK\u0000\u0003');
    http
      .expectOne(`${TEAM}/rig-measurements/preview`)
      .flush({ error: { code: 'not_text', message: '"rig.csv" is a binary file (it holds NUL bytes), not CSV or JSON text' } }, { status: 415, statusText: 'Unsupported Media Type' });
    fixture.detectChanges();
    expect(el.querySelector('.rw-rig-refused')!.textContent).toContain('binary file');
    expect(el.querySelector('.rw-rig-mapping')).toBeNull();
  });

  it('keeps Store disabled when two quantities share a column', async () => {
    const { fixture, el, http } = setUp();
    await answerStart(fixture, http);
    // Toe as millimetres at the rim (the sweep's toe in degrees stands in for the figures: only the mapping is checked here).
    const text = engineFile(0).replace('Toe (deg)', 'Toe (mm at rim)');
    await fixture.componentInstance.readText('rig.csv', text);
    http.expectOne(`${TEAM}/rig-measurements/preview`).flush(previewAnswer('rig.csv', text));
    fixture.detectChanges();
    pick(fixture, el, 'toeColumn', previewAnswer('rig.csv', text).columns[0]!);
    expect(el.textContent).toContain('Travel, toe and camber must be different columns.');
    expect(button(el, 'Store measurement').disabled).toBe(true);
  });

  it('deletes a stored measurement after confirmation and lists again', async () => {
    const { fixture, el, http } = setUp();
    await answerStart(fixture, http, [summary('m-1')]);
    fixture.detectChanges();
    expect(el.querySelectorAll('.rw-rig-list tbody tr').length).toBe(1);
    button(el, 'Delete').click();
    await fixture.whenStable();
    // Nothing is sent until the dialog is confirmed.
    http.expectNone(`${TEAM}/rig-measurements/m-1`);
    expect(document.querySelector('mat-dialog-content')?.textContent).toContain('removed for good');
    [...document.querySelectorAll<HTMLButtonElement>('mat-dialog-actions button')].find((b) => b.textContent?.trim() === 'Delete measurement')!.click();
    await fixture.whenStable();
    const del = http.expectOne(`${TEAM}/rig-measurements/m-1`);
    expect(del.request.method).toBe('DELETE');
    del.flush(null, { status: 204, statusText: 'No Content' });
    await drawn(fixture);
    http.expectOne((r) => r.url === `${TEAM}/rig-measurements`).flush([]);
    await drawn(fixture);
    expect(el.querySelector('.rw-rig-empty')).not.toBeNull();
    http.verify();
  });

  it('lets an owner set the team tolerance, refusing a non-positive value before sending', async () => {
    const { fixture, el, http } = setUp({ configurationId: 'config-1', canSetTolerance: true });
    await answerStart(fixture, http);
    fixture.detectChanges();
    const toe = el.querySelector<HTMLInputElement>('input[name=toeTol]')!;
    expect(toe.value).toBe('0.1');
    toe.value = '0';
    toe.dispatchEvent(new Event('input'));
    fixture.detectChanges();
    expect(button(el, 'Save tolerance').disabled).toBe(true);
    toe.value = '0,15';
    toe.dispatchEvent(new Event('input'));
    fixture.detectChanges();
    button(el, 'Save tolerance').click();
    const put = http.expectOne(`${TEAM}/rig-tolerance`);
    expect(put.request.method).toBe('PUT');
    expect(put.request.body).toEqual({ toeDeg: 0.15, camberDeg: 0.25 });
    put.flush({ toeDeg: 0.15, camberDeg: 0.25, isDefault: false, updatedAt: '2026-12-01T00:00:00Z', updatedByName: 'Ana Ferreira' });
    await drawn(fixture);
    expect(el.textContent).toContain('toe 0.15°, camber 0.25°');
    http.verify();
  });

  it('offers no upload without edit rights, and shows a list error', async () => {
    const { fixture, el, http } = setUp({ configurationId: 'config-1', canEdit: false });
    http.expectOne((r) => r.url === `${TEAM}/rig-measurements`).flush({ error: { code: 'not_found', message: 'Configuration not found' } }, { status: 404, statusText: 'Not Found' });
    http.expectOne(`${TEAM}/rig-tolerance`).flush({ ...DEFAULT_RIG_TOLERANCE, isDefault: true, updatedAt: null, updatedByName: null });
    await drawn(fixture);
    expect(el.querySelector('input[type=file]')).toBeNull();
    expect(el.textContent).toContain('could not be loaded: Configuration not found');
  });
});
