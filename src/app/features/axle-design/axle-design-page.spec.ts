import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, type TestRequest } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import type { DisplayUnits } from '../../core/api-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { settle } from '../../../testing/settle';
import type { AxleDesign } from '../features-api';
import { AxleDesignPage } from './axle-design-page';

const URL = '/teams/t1/vehicles/v1/axle-designs/d1';
const DESIGN: AxleDesign = {
  id: 'd1',
  vehicleId: 'v1',
  axle: 'front',
  name: 'Front baseline',
  revision: 2,
  status: 'draft',
  corner: exampleCorners.fsFrontWishbone,
  updatedAt: '2026-12-01T10:00:00.000Z',
  updatedByName: 'Dana Quist',
};

/** The revision list's author of revision 2 and the proposals (a test may change them; reset before each). */
let listAuthor = 'Dana Quist';
let proposals: unknown[] = [];

/** Answers what the editor loads: the design, its vehicle, the team, revisions, proposals, rig files and tolerance. */
function answer(r: TestRequest): void {
  const url = r.request.urlWithParams;
  if (url === '/api/teams/t1/axle-designs/d1') r.flush(DESIGN);
  else if (url === '/api/teams/t1/vehicles/v1') r.flush({ id: 'v1', name: 'Car', archived: false, revision: 1, data: null, updatedAt: DESIGN.updatedAt, updatedByName: null });
  else if (url === '/api/teams/t1') r.flush({ id: 't1', name: 'Team', slug: 'team', roles: ['engineer'], permissions: ['team:read', 'design:edit'] });
  else if (url.endsWith('/revisions')) r.flush([{ revision: 2, authorName: listAuthor, createdAt: DESIGN.updatedAt, message: 'raised the rack' }]);
  else if (url.endsWith('/proposals')) r.flush(proposals);
  else if (url.includes('tolerance')) r.flush({ toeDeg: 0.1, camberDeg: 0.1 });
  else r.flush([]);
}

describe('AxleDesignPage results', () => {
  let backend: HttpTestingController;
  const units = signal<DisplayUnits>('si');

  beforeEach(async () => {
    units.set('si');
    listAuthor = 'Dana Quist';
    proposals = [];
    globalThis.localStorage?.clear();
    await TestBed.configureTestingModule({
      providers: [
        provideRouter([{ path: 'teams/:teamId/vehicles/:vehicleId/axle-designs/:designId', component: AxleDesignPage }], withComponentInputBinding()),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: DISPLAY_UNITS, useValue: units },
      ],
    }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });

  async function open() {
    const harness = await RouterTestingHarness.create();
    await harness.navigateByUrl(URL, AxleDesignPage);
    const root = harness.routeNativeElement as HTMLElement;
    await vi.waitFor(
      async () => {
        await settle();
        backend.match(() => true).forEach(answer);
        harness.detectChanges();
        if (!root.querySelector('[data-testid="fit-caption"]')) throw new Error('no results yet');
        // The drawings and their travel fields are a deferred part: loaded on their own time.
        if (!root.querySelector('rw-sweep-settings input')) throw new Error('no travel fields yet');
      },
      { timeout: 30_000, interval: 50 },
    );
    return { harness, root };
  }

  const text = (root: HTMLElement, testId: string) => root.querySelector(`[data-testid="${testId}"]`)?.textContent?.replace(/\s+/g, ' ').trim() ?? '';

  function setTravel(root: HTMLElement, which: 'From' | 'To', value: string): void {
    const input = root.querySelector<HTMLInputElement>(`rw-sweep-settings input[data-sweep="${which.toLowerCase()}"]`)!;
    input.value = value;
    input.dispatchEvent(new Event('change'));
  }

  it("names in its header the revision's author as its revision list does, with who accepted the proposal it came from", async () => {
    // The record's last writer (Dana, who accepted) is not the revision's author (Oskar, who proposed it).
    listAuthor = 'Oskar Brandt';
    proposals = [{ id: 'p1', designId: 'd1', baseRevision: 1, status: 'accepted', message: null, origin: null, authorName: 'Oskar Brandt', createdAt: DESIGN.updatedAt, decidedByName: 'Dana Quist', decidedAt: DESIGN.updatedAt, acceptedRevision: 2 }];
    const { root } = await open();
    expect(text(root, 'revision')).toContain('Revision 2 · draft · by Oskar Brandt (proposal accepted by Dana Quist)');
    const item = root.querySelector('.rw-revision-list li[data-revision="2"]')!.textContent.replace(/\s+/g, ' ');
    expect(item).toContain('Revision 2 · Oskar Brandt');
    expect(item).toContain('— raised the rack');
  });

  it('says the travel range its figures were fitted over, and marks them out of date when a change cannot be solved', async () => {
    const { harness, root } = await open();
    expect(text(root, 'fit-caption')).toBe('Fitted over -25 to 25 mm of travel');
    expect(root.querySelector('[data-testid="results-out-of-date"]')).toBeNull();
    expect(root.querySelector('.rw-out-of-date')).toBeNull();

    // A range far beyond the corner's reach: the engine fails, the figures on screen stay those of ±25 mm and say so.
    setTravel(root, 'From', '-400');
    setTravel(root, 'To', '400');
    await vi.waitFor(
      async () => {
        await settle();
        backend.match(() => true).forEach(answer);
        harness.detectChanges();
        if (!root.querySelector('[data-testid="solve-error"]')) throw new Error('no failure yet');
      },
      { timeout: 30_000, interval: 50 },
    );
    expect(text(root, 'fit-caption')).toBe('Fitted over -25 to 25 mm of travel');
    expect(text(root, 'results-out-of-date')).toContain('the last geometry and travel range that solved (-25 to 25 mm)');
    // Every stage that shows a figure of that solve says it is out of date: the roll steer in intent, the cautions in cost.
    expect(root.querySelector('section[data-stage="intent"] .rw-out-of-date .rw-stale')).not.toBeNull();
    expect(root.querySelector('section[data-stage="cost"] .rw-out-of-date > .rw-stale')).not.toBeNull();
    const error = text(root, 'solve-error');
    expect(error).toMatch(/^The kinematics could not be solved: The linkage cannot reach \d+(\.\d+)? mm of (bump|droop)/);
    // No point keys, no unrounded figures.
    expect(error).not.toMatch(/[a-z][A-Z][a-zA-Z]*–|\d\.\d{5,}/);
  });

  it('names the travel the fit actually spans when the step does not land on the range’s end', async () => {
    const { harness, root } = await open();
    // −25 to 25 mm in 7 mm steps: the sweep's last point is −25 + 7 × 7 = 24 mm (it never passes the end).
    root.querySelector<HTMLInputElement>('rw-sweep-settings input[data-sweep="step"]')!.value = '7';
    root.querySelector<HTMLInputElement>('rw-sweep-settings input[data-sweep="step"]')!.dispatchEvent(new Event('change'));
    await vi.waitFor(
      async () => {
        await settle();
        backend.match(() => true).forEach(answer);
        harness.detectChanges();
        if (text(root, 'fit-caption') === 'Fitted over -25 to 25 mm of travel') throw new Error('not re-solved yet');
      },
      { timeout: 30_000, interval: 50 },
    );
    expect(text(root, 'fit-caption')).toBe('Fitted over -25 to 24 mm of travel');
  });

  it('shows lengths, bump steer and curvature in the user’s inch-pound units', async () => {
    units.set('imperial');
    const { root } = await open();
    // 25 mm = 0.9843 in (1 in = 25.4 mm exactly, NIST SP 811), shown to the length's 4 significant figures.
    expect(text(root, 'fit-caption')).toBe('Fitted over -0.9843 to 0.9843 in of travel');
    const headers = [...root.querySelectorAll('[data-testid="fit-table"] thead th')].map((th) => th.textContent.trim());
    expect(headers[0]).toBe('Rack (in)');
    expect(headers[1]).toContain('deg/in');
    expect(headers[2]).toBe('Curvature (deg/in²)');
    const bumpSteer = Number(text(root, 'bump-steer'));
    units.set('si');
    TestBed.tick();
    const perMetre = Number(root.querySelector('[data-testid="bump-steer"]')!.textContent);
    // deg/in = deg/m × 0.0254, each side rounded to 3 significant figures.
    expect(bumpSteer).toBeCloseTo(perMetre * 0.0254, 3);
  });

  it('walks the job in four titled stages, intent → geometry → proof → cost, each reachable from the section bar', async () => {
    const { harness, root } = await open();
    const stages = [...root.querySelectorAll('section[data-stage]')].map((s) => s.getAttribute('data-stage'));
    expect(stages).toEqual(['intent', 'geometry', 'proof', 'cost']);
    const titles = [...root.querySelectorAll('section[data-stage] > h2')].map((h) => h.textContent.replace(/\s+/g, ' ').trim());
    expect(titles.map((t) => t.split(' ').slice(0, 2).join(' '))).toEqual(['1 Intent', '2 Geometry', '3 Proof', '4 Cost']);
    const nav = [...root.querySelectorAll('[data-testid="stage-nav"] button')];
    expect(nav.map((b) => b.textContent.trim())).toEqual(['1 Intent', '2 Geometry', '3 Proof', '4 Cost', 'Revisions']);
    // Each stage holds its own work: the table in geometry, the fitted figures in proof.
    expect(root.querySelector('section[data-stage="geometry"] rw-hardpoint-table')).not.toBeNull();
    expect(root.querySelector('section[data-stage="proof"] [data-testid="fit-table"]')).not.toBeNull();
    expect(root.querySelector('section[data-stage="intent"] [data-testid="intent-now"]')!.textContent).toContain('roll steer');
    // Choosing a stage moves the keyboard focus to its title.
    (nav[3] as HTMLButtonElement).click();
    harness.detectChanges();
    expect(document.activeElement?.id).toBe('rw-stage-cost');
    await vi.waitFor(
      async () => {
        await settle();
        harness.detectChanges();
        if (!root.querySelector('section[data-stage="cost"] [data-testid="caution-basis"]')?.textContent?.trim()) throw new Error('no cautions yet');
      },
      { timeout: 30_000, interval: 50 },
    );
    // The cost stage says what the cautions were measured over: the range actually solved.
    expect(text(root, 'caution-basis')).toContain('over -25 to 25 mm of travel');
    // Beside the hardpoints, the corner's other inputs (wheel radius, rack stroke and axis, rocker and bar axes) are editable.
    const settings = root.querySelector('section[data-stage="geometry"] rw-corner-settings');
    expect(settings?.querySelector('mat-form-field[data-setting="wheel.radius"] input')).not.toBeNull();
    expect(settings?.querySelector('mat-form-field[data-setting="steering.rackStroke[1]"] input')).not.toBeNull();
  });

  it('draws the pose chosen on the Material travel slider', async () => {
    const { harness, root } = await open();
    await vi.waitFor(
      async () => {
        await settle();
        harness.detectChanges();
        if (!root.querySelector('[data-testid="pose-figures"]')) throw new Error('no drawings yet');
      },
      { timeout: 30_000, interval: 50 },
    );
    expect(text(root, 'pose-figures')).toMatch(/^Drawn at 0 mm of wheel travel/);
    const thumb = root.querySelector<HTMLInputElement>('[data-testid="travel-slider"] input')!;
    thumb.value = '10';
    thumb.dispatchEvent(new Event('input'));
    await vi.waitFor(
      async () => {
        await settle();
        harness.detectChanges();
        if (!/^Drawn at 10(\.0)? mm/.test(text(root, 'pose-figures'))) throw new Error('pose not redrawn yet');
      },
      { timeout: 30_000, interval: 50 },
    );
    expect(text(root, 'pose-figures')).toMatch(/^Drawn at 10(\.0)? mm of wheel travel, rack 0 mm/);
  });
});
