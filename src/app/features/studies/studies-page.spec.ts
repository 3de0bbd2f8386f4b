import { TestBed } from '@angular/core/testing';
import { RouterTestingHarness } from '@angular/router/testing';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { hardpointRows } from '../../../../shared/io/hardpoint-points';
import type { StudyRequest } from '../../../../shared/study/schema';
import { useRoutedPage } from '../../../testing/routed-page';
import { settle } from '../../../testing/settle';
import { chooseOption, clickToggle, matSelect, optionTexts } from '../../../testing/material';
import { StudiesPage } from './studies-page';

const T = '/api/teams/t-tal';
const TEAM = { id: 't-tal', name: 'Tallowmere University Racing', slug: 'tallowmere', roles: ['designer'], permissions: ['team:read', 'study:run'] };
/** A key as the corner document spells it (`upperOuter`, `link3Inner`): never shown to the user. */
const RAW_KEY = /^[a-z]+[A-Z0-9]\w*$/;

describe('StudiesPage: the new study form', () => {
  const bed = useRoutedPage('teams/:teamId/studies', StudiesPage);
  const units = bed.units;

  /** Opens the page for a new study of `query` and answers the team, the list and the corner's requests. */
  async function open(query: string, answerCorner: () => void): Promise<{ root: HTMLElement; harness: RouterTestingHarness }> {
    const harness = await RouterTestingHarness.create();
    await harness.navigateByUrl(`/teams/t-tal/studies?${query}`, StudiesPage);
    await settle();
    bed.backend.expectOne(T).flush(TEAM);
    bed.backend.expectOne(`${T}/studies`).flush({ studies: [] });
    answerCorner();
    await settle();
    harness.detectChanges();
    return { root: harness.routeNativeElement!, harness };
  }

  const openDesign = () => open('axleDesignId=d-front', () => bed.backend.expectOne(`${T}/axle-designs/d-front`).flush({ id: 'd-front', corner: exampleCorners.fsFrontWishbone }));

  /** Types `text` into the input and leaves it (the field commits on its change event, as on blur). */
  function enter(root: HTMLElement, selector: string, text: string): void {
    const input = root.querySelector<HTMLInputElement>(selector);
    if (!input) throw new Error(`no input ${selector}`);
    input.value = text;
    input.dispatchEvent(new Event('input'));
    input.dispatchEvent(new Event('change'));
    TestBed.tick();
  }

  /** Types `text` into the rack-position chip field and leaves it (a chip is added on leaving, as on Enter). */
  function addRack(root: HTMLElement, text: string): void {
    const input = root.querySelector<HTMLInputElement>('input[name="racks"]')!;
    input.value = text;
    input.dispatchEvent(new Event('input'));
    input.dispatchEvent(new FocusEvent('blur'));
    TestBed.tick();
  }

  /** The rack positions shown as chips, as the user reads them. */
  function rackChips(root: HTMLElement): string[] {
    return [...root.querySelectorAll('mat-chip-row')].map((c) => c.textContent.replace('cancel', '').trim());
  }

  async function start(root: HTMLElement, harness: RouterTestingHarness): Promise<void> {
    root.querySelector<HTMLButtonElement>('button[type=submit]')!.click();
    await settle();
    harness.detectChanges();
  }

  it("lists the corner's points by the hardpoint table's names, never by their keys (issue 15 §1)", async () => {
    const { root } = await openDesign();
    const names = optionTexts(matSelect(root, 'mat-select[aria-label="Point of tolerance 1"]'));
    // The same names as the design's hardpoint table, the wheel axis points (which a tolerance may not move) left out.
    const table = hardpointRows(exampleCorners.fsFrontWishbone).filter((r) => r.key.startsWith('points.') && !/wheelCentre|spindle/.test(r.key)).map((r) => r.name);
    expect(names).toEqual(table);
    expect(names).toContain('Upper ball joint');
    expect(names).toContain('Tie rod, inner end (rack)');
    expect(names.filter((n) => RAW_KEY.test(n))).toEqual([]);
    // The chosen point shows its name, not its key.
    expect(matSelect(root, 'mat-select[aria-label="Point of tolerance 1"]').textContent.trim()).toBe('Tie rod, inner end (rack)');
  });

  it("starts a five-link corner's rows on its toe link's body end, and adds rows on points it has (it has no tie rod or wishbone)", async () => {
    const corner = exampleCorners.roadRearFiveLink;
    const { root, harness } = await open('axleDesignId=d-rear', () => bed.backend.expectOne(`${T}/axle-designs/d-rear`).flush({ id: 'd-rear', corner }));
    const toe = hardpointRows(corner).find((r) => r.key === `points.link${corner.toeLink}Inner`)!.name;
    expect(toe).toContain('toe link');
    expect(matSelect(root, 'mat-select[aria-label="Point of tolerance 1"]').textContent.trim()).toBe(toe);
    const names = optionTexts(matSelect(root, 'mat-select[aria-label="Point of tolerance 1"]'));
    [...root.querySelectorAll<HTMLButtonElement>('button')].find((b) => /add a tolerance/i.test(b.textContent))!.click();
    await settle();
    harness.detectChanges();
    const added = matSelect(root, 'mat-select[aria-label="Point of tolerance 2"]').textContent.trim();
    expect(added).not.toBe('');
    expect(names).toContain(added);
  });

  it("names the unsteered rear axle's toe link, for a configuration's axle at the configuration's design revision", async () => {
    const { root } = await open('configurationId=c-1', () => {
      bed.backend.expectOne(`${T}/configurations/c-1`).flush({
        id: 'c-1', front: { designId: 'd-front', name: 'Front', revision: 3 }, rear: { designId: 'd-rear', name: 'Rear', revision: 2 },
      });
      bed.backend.expectOne(`${T}/axle-designs/d-front/revisions/3`).flush({ revision: 3, corner: exampleCorners.fsFrontWishbone });
    });
    chooseOption(matSelect(root, 'mat-select[name="axle"]'), 'Rear');
    await settle();
    bed.backend.expectOne(`${T}/configurations/c-1`).flush({
      id: 'c-1', front: { designId: 'd-front', name: 'Front', revision: 3 }, rear: { designId: 'd-rear', name: 'Rear', revision: 2 },
    });
    await settle();
    bed.backend.expectOne(`${T}/axle-designs/d-rear/revisions/2`).flush({ revision: 2, corner: exampleCorners.fsRearWishbone });
    await settle();
    TestBed.tick();
    const names = optionTexts(matSelect(root, 'mat-select[aria-label="Point of tolerance 1"]'));
    expect(names).toContain('Toe link, inner end (body)');
    expect(names).not.toContain('Tie rod, inner end (rack)');
  });

  it("takes an inch-pound user's lengths in inches and sends millimetres (1 in = 25.4 mm exactly, NIST SP 811, Appendix B)", async () => {
    units.set('imperial');
    const { root, harness } = await openDesign();
    // The unit is shown in the fields and the column heads.
    expect(root.querySelector('table[aria-label="Tolerances"] thead')!.textContent).toContain('± in');
    expect(root.querySelector('input[aria-label="Tolerance 1 (in)"]')!.closest('mat-form-field')!.textContent).toContain('in');
    // The default ±0.5 mm band is shown in inches: 0.5 / 25.4 = 0.019685039 (8 significant figures).
    expect(root.querySelector<HTMLInputElement>('input[aria-label="Tolerance 1 (in)"]')!.value).toBe('0.019685039');
    enter(root, 'input[aria-label="Tolerance 1 (in)"]', '0.1');
    enter(root, 'input[name="camberShimMm"]', '0.02');
    enter(root, 'input[name="toeAdjusterStepMm"]', '0.015');
    addRack(root, '-0.5');
    addRack(root, '0,5');
    expect(root.querySelector<HTMLInputElement>('input[aria-label="Tolerance 1 (in)"]')!.value).toBe('0.1');
    await start(root, harness);
    const req = bed.backend.expectOne({ method: 'POST', url: `${T}/studies` });
    const body = req.request.body as Extract<StudyRequest, { kind: 'tolerance' }>;
    expect(body.tolerances[0]!.plusMinusMm).toBeCloseTo(2.54, 12); // 0.1 × 25.4
    expect(body.setup.camberShimMm).toBeCloseTo(0.508, 12); // 0.02 × 25.4
    expect(body.setup.toeAdjusterStepMm).toBeCloseTo(0.381, 12); // 0.015 × 25.4
    expect(body.analysis.rackMm.map((r) => Number(r.toFixed(9)))).toEqual([0, -12.7, 12.7]);
    req.flush({ study: { id: 's-1' } });
    await settle();
  });

  it("takes a design sweep's bounds in the user's unit and sends millimetres (1 in = 25.4 mm, NIST SP 811)", async () => {
    units.set('imperial');
    const { root, harness } = await openDesign();
    clickToggle(root, 'Design sweep');
    harness.detectChanges();
    expect(root.querySelector('table[aria-label="Swept coordinates"] thead')!.textContent).toContain('From (in)');
    enter(root, 'input[aria-label="From of factor 1 (in)"]', '-0.25');
    enter(root, 'input[aria-label="To of factor 1 (in)"]', '0.75');
    await start(root, harness);
    const req = bed.backend.expectOne({ method: 'POST', url: `${T}/studies` });
    const body = req.request.body as Extract<StudyRequest, { kind: 'sweep' }>;
    expect(body.factors[0]!.fromMm).toBeCloseTo(-6.35, 12); // −0.25 × 25.4
    expect(body.factors[0]!.toMm).toBeCloseTo(19.05, 12); // 0.75 × 25.4
    req.flush({ study: { id: 's-2' } });
    await settle();
  });

  it("refuses a length beside its field in the user's words and unit, and sends nothing", async () => {
    units.set('imperial');
    const { root, harness } = await openDesign();
    // A band is at most 50 mm (the request's limit): 1.969 in to the length's 4 significant figures.
    enter(root, 'input[aria-label="Tolerance 1 (in)"]', '3');
    harness.detectChanges();
    const field = root.querySelector('input[aria-label="Tolerance 1 (in)"]')!.closest('mat-form-field')!;
    expect(field.querySelector('mat-error')!.textContent.trim()).toBe('Tolerance 1 must be at most 1.969 in.');
    expect(field.querySelector('input')!.getAttribute('aria-invalid')).toBe('true');
    enter(root, 'input[name="camberShimMm"]', 'thin');
    harness.detectChanges();
    expect(root.querySelector('input[name="camberShimMm"]')!.closest('mat-form-field')!.querySelector('mat-error')!.textContent.trim()).toBe(
      'Camber shim thickness: "thin" is not a number of in.',
    );
    await start(root, harness);
    bed.backend.expectNone({ method: 'POST', url: `${T}/studies` });
    expect(root.querySelector('.rw-study-form > [role=alert]')!.textContent).toContain('Tolerance 1 must be at most 1.969 in.');
    // Corrected, the band goes (0.5 in = 12.7 mm).
    enter(root, 'input[aria-label="Tolerance 1 (in)"]', '0.5');
    enter(root, 'input[name="camberShimMm"]', '');
    await start(root, harness);
    const req = bed.backend.expectOne({ method: 'POST', url: `${T}/studies` });
    expect((req.request.body as Extract<StudyRequest, { kind: 'tolerance' }>).tolerances[0]!.plusMinusMm).toBeCloseTo(12.7, 12);
    expect((req.request.body as Extract<StudyRequest, { kind: 'tolerance' }>).setup).toEqual({});
    req.flush({ study: { id: 's-3' } });
    await settle();
  });

  it("says when the design's points cannot be loaded, and loads them again on request", async () => {
    const { root, harness } = await open('axleDesignId=d-front', () =>
      bed.backend.expectOne(`${T}/axle-designs/d-front`).flush({ error: { code: 'unavailable', message: 'The server is busy; try again in a moment.' } }, { status: 503, statusText: 'Busy' }),
    );
    const alert = root.querySelector('.rw-study-form > [role=alert]')!;
    expect(alert.textContent).toContain('The points of the design could not be loaded: The server is busy; try again in a moment.');
    [...alert.querySelectorAll('button')].find((b) => b.textContent.trim() === 'Try again')!.click();
    await settle();
    bed.backend.expectOne(`${T}/axle-designs/d-front`).flush({ id: 'd-front', corner: exampleCorners.fsFrontWishbone });
    await settle();
    harness.detectChanges();
    expect(root.querySelector('.rw-study-form > [role=alert]')).toBeNull();
    expect(optionTexts(matSelect(root, 'mat-select[aria-label="Point of tolerance 1"]'))).toContain('Upper ball joint');
  });

  it('takes each rack position as one number: a comma is a decimal comma, never a separator, and what does not read is named beside the field', async () => {
    const { root, harness } = await openDesign();
    harness.detectChanges();
    expect(rackChips(root)).toEqual(['0 mm']);
    const field = root.querySelector('input[name="racks"]')!.closest('mat-form-field')!;
    expect(field.querySelector('mat-hint')!.textContent).toContain('a comma is a decimal comma (2,5 is 2.5)');
    // A decimal comma is part of the number: "2,5" is one position, 2.5 mm.
    addRack(root, '2,5');
    harness.detectChanges();
    expect(rackChips(root)).toEqual(['0 mm', '2.5 mm']);
    // Several at once only with spaces or semicolons between them.
    addRack(root, '-10; 10');
    harness.detectChanges();
    expect(rackChips(root)).toEqual(['0 mm', '2.5 mm', '-10 mm', '10 mm']);
    // "2,5,3" could be 2.5 and 3 or 2 and 5.3: refused in words beside the field, the text kept for correcting.
    addRack(root, '2,5,3');
    harness.detectChanges();
    expect(field.querySelector('mat-error')!.textContent.trim()).toBe(
      'Rack positions: "2,5,3" is not one number of mm. A comma is read as a decimal comma (2,5 is 2.5): enter one position at a time, or part them with spaces or semicolons.',
    );
    expect(field.querySelector('mat-chip-grid')!.getAttribute('aria-invalid')).toBe('true');
    expect(root.querySelector<HTMLInputElement>('input[name="racks"]')!.value).toBe('2,5,3');
    expect(rackChips(root)).toHaveLength(4);
    addRack(root, 'left');
    harness.detectChanges();
    expect(field.querySelector('mat-error')!.textContent.trim()).toBe('Rack positions: "left" is not a number of mm.');
    await start(root, harness);
    bed.backend.expectNone({ method: 'POST', url: `${T}/studies` });
    // The same position twice, or more than the request takes (5), is refused too.
    addRack(root, '10');
    harness.detectChanges();
    expect(field.querySelector('mat-error')!.textContent.trim()).toBe('Rack positions: 10 mm is already in the list.');
    addRack(root, '20 30');
    harness.detectChanges();
    expect(field.querySelector('mat-error')!.textContent.trim()).toBe('Rack positions: at most 5; remove one before adding another.');
    // A chip is removed by its own button, named by its value; correct text clears the message.
    [...root.querySelectorAll<HTMLButtonElement>('button[matChipRemove]')].find((b) => b.getAttribute('aria-label') === 'Remove rack position -10 mm')!.click();
    addRack(root, '5');
    harness.detectChanges();
    expect(field.querySelector('mat-error')).toBeNull();
    expect(rackChips(root)).toEqual(['0 mm', '2.5 mm', '10 mm', '5 mm']);
    await start(root, harness);
    const req = bed.backend.expectOne({ method: 'POST', url: `${T}/studies` });
    expect(req.request.body.analysis.rackMm).toEqual([0, 2.5, 10, 5]);
    req.flush({ study: { id: 's-5' } });
    await settle();
  });

  it('takes and sends millimetres for an SI user', async () => {
    const { root, harness } = await openDesign();
    expect(root.querySelector('table[aria-label="Tolerances"] thead')!.textContent).toContain('± mm');
    enter(root, 'input[aria-label="Tolerance 1 (mm)"]', '0.25');
    await start(root, harness);
    const req = bed.backend.expectOne({ method: 'POST', url: `${T}/studies` });
    expect((req.request.body as Extract<StudyRequest, { kind: 'tolerance' }>).tolerances[0]!.plusMinusMm).toBe(0.25);
    req.flush({ study: { id: 's-4' } });
    await settle();
  });
});
