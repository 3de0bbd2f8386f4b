import { TestBed } from '@angular/core/testing';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import type { Vec3 } from '../../../../shared/schema/corner';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { prepareHardpointImport } from '../../../../shared/io/hardpoints';
import { HardpointImport } from './hardpoint-import';

const corner = exampleCorners.fsFrontWishbone;
const URL = '/api/teams/team-1/axle-designs/design-1/import';

function setUp() {
  TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
  const fixture = TestBed.createComponent(HardpointImport);
  fixture.componentRef.setInput('corner', corner);
  fixture.componentRef.setInput('teamId', 'team-1');
  fixture.componentRef.setInput('designId', 'design-1');
  fixture.detectChanges();
  const applied: ReadonlyMap<string, Vec3>[] = [];
  fixture.componentInstance.applied.subscribe((m) => applied.push(m));
  return { fixture, el: fixture.nativeElement as HTMLElement, applied, http: TestBed.inject(HttpTestingController) };
}

function applyButton(el: HTMLElement): HTMLButtonElement {
  return Array.from(el.querySelectorAll('button')).find((b) => b.textContent!.includes('Apply import'))!;
}

/** The server's answer for a good file, made with the same shared reader the server uses. */
async function answerFor(body: FormData) {
  const file = body.get('file') as File;
  const r = prepareHardpointImport(JSON.parse(body.get('corner') as string), file.name, await file.text(), JSON.parse(body.get('frame') as string));
  if (!r.ok) throw new Error(r.errors.join('; '));
  return { corner: r.corner, changedPoints: r.changedPoints, warnings: r.warnings, baseRevision: 3 };
}

describe('HardpointImport', () => {
  it('uploads the file with the frame and the working corner, previews the answer and applies it only on request', async () => {
    const { fixture, el, applied, http } = setUp();
    fixture.componentInstance.readText('tie-rod.csv', 'point;x (mm);y (mm);z (mm)\ntieRodInner;-55;210;170,5\n');
    fixture.detectChanges();
    expect(el.textContent).toContain('Reading tie-rod.csv');
    const req = http.expectOne(URL);
    expect(req.request.method).toBe('POST');
    const body = req.request.body as FormData;
    expect((body.get('file') as File).name).toBe('tie-rod.csv');
    expect(JSON.parse(body.get('frame') as string)).toEqual({ axes: ['+x', '+y', '+z'], unit: 'mm', originMm: [0, 0, 0], side: 'left' });
    expect(JSON.parse(body.get('corner') as string)).toEqual(corner);
    req.flush(await answerFor(body));
    fixture.detectChanges();
    expect(applied).toEqual([]);
    expect(el.querySelectorAll('.rw-preview-table tbody tr').length).toBe(1);
    expect(el.querySelectorAll('rw-linkage-views .rw-overlay').length).toBeGreaterThan(0);
    applyButton(el).click();
    expect([...applied[0]!]).toEqual([['points.tieRodInner', [-55, 210, 170.5]]]);
    http.verify();
  });

  it('shows the bad rows the server names and keeps Apply disabled', () => {
    const { fixture, el, applied, http } = setUp();
    fixture.componentInstance.readText('bad.csv', 'point,x,y,z\nlowerOuter,2,five,130\n');
    const errors = ['Line 2 (lowerOuter): y "five" is not a number.'];
    http.expectOne(URL).flush({ error: { code: 'import_rows', message: `bad.csv cannot be imported: ${errors[0]}`, details: { errors } } }, { status: 400, statusText: 'Bad Request' });
    fixture.detectChanges();
    expect(el.querySelector('.rw-import-errors')!.textContent).toContain('Line 2 (lowerOuter): y "five" is not a number.');
    expect(el.querySelector('fieldset')).toBeNull();
    expect(applyButton(el).disabled).toBe(true);
    applyButton(el).click();
    expect(applied).toEqual([]);
  });

  it('reads the file again when the CAD frame changes, and applies the mapped points', async () => {
    const { fixture, el, applied, http } = setUp();
    // The tie-rod inner point [-55, 210, 150] mm written with y to the right and z down, in metres.
    fixture.componentInstance.readText('cad.csv', 'point,x,y,z\ntieRodInner,-0.055,-0.21,-0.15\n');
    http.expectOne(URL).flush({ error: { code: 'import_geometry', message: 'The imported points break the corner', details: { fields: [{ path: 'points', message: 'The tie rod is too short.' }] } } }, { status: 400, statusText: 'Bad Request' });
    fixture.detectChanges();
    expect(el.textContent).toContain('The tie rod is too short.');
    const preset = el.querySelector<HTMLSelectElement>('fieldset select')!;
    preset.value = '2'; // x forward, y right, z down
    preset.dispatchEvent(new Event('change'));
    http.expectOne(URL).flush({ error: { code: 'import_geometry', message: 'still metres', details: { fields: [{ path: 'points', message: 'still metres' }] } } }, { status: 400, statusText: 'Bad Request' });
    fixture.detectChanges();
    const unit = Array.from(el.querySelectorAll<HTMLSelectElement>('fieldset select')).at(-1)!;
    unit.value = 'm';
    unit.dispatchEvent(new Event('change'));
    const req = http.expectOne(URL);
    expect(JSON.parse((req.request.body as FormData).get('frame') as string)).toMatchObject({ axes: ['+x', '-y', '-z'], unit: 'm' });
    req.flush(await answerFor(req.request.body as FormData));
    fixture.detectChanges();
    expect(el.textContent).not.toContain('still metres');
    applyButton(el).click();
    expect([...applied[0]!]).toEqual([['points.tieRodInner', [-55, 210, 150]]]);
  });

  it('shows a refused upload (a binary file) in words', () => {
    const { fixture, el, http } = setUp();
    fixture.componentInstance.readText('photo.csv', 'x');
    http.expectOne(URL).flush({ error: { code: 'not_text', message: '"photo.csv" is a binary file (it holds NUL bytes), not CSV or JSON text' } }, { status: 415, statusText: 'Unsupported Media Type' });
    fixture.detectChanges();
    expect(el.querySelector('[role="alert"]')!.textContent).toContain('is a binary file');
    expect(applyButton(el).disabled).toBe(true);
  });
});
