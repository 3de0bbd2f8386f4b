import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { exampleVehicles } from '../../../../shared/balance/examples';
import { VehiclePage } from './vehicle-page';
import { settle } from '../../../testing/settle';

const URL = '/teams/t-tal/vehicles/v-ember';

function record(revision: number, data: unknown = exampleVehicles.tur26Ember, updatedByName = 'Eli Marsh') {
  return { id: 'v-ember', name: 'TUR-26 Ember', archived: false, revision, data, updatedAt: '2026-12-01T10:00:00.000Z', updatedByName };
}

describe('VehiclePage', () => {
  let backend: HttpTestingController;

  beforeEach(async () => {
    await TestBed.configureTestingModule({
      providers: [provideRouter([{ path: 'teams/:teamId/vehicles/:vehicleId', component: VehiclePage }], withComponentInputBinding()), provideHttpClient(), provideHttpClientTesting()],
    }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  async function open(permissions: string[], updatedByName = 'Eli Marsh') {
    const harness = await RouterTestingHarness.create();
    await harness.navigateByUrl(URL, VehiclePage);
    backend.expectOne('/api/teams/t-tal/vehicles/v-ember').flush(record(4, exampleVehicles.tur26Ember, updatedByName));
    backend.expectOne('/api/teams/t-tal').flush({ id: 't-tal', name: 'Tallowmere University Racing', slug: 'tallowmere', roles: [], permissions });
    await settle();
    backend.expectOne('/api/teams/t-tal/vehicles/v-ember/axle-designs').flush([
      { id: 'd1', axle: 'front', name: 'Front baseline', revision: 1, status: 'draft', updatedAt: '2026-12-01T10:00:00.000Z' },
      { id: 'd2', axle: 'rear', name: 'Rear baseline', revision: 2, status: 'approved', updatedAt: '2026-12-01T10:00:00.000Z' },
    ]);
    backend.expectOne('/api/teams/t-tal/vehicles/v-ember/revisions').flush([
      { revision: 4, message: 'Stiffer rear springs for the autocross', authorName: 'Eli Marsh', createdAt: '2026-12-01T10:00:00.000Z' },
      { revision: 3, message: 'Tyre data from the rig', authorName: 'Dana Quist', createdAt: '2026-11-30T10:00:00.000Z' },
    ]);
    await settle();
    harness.detectChanges();
    return { harness, root: harness.routeNativeElement as HTMLElement };
  }

  function field(root: HTMLElement, label: string): HTMLInputElement {
    const formField = [...root.querySelectorAll('mat-form-field')].find((f) => f.querySelector('mat-label')?.textContent?.trim() === label)!;
    return formField.querySelector('input')!;
  }

  function unitOf(root: HTMLElement, label: string): string {
    const formField = [...root.querySelectorAll('mat-form-field')].find((f) => f.querySelector('mat-label')?.textContent?.trim() === label)!;
    return formField.querySelector('.rw-unit')!.textContent.trim();
  }

  it('shows the axle designs by axle and the stored values with their SI units', async () => {
    const { root } = await open(['team:read', 'vehicle:edit']);
    const tables = [...root.querySelectorAll('.rw-design-table')];
    expect(tables.map((t) => t.querySelector('caption')!.textContent.trim())).toEqual(['Front axle', 'Rear axle']);
    expect(tables[1]!.textContent).toContain('Rear baseline');
    expect(Number(field(root, 'Total mass').value)).toBe(exampleVehicles.tur26Ember.massKg);
    expect(unitOf(root, 'Wheelbase')).toBe('mm');
    expect(root.textContent).toContain('saved by Eli Marsh');
  });

  it('shows each revision with its author and the author\'s own note; the header names the revision\'s author as the list does', async () => {
    // A record whose last writer is not the revision's author (an older server wrote who accepted a proposal there).
    const { root } = await open(['team:read'], 'Dana Quist');
    const items = [...root.querySelectorAll('.rw-revision-list li')].map((li) => li.textContent.replace(/\s+/g, ' ').trim());
    expect(items[0]).toContain('Revision 4 · Eli Marsh');
    expect(items[0]).toContain('— Stiffer rear springs for the autocross');
    expect(items[1]).toContain('Revision 3 · Dana Quist');
    expect(items[1]).toContain('— Tyre data from the rig');
    const header = root.querySelector('.rw-revision')!.textContent;
    expect(header).toContain('Revision 4');
    expect(header).toContain('by Eli Marsh');
    expect(header).not.toContain('Dana Quist');
  });

  it('shows inch/pound values on request and saves them converted back to SI', async () => {
    const { harness, root } = await open(['team:read', 'vehicle:edit']);
    const toggle = [...root.querySelectorAll('mat-button-toggle button')].find((b) => b.textContent?.includes('Inch'))! as HTMLButtonElement;
    toggle.click();
    await vi.waitFor(() => {
      harness.detectChanges();
      if (unitOf(root, 'Wheelbase') !== 'in') throw new Error('not converted yet');
      // The unit converter (mathjs) loads lazily; on a busy 2-core machine that takes over a second.
    }, { timeout: 10_000, interval: 50 });
    // 1 in = 25.4 mm exactly.
    expect(Number(field(root, 'Wheelbase').value)).toBeCloseTo(exampleVehicles.tur26Ember.wheelbaseMm / 25.4, 3);
    const wheelbase = field(root, 'Wheelbase');
    wheelbase.value = '62';
    wheelbase.dispatchEvent(new Event('input'));
    harness.detectChanges();
    (root.querySelector('button[type="submit"]') as HTMLButtonElement).click();
    const req = backend.expectOne('/api/teams/t-tal/vehicles/v-ember/data');
    expect(req.request.method).toBe('PUT');
    expect(req.request.body.baseRevision).toBe(4);
    expect(req.request.body.data.wheelbaseMm).toBeCloseTo(62 * 25.4, 6);
    expect(req.request.body.data.massKg).toBeCloseTo(exampleVehicles.tur26Ember.massKg, 3);
    req.flush(record(5, req.request.body.data));
    await settle();
    backend.expectOne('/api/teams/t-tal/vehicles/v-ember/revisions').flush([]);
    harness.detectChanges();
    expect(root.textContent).toContain('Saved as revision 5.');
  });

  it('shows and takes the tyre load sensitivity b per pound-force for an inch/pound user, and stores it per newton', async () => {
    // NIST SP 811 (2008), Appendix B: 1 lbf = 4.4482216152605 N (0.45359237 kg × 9.80665 m/s², exact by definition),
    // so b per lbf = b per N × 4.4482216152605 (Cα = a·Fz − b·Fz² with Fz in lbf).
    const LBF_N = 4.4482216152605;
    const { harness, root } = await open(['team:read', 'vehicle:edit']);
    const b = () => root.querySelector('mat-form-field[data-path="front.tyre.loadSensitivity.b"]')!;
    expect(b().querySelector('.rw-unit')!.textContent.trim()).toBe('1/(deg·N)');
    const toggle = [...root.querySelectorAll('mat-button-toggle button')].find((x) => x.textContent?.includes('Inch'))! as HTMLButtonElement;
    toggle.click();
    await vi.waitFor(() => {
      harness.detectChanges();
      if (b().querySelector('.rw-unit')!.textContent.trim() !== '1/(deg·lbf)') throw new Error('not converted yet');
    }, { timeout: 10_000, interval: 50 });
    const shown = Number(b().querySelector('input')!.value);
    expect(shown / (exampleVehicles.tur26Ember.front.tyre.loadSensitivity!.b * LBF_N)).toBeCloseTo(1, 5);
    typeInto(root, 'front.tyre.loadSensitivity.b', '0,001');
    harness.detectChanges();
    // 1 of 0..4.448 per lbf (0..1 per N) is possible; 5 per lbf is not, and the message says so in the user's unit.
    typeInto(root, 'rear.tyre.loadSensitivity.b', '5');
    harness.detectChanges();
    (root.querySelector('button[type="submit"]') as HTMLButtonElement).click();
    harness.detectChanges();
    expect(errorOf(root, 'rear.tyre.loadSensitivity.b')).toBe('5 is outside 0 to 4.448 1/(deg·lbf).');
    backend.expectNone('/api/teams/t-tal/vehicles/v-ember/data');
    typeInto(root, 'rear.tyre.loadSensitivity.b', '0.003');
    harness.detectChanges();
    // Possible but unusual (typical 0 to 5e-4 per N, shared/schema/ranges.ts): the note is in the form's units too.
    expect(root.querySelector('mat-form-field[data-path="rear.tyre.loadSensitivity.b"] .rw-unusual')!.textContent.trim()).toBe(
      'Unusual: 0.003 1/(deg·lbf) is unusual for a load sensitivity b (typical 0 to 0.002224 1/(deg·lbf))',
    );
    typeInto(root, 'rear.tyre.loadSensitivity.b', '0.0009');
    harness.detectChanges();
    (root.querySelector('button[type="submit"]') as HTMLButtonElement).click();
    const req = backend.expectOne('/api/teams/t-tal/vehicles/v-ember/data');
    expect(req.request.body.data.front.tyre.loadSensitivity.b / (0.001 / LBF_N)).toBeCloseTo(1, 12);
    expect(req.request.body.data.rear.tyre.loadSensitivity.b / (0.0009 / LBF_N)).toBeCloseTo(1, 12);
    req.flush(record(5, req.request.body.data));
    await settle();
    backend.expectOne('/api/teams/t-tal/vehicles/v-ember/revisions').flush([]);
  });

  it('names a bad entry and saves nothing', async () => {
    const { harness, root } = await open(['team:read', 'vehicle:edit']);
    const cg = field(root, 'CG behind the front axle');
    cg.value = '9999';
    cg.dispatchEvent(new Event('input'));
    const mass = field(root, 'Total mass');
    mass.value = 'heavy';
    mass.dispatchEvent(new Event('input'));
    harness.detectChanges();
    (root.querySelector('button[type="submit"]') as HTMLButtonElement).click();
    harness.detectChanges();
    expect(root.textContent).toContain('"heavy" is not a number');
    expect(root.textContent).toContain('nothing was saved');
    mass.value = String(exampleVehicles.tur26Ember.massKg);
    mass.dispatchEvent(new Event('input'));
    (root.querySelector('button[type="submit"]') as HTMLButtonElement).click();
    harness.detectChanges();
    // The schema's own rule (CG ahead of the rear axle) is shown beside its field, in words, never by its key.
    const cgField = root.querySelector('mat-form-field[data-path="cgToFrontAxleMm"]')!;
    expect(cgField.querySelector('mat-error')!.textContent.trim()).toBe('Must be less than the wheelbase.');
    expect(root.textContent).not.toContain('wheelbaseMm');
    backend.expectNone('/api/teams/t-tal/vehicles/v-ember/data');
  });

  it('shows an unusual entry beside its field in plain words, and still saves it', async () => {
    const { harness, root } = await open(['team:read', 'vehicle:edit']);
    const hintOf = (label: string) =>
      [...root.querySelectorAll('mat-form-field')].find((f) => f.querySelector('mat-label')?.textContent?.trim() === label)!.querySelector('.rw-unusual')?.textContent?.trim();
    expect(hintOf('Total mass')).toBeUndefined();
    const mass = field(root, 'Total mass');
    mass.value = '5000';
    mass.dispatchEvent(new Event('input'));
    harness.detectChanges();
    // Typical band from shared/schema/ranges.ts (common practice, from memory).
    expect(hintOf('Total mass')).toBe('Unusual: 5000 kg is unusual for a vehicle mass (typical 150 to 3500 kg)');
    (root.querySelector('button[type="submit"]') as HTMLButtonElement).click();
    const req = backend.expectOne('/api/teams/t-tal/vehicles/v-ember/data');
    expect(req.request.body.data.massKg).toBe(5000);
    req.flush(record(5, req.request.body.data));
    await settle();
    backend.expectOne('/api/teams/t-tal/vehicles/v-ember/revisions').flush([]);
  });

  it('gives a viewer the values read only', async () => {
    const { root } = await open(['team:read']);
    expect(field(root, 'Total mass').disabled).toBe(true);
    expect(root.querySelector('button[type="submit"]')).toBeNull();
    expect(root.textContent).toContain('Read only');
  });

  function typeInto(root: HTMLElement, path: string, value: string) {
    const input = root.querySelector(`mat-form-field[data-path="${path}"] input`) as HTMLInputElement;
    input.value = value;
    input.dispatchEvent(new Event('input'));
  }

  function errorOf(root: HTMLElement, path: string): string | undefined {
    return root.querySelector(`mat-form-field[data-path="${path}"] mat-error`)?.textContent?.trim();
  }

  it('offers every input of the model: the tyre load sensitivity, relaxation length, damper and mechanical trail are there and saved', async () => {
    const { harness, root } = await open(['team:read', 'vehicle:edit']);
    const ember = exampleVehicles.tur26Ember;
    const a = root.querySelector('mat-form-field[data-path="front.tyre.loadSensitivity.a"] input') as HTMLInputElement;
    expect(Number(a.value)).toBe(ember.front.tyre.loadSensitivity!.a);
    expect(a.disabled).toBe(false);
    for (const path of ['front.tyre.loadSensitivity.b', 'rear.tyre.relaxationLengthMm', 'rear.damper.wheelRateNsPerMm', 'front.mechanicalTrailMm', 'front.tyre.axleComplianceDegPerG']) {
      expect(root.querySelector(`mat-form-field[data-path="${path}"] input`), path).not.toBeNull();
    }
    typeInto(root, 'rear.tyre.loadSensitivity.b', '0.0003');
    harness.detectChanges();
    (root.querySelector('button[type="submit"]') as HTMLButtonElement).click();
    const req = backend.expectOne('/api/teams/t-tal/vehicles/v-ember/data');
    expect(req.request.body.data.rear.tyre.loadSensitivity).toEqual({ a: ember.rear.tyre.loadSensitivity!.a, b: 0.0003 });
    req.flush(record(5, req.request.body.data));
    await settle();
    backend.expectOne('/api/teams/t-tal/vehicles/v-ember/revisions').flush([]);
  });

  it('gives the anti-roll bar by its geometry when chosen: its fields become editable and the roll rate is dropped on save', async () => {
    const { harness, root } = await open(['team:read', 'vehicle:edit']);
    expect(root.querySelector('mat-form-field[data-path="rear.antiRollBar.outerDiameterMm"]')).toBeNull();
    const fieldset = [...root.querySelectorAll('fieldset')].find((f) => f.querySelector('legend')?.textContent?.trim() === 'Rear axle')!;
    ([...fieldset.querySelectorAll('mat-button-toggle button')].find((b) => b.textContent?.includes('Its geometry')) as HTMLButtonElement).click();
    await settle();
    harness.detectChanges();
    expect(root.querySelector('mat-form-field[data-path="rear.antiRollBar.rollRateNmPerDeg"]')).toBeNull();
    // Saving with the geometry half given names each missing entry beside its field.
    typeInto(root, 'rear.antiRollBar.outerDiameterMm', '16');
    harness.detectChanges();
    (root.querySelector('button[type="submit"]') as HTMLButtonElement).click();
    harness.detectChanges();
    expect(errorOf(root, 'rear.antiRollBar.activeLengthMm')).toContain('Needed here');
    expect(root.textContent).not.toMatch(/activeLengthMm|Invalid input/);
    backend.expectNone('/api/teams/t-tal/vehicles/v-ember/data');
    typeInto(root, 'rear.antiRollBar.activeLengthMm', '380');
    typeInto(root, 'rear.antiRollBar.twistRadPerM', '4.2');
    harness.detectChanges();
    (root.querySelector('button[type="submit"]') as HTMLButtonElement).click();
    const req = backend.expectOne('/api/teams/t-tal/vehicles/v-ember/data');
    expect(req.request.body.data.rear.antiRollBar).toEqual({ outerDiameterMm: 16, activeLengthMm: 380, twistRadPerM: 4.2 });
    req.flush(record(5, req.request.body.data));
    await settle();
    backend.expectOne('/api/teams/t-tal/vehicles/v-ember/revisions').flush([]);
  });

  it('says beside ε, roll camber and the bar lever that the balance view takes them from the kinematics', async () => {
    const { root } = await open(['team:read', 'vehicle:edit']);
    const hint = (path: string) => root.querySelector(`mat-form-field[data-path="${path}"] .rw-linked`)?.textContent?.trim();
    expect(hint('front.rollSteerCoefficient')).toContain("axle design's kinematics instead");
    expect(hint('rear.rollCamberDegPerDeg')).toContain("axle design's kinematics instead");
    expect(hint('rear.rollCentreHeightMm')).toContain("axle design's kinematics instead");
    expect(hint('massKg')).toBeUndefined();
  });

  it('names every wrong entry at once beside its field, in the user\'s words and units', async () => {
    const { harness, root } = await open(['team:read', 'vehicle:edit']);
    typeInto(root, 'front.rollSteerCoefficient', '5');
    typeInto(root, 'rear.trackMm', '12000');
    typeInto(root, 'massKg', '0');
    harness.detectChanges();
    (root.querySelector('button[type="submit"]') as HTMLButtonElement).click();
    harness.detectChanges();
    // Possible ranges: shared/schema/ranges.ts (ε within ±1 deg/deg, track 300 to 4000 mm, mass 20 to 50 000 kg).
    expect(errorOf(root, 'front.rollSteerCoefficient')).toBe('5 is outside −1 to 1 deg/deg.');
    expect(errorOf(root, 'rear.trackMm')).toBe('12000 is outside 300 to 4000 mm.');
    expect(errorOf(root, 'massKg')).toBe('0 is outside 20 to 50000 kg.');
    backend.expectNone('/api/teams/t-tal/vehicles/v-ember/data');
  });
});
