import { TestBed } from '@angular/core/testing';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import type { Vec3 } from '../../../../shared/schema/corner';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { prepareHardpointImport } from '../../../../shared/io/hardpoints';
import { renderComponent } from '../../../testing/render';
import { HardpointImport } from './hardpoint-import';

const corner = exampleCorners.fsFrontWishbone;
const URL = '/api/teams/team-1/axle-designs/design-1/import';

function setUp() {
  TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
  const fixture = renderComponent(HardpointImport, { corner, teamId: 'team-1', designId: 'design-1' });
  const applied: ReadonlyMap<string, Vec3>[] = [];
  fixture.componentInstance.applied.subscribe((m) => applied.push(m));
  return { fixture, el: fixture.nativeElement as HTMLElement, applied, http: TestBed.inject(HttpTestingController) };
}

/** Opens a Material select by its test id and clicks the option with this text. */
function choose(fixture: { detectChanges(): void }, el: HTMLElement, testId: string, option: string): void {
  el.querySelector<HTMLElement>(`[data-testid="${testId}"] .mat-mdc-select-trigger`)!.click();
  fixture.detectChanges();
  const found = Array.from(document.querySelectorAll<HTMLElement>('mat-option')).find((o) => o.textContent.trim() === option);
  if (!found) throw new Error(`no option "${option}"`);
  found.click();
  fixture.detectChanges();
  TestBed.tick();
}

/** Lets the resource take the answer just flushed (it arrives through a promise), then redraws. */
async function answered(fixture: { detectChanges(): void; whenStable(): Promise<unknown> }): Promise<void> {
  await fixture.whenStable();
  TestBed.tick();
  fixture.detectChanges();
}

function applyButton(el: HTMLElement): HTMLButtonElement {
  return Array.from(el.querySelectorAll('button')).find((b) => b.textContent.includes('Apply import'))!;
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
    TestBed.tick();
    expect(el.textContent).toContain('Reading tie-rod.csv');
    const req = http.expectOne(URL);
    expect(req.request.method).toBe('POST');
    const body = req.request.body as FormData;
    expect((body.get('file') as File).name).toBe('tie-rod.csv');
    expect(JSON.parse(body.get('frame') as string)).toEqual({ axes: ['+x', '+y', '+z'], unit: 'mm', originMm: [0, 0, 0], side: 'left' });
    expect(JSON.parse(body.get('corner') as string)).toEqual(corner);
    req.flush(await answerFor(body));
    await answered(fixture);
    expect(applied).toEqual([]);
    expect(el.querySelectorAll('.rw-preview-table tbody tr').length).toBe(1);
    expect(el.querySelectorAll('rw-linkage-views .rw-overlay').length).toBeGreaterThan(0);
    applyButton(el).click();
    expect([...applied[0]!]).toEqual([['points.tieRodInner', [-55, 210, 170.5]]]);
    http.verify();
  });

  it('shows the bad rows the server names and keeps Apply disabled', async () => {
    const { fixture, el, applied, http } = setUp();
    fixture.componentInstance.readText('bad.csv', 'point,x,y,z\nlowerOuter,2,five,130\n');
    TestBed.tick();
    const errors = ['Line 2 (lowerOuter): y "five" is not a number.'];
    http.expectOne(URL).flush({ error: { code: 'import_rows', message: `bad.csv cannot be imported: ${errors[0]}`, details: { errors } } }, { status: 400, statusText: 'Bad Request' });
    await answered(fixture);
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
    TestBed.tick();
    http.expectOne(URL).flush({ error: { code: 'import_geometry', message: 'The imported points break the corner', details: { fields: [{ path: 'points', message: 'The tie rod is too short.' }] } } }, { status: 400, statusText: 'Bad Request' });
    await answered(fixture);
    expect(el.textContent).toContain('The tie rod is too short.');
    choose(fixture, el, 'axis-convention', 'x forward, y right, z down');
    http.expectOne(URL).flush({ error: { code: 'import_geometry', message: 'still metres', details: { fields: [{ path: 'points', message: 'still metres' }] } } }, { status: 400, statusText: 'Bad Request' });
    await answered(fixture);
    choose(fixture, el, 'cad-unit', 'metre');
    const req = http.expectOne(URL);
    expect(JSON.parse((req.request.body as FormData).get('frame') as string)).toMatchObject({ axes: ['+x', '-y', '-z'], unit: 'm' });
    req.flush(await answerFor(req.request.body as FormData));
    await answered(fixture);
    expect(el.textContent).not.toContain('still metres');
    applyButton(el).click();
    expect([...applied[0]!]).toEqual([['points.tieRodInner', [-55, 210, 150]]]);
  });

  it('shows a refused upload (a binary file) in words', async () => {
    const { fixture, el, http } = setUp();
    fixture.componentInstance.readText('photo.csv', 'x');
    TestBed.tick();
    http.expectOne(URL).flush({ error: { code: 'not_text', message: '"photo.csv" is a binary file (it holds NUL bytes), not CSV or JSON text' } }, { status: 415, statusText: 'Unsupported Media Type' });
    await answered(fixture);
    expect(el.querySelector('[role="alert"]')!.textContent).toContain('is a binary file');
    expect(applyButton(el).disabled).toBe(true);
  });

  it('takes the file from the Material button’s chooser, and the side from the Material radios', async () => {
    const { fixture, el, http } = setUp();
    const picker = el.querySelector<HTMLInputElement>('input[type="file"]')!;
    expect(picker.hidden).toBe(true);
    const opened = vi.spyOn(picker, 'click').mockImplementation(() => undefined);
    el.querySelector<HTMLButtonElement>('[data-testid="choose-file"]')!.click();
    expect(opened).toHaveBeenCalledTimes(1);
    // The browser's chooser hands back a file: the same upload as any other way in.
    const file = new File(['point,x,y,z\ntieRodInner,-55,210,160\n'], 'chosen.csv', { type: 'text/csv' });
    Object.defineProperty(picker, 'files', { value: [file], configurable: true });
    picker.dispatchEvent(new Event('change'));
    TestBed.tick();
    fixture.detectChanges();
    expect(el.querySelector('[data-testid="file-name"]')!.textContent).toContain('chosen.csv');
    const first = http.expectOne(URL);
    const sent = (first.request.body as FormData).get('file') as File;
    expect(sent.name).toBe('chosen.csv');
    expect(await sent.text()).toBe(await file.text());
    first.flush(await answerFor(first.request.body as FormData));
    await answered(fixture);
    const right = Array.from(el.querySelectorAll<HTMLElement>('mat-radio-button')).find((r) => r.textContent.includes('Right corner'))!;
    right.querySelector('input')!.click();
    TestBed.tick();
    const again = http.expectOne(URL);
    expect(JSON.parse((again.request.body as FormData).get('frame') as string)).toMatchObject({ side: 'right' });
    http.verify();
  });

  it('names a bad origin in words beside the frame and sends nothing until it is a number', async () => {
    const { fixture, el, http } = setUp();
    fixture.componentInstance.readText('tie-rod.csv', 'point,x,y,z\ntieRodInner,-55,210,160\n');
    TestBed.tick();
    http.expectOne(URL).flush({ corner, changedPoints: [], warnings: [], baseRevision: 3 });
    await answered(fixture);
    const origin = el.querySelectorAll<HTMLInputElement>('.rw-origin input')[2]!;
    origin.value = 'ten';
    origin.dispatchEvent(new Event('change'));
    TestBed.tick();
    fixture.detectChanges();
    http.expectNone(URL);
    expect(el.textContent).toContain('CAD origin along Rollwise z: "ten" is not a number; write it in millimetres, e.g. 12.5 or 12,5.');
    // The frame stays on screen to be put right.
    expect(el.querySelector('fieldset.rw-frame')).not.toBeNull();
    origin.value = '10';
    origin.dispatchEvent(new Event('change'));
    TestBed.tick();
    expect(JSON.parse((http.expectOne(URL).request.body as FormData).get('frame') as string)).toMatchObject({ originMm: [0, 0, 10] });
  });
});
