import { signal } from '@angular/core';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, TestRequest } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { exampleVehicles } from '../../../../shared/balance/examples';
import { analyseConfiguration } from '../../../../shared/configuration/analyse';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import type { Caution } from '../../../../shared/cautions/cautions';
import type { AnalysisRequest, CornerAnalysis } from '../../workers/analysis-types';
import { KinematicsClient } from '../../workers/kinematics-client';
import { ConfigurationPage } from './configuration-page';
import type { Configuration, ConfigurationResults, GatesAnswer } from './configurations-api';
import { Answer, refuse, serve } from './spec-backend';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import type { DisplayUnits } from '../../core/api-types';

const TEAM = '/api/teams/t-tal';
const C = `${TEAM}/configurations/c1`;

// Results as the server computes them: the same shared function, called directly (trackProfile smooth-circuit: ±25 mm).
const RESULTS: ConfigurationResults = analyseConfiguration({
  vehicle: exampleVehicles.tur26Ember,
  frontCorner: exampleCorners.fsFrontWishbone,
  rearCorner: exampleCorners.fsRearWishbone,
  trackProfile: 'smooth-circuit',
});

function config(over: Partial<Configuration> = {}): Configuration {
  return {
    id: 'c1',
    name: 'Ember baseline',
    status: 'draft',
    revision: 2,
    archived: false,
    vehicle: { id: 'v-ember', name: 'TUR-26 Ember', revision: 1 },
    front: { designId: 'd-f', name: 'Front baseline', revision: 1 },
    rear: { designId: 'd-r', name: 'Rear baseline', revision: 3 },
    trackProfile: 'smooth-circuit',
    updatedAt: '2026-12-01T10:00:00.000Z',
    updatedByName: 'Dana Quist',
    createdAt: '2026-12-01T09:00:00.000Z',
    ...over,
  };
}

const BUMP_CAUTION: Caution = {
  code: 'bump-toe-change',
  level: 'warning',
  message: 'Toe changes by 0.2 deg over a 10 mm single-wheel bump',
  value: 0.2,
  threshold: 0.15,
  unit: 'deg',
  basis: 'product default',
};

/** GET …/gates: the Critical items the server measured and the rig evidence per axle. */
function gates(critical: GatesAnswer['critical'] = []): GatesAnswer {
  return {
    revision: 2,
    critical,
    rig: { tolerance: { toeDeg: 0.1, camberDeg: 0.25, isDefault: true }, axles: [] },
    acknowledgements: [],
    waivers: [],
  };
}

/** The kinematics worker's answer for the cautions (the worker itself has its own specs). */
class FakeEngine {
  readonly requests: AnalysisRequest[] = [];
  analyse(request: AnalysisRequest): Promise<CornerAnalysis> {
    this.requests.push(request);
    const list = request.cautions?.axle === 'rear' ? [BUMP_CAUTION] : [];
    return Promise.resolve({ cautions: { ok: true, list, profile: {}, racksMm: [0], vehicleUsed: true, vehicleNote: null } } as unknown as CornerAnalysis);
  }
}

function table(c: Configuration, permissions: string[], extra: Record<string, Answer> = {}): Record<string, Answer> {
  return {
    [`GET ${TEAM}`]: { id: 't-tal', name: 'Tallowmere University Racing', slug: 'tallowmere', roles: [], permissions },
    [`GET ${C}`]: c,
    [`GET ${C}/results`]: { revision: c.revision, refs: {}, engineVersion: '1.4.0', results: RESULTS },
    [`GET ${TEAM}/vehicles/v-ember/revisions/1`]: { revision: 1, name: 'TUR-26 Ember', data: exampleVehicles.tur26Ember },
    [`GET ${TEAM}/axle-designs/d-f/revisions/1`]: { revision: 1, name: 'Front baseline', corner: exampleCorners.fsFrontWishbone },
    [`GET ${TEAM}/axle-designs/d-r/revisions/3`]: { revision: 3, name: 'Rear baseline', corner: exampleCorners.fsRearWishbone },
    [`GET ${C}/history`]: [],
    [`GET ${TEAM}/studies`]: { attachments: [] },
    [`GET ${C}/revisions`]: [
      { revision: 2, name: c.name, vehicleId: 'v-ember', vehicleRevision: 1, frontDesignId: 'd-f', frontDesignRevision: 1, rearDesignId: 'd-r', rearDesignRevision: 3, trackProfile: 'smooth-circuit', message: 'rear moved', authorName: 'Dana Quist', createdAt: '2026-12-01T10:00:00.000Z' },
      { revision: 1, name: c.name, vehicleId: 'v-ember', vehicleRevision: 1, frontDesignId: 'd-f', frontDesignRevision: 1, rearDesignId: 'd-r', rearDesignRevision: 2, trackProfile: 'smooth-circuit', message: null, authorName: 'Dana Quist', createdAt: '2026-12-01T09:00:00.000Z' },
    ],
    [`GET ${C}/approvals`]: [],
    [`GET ${TEAM}/configurations`]: [c],
    [`GET ${TEAM}/vehicles/v-ember/axle-designs`]: [
      { id: 'd-f', axle: 'front', name: 'Front baseline', revision: 1, status: 'draft', updatedAt: '' },
      { id: 'd-r', axle: 'rear', name: 'Rear baseline', revision: 3, status: 'draft', updatedAt: '' },
    ],
    [`GET ${C}/comments`]: [],
    // The embedded rig panel (src/app/features/rig): nothing measured yet.
    [`GET ${TEAM}/rig-measurements`]: [],
    [`GET ${TEAM}/rig-tolerance`]: { toeDeg: 0.1, camberDeg: 0.25, isDefault: true, updatedByName: null, updatedAt: null },
    ...extra,
  };
}

describe('ConfigurationPage', () => {
  let backend: HttpTestingController;
  let engine: FakeEngine;
  /** The signed-in user's unit system (account setting). */
  let units: ReturnType<typeof signal<DisplayUnits>>;

  beforeEach(async () => {
    engine = new FakeEngine();
    units = signal<DisplayUnits>('si');
    TestBed.configureTestingModule({
      providers: [
        provideRouter([{ path: 'teams/:teamId/configurations/:configurationId', component: ConfigurationPage }], withComponentInputBinding()),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: DISPLAY_UNITS, useValue: units },
      ],
    });
    TestBed.overrideComponent(ConfigurationPage, { set: { providers: [{ provide: KinematicsClient, useValue: engine }] } });
    await TestBed.compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });
  afterEach(() => backend.verify());

  async function open(c: Configuration, permissions: string[], extra: Record<string, Answer> = {}) {
    const harness = await RouterTestingHarness.create();
    await harness.navigateByUrl('/teams/t-tal/configurations/c1', ConfigurationPage);
    const answers = table(c, permissions, extra);
    // Parts of the page ask for their data once the page around them has rendered (the rig panel, the
    // approval snapshot): answer, render, and answer again until a render asks for nothing new.
    for (let round = 0; round < 6; round++) {
      const seen = await serve(backend, answers);
      harness.detectChanges();
      if (seen.length === 0 && round > 0) break;
    }
    return { harness, root: harness.routeNativeElement as HTMLElement, answers };
  }

  const buttons = (root: HTMLElement) => [...root.querySelectorAll('.rw-review button[data-action]')].map((b) => b.textContent.trim());

  it('shows what the configuration pins and the engines’ figures, with the profile’s cautions beside them', async () => {
    const { root } = await open(config(), ['team:read']);
    const inputs = root.querySelector('[data-testid="inputs"]')!.textContent;
    expect(inputs).toContain('TUR-26 Ember, revision 1');
    expect(inputs).toContain('Rear baseline, revision 3');
    expect(inputs).toContain('Smooth circuit');
    const figures = [...root.querySelectorAll('[data-testid="key-figures"] tbody tr')].map((r) => [...r.children].map((x) => x.textContent.trim()));
    const row = (label: string) => figures.find((f) => f[0] === label)!;
    // The figures are the engine's own numbers (computed directly above), rounded for the table.
    expect(row('Roll steer ε, rear')[1]).toBe(RESULTS.balance.kinematicsLink.rear.used.rollSteerCoefficient.toFixed(4));
    expect(row('Understeer-gradient change from roll steer')[1]).toBe(RESULTS.balance.understeerBudget.rollSteer.toFixed(3));
    expect(row('Understeer gradient K')[1]).toBe(RESULTS.balance.understeerBudget.total.toFixed(3));
    expect(row('Bump steer, front')[1]).toBe(RESULTS.bumpSteer.front.bumpSteerDegPerM.toFixed(3));
    // Cautions measured for the configuration's own corners, profile and vehicle data.
    expect(engine.requests.map((r) => [r.cautions?.axle, r.cautions?.trackProfile, r.travel.from, r.travel.to])).toEqual([
      ['front', { id: 'smooth-circuit' }, -25, 25],
      ['rear', { id: 'smooth-circuit' }, -25, 25],
    ]);
    expect(engine.requests[1]!.corner).toEqual(exampleCorners.fsRearWishbone);
    const rear = root.querySelector('.rw-axle-cautions[data-axle="rear"]')!;
    expect(rear.querySelector('[data-code="bump-toe-change"]')!.textContent).toContain('Warning');
    expect(root.querySelector('rw-safety-caution')!.textContent).toContain('Verify on a kinematics rig');
    expect(root.querySelector('[data-testid="no-approval"]')!.textContent).toContain('Not signed off yet');
    expect(root.querySelector('[data-testid="approval"]')).toBeNull();
    // A viewer has no review steps, cannot revise or archive, and cannot comment.
    expect(buttons(root)).toEqual([]);
    expect(root.querySelector('.rw-review button')).toBeNull();
    expect(root.querySelector('rw-review-comments form')).toBeNull();
  });

  it('shows the key figures and the speed axis in the user’s inch-pound units, to the same resolution', async () => {
    units.set('imperial');
    const { root } = await open(config(), ['team:read']);
    const figures = [...root.querySelectorAll('[data-testid="key-figures"] tbody tr')].map((r) => [...r.children].map((x) => x.textContent.trim()));
    const row = (label: string) => figures.find((f) => f[0] === label)!;
    // 1 in = 25.4 mm and 1 mi = 1.609344 km exactly (by definition): deg/m × 0.0254 = deg/in, km/h ÷ 1.609344 = mph.
    expect(row('Bump steer, front').slice(1, 3)).toEqual([(RESULTS.bumpSteer.front.bumpSteerDegPerM * 0.0254).toFixed(5), 'deg/in']);
    expect(row('Camber gain, rear').slice(1, 3)).toEqual([(RESULTS.bumpSteer.rear.camberGainDegPerM * 0.0254).toFixed(4), 'deg/in']);
    expect(row('Understeer gradient K').slice(1, 3)).toEqual([RESULTS.balance.understeerBudget.total.toFixed(3), 'deg/g']);
    const speed = row('Characteristic speed');
    expect(speed[2]).toBe('mph');
    expect(speed[1]).toBe(((RESULTS.balance.characteristicSpeedKph ?? Number.NaN) / 1.609344).toFixed(1));
    expect(root.querySelector('rw-line-chart .rw-axis-label-x')!.textContent.trim()).toBe('Speed (mph)');
    // The track profile it pins, in inch/pound too: smooth circuit travel ±25 mm is ±0.9843 in.
    expect(root.querySelector('[data-testid="inputs"]')!.textContent).toContain('travel -0.9843 to 0.9843 in');
  });

  it('offers each role only its own review steps for the status', async () => {
    const designer = ['team:read', 'vehicle:manage', 'review:submit', 'review:comment'];
    expect(buttons((await open(config({ status: 'draft' }), designer)).root)).toEqual(['Submit for review']);
  });

  it.each([
    ['in_review', ['team:read', 'vehicle:manage', 'review:submit'], ['Withdraw from review']],
    ['in_review', ['team:read', 'review:decide'], ['Sign off', 'Return for rework']],
    ['draft', ['team:read', 'review:decide'], []],
    ['approved', ['team:read', 'review:decide'], ['Release to build']],
    ['approved', ['team:read', 'review:submit'], []],
    ['released', ['team:read', 'review:decide'], ['Mark validated']],
    ['changes_requested', ['team:read', 'review:submit'], []],
  ] as const)('status %s with %j offers %j', async (status, permissions, expected) => {
    const answers = status === 'approved' || status === 'released' ? { [`GET ${C}/approvals`]: [] } : {};
    expect(buttons((await open(config({ status }), [...permissions], answers)).root)).toEqual([...expected]);
  });

  it('a change request needs a message; it is sent with the revision looked at, and a refusal is shown', async () => {
    const { harness, root } = await open(config({ status: 'in_review' }), ['team:read', 'review:decide', 'review:comment']);
    const press = (label: string) => [...root.querySelectorAll<HTMLButtonElement>('.rw-review button')].find((b) => b.textContent.trim() === label)!.click();
    press('Return for rework');
    harness.detectChanges();
    expect(root.querySelector('.rw-review [role="alert"]')!.textContent).toContain('Say what needs rework');
    backend.expectNone(`${C}/request-changes`);
    const box = root.querySelector('textarea[name="stepMessage"]') as HTMLTextAreaElement;
    box.value = 'Raise the rear toe link';
    box.dispatchEvent(new Event('input'));
    press('Return for rework');
    let body: unknown;
    await serve(backend, {
      [`POST ${C}/request-changes`]: (req: TestRequest) => {
        body = req.request.body;
        return config({ status: 'changes_requested' });
      },
      [`GET ${C}/history`]: [{ revision: 2, fromStatus: 'in_review', toStatus: 'changes_requested', message: 'Raise the rear toe link', actorName: 'Ravi Osei', createdAt: '2026-12-01T11:00:00.000Z' }],
      [`GET ${C}/revisions`]: [],
      [`GET ${C}/approvals`]: [],
      [`GET ${TEAM}/configurations`]: [],
      [`GET ${TEAM}/vehicles/v-ember/axle-designs`]: [],
    });
    harness.detectChanges();
    expect(body).toEqual({ revision: 2, message: 'Raise the rear toe link' });
    expect(root.querySelector('rw-status-chip')!.textContent).toContain('Returned for rework');
    expect(root.querySelector('.rw-history')!.textContent).toContain('In review → Returned for rework');
    expect(buttons(root)).toEqual([]);
  });

  it('shows the server’s own-work refusal of an approval', async () => {
    const { harness, root } = await open(config({ status: 'in_review' }), ['team:read', 'review:decide']);
    [...root.querySelectorAll<HTMLButtonElement>('.rw-review button')].find((b) => b.textContent.trim() === 'Sign off')!.click();
    await serve(backend, {
      [`GET ${C}/gates`]: gates(),
      [`POST ${C}/approve`]: refuse(403, 'own_revision', 'You authored this configuration or a revision it uses; another reviewer must decide'),
    });
    harness.detectChanges();
    expect(root.querySelector('.rw-review [role="alert"]')!.textContent).toContain('another reviewer must decide');
    expect(root.querySelector('rw-status-chip')!.textContent).toContain('In review');
  });

  it('a sign-off with a Critical caution asks for a written reason and sends it with the step', async () => {
    const { harness, root } = await open(config({ status: 'in_review' }), ['team:read', 'review:decide']);
    [...root.querySelectorAll<HTMLButtonElement>('.rw-review button')].find((b) => b.textContent.trim() === 'Sign off')!.click();
    const critical = { axle: 'rear' as const, code: 'rear-roll-oversteer', message: 'Rear roll steer of 0.035 deg/deg steers the rear wheels out of the turn', value: 0.035, threshold: 0.03, unit: 'deg/deg' };
    await serve(backend, { [`GET ${C}/gates`]: gates([critical]) });
    harness.detectChanges();
    const dialog = document.querySelector('rw-review-gate-dialog') as HTMLElement;
    expect(dialog.textContent).toContain('Rear axle: Rear roll steer of 0.035 deg/deg');
    const confirm = [...dialog.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent.trim() === 'Sign off')!;
    expect(confirm.disabled).toBe(true);
    backend.expectNone(`${C}/approve`);
    const reason = dialog.querySelector('textarea') as HTMLTextAreaElement;
    reason.value = 'Wanted: the rear is set to loosen mid-corner on the tight autocross';
    reason.dispatchEvent(new Event('input'));
    harness.detectChanges();
    expect(confirm.disabled).toBe(false);
    confirm.click();
    let body: unknown;
    await serve(backend, {
      [`POST ${C}/approve`]: (req: TestRequest) => {
        body = req.request.body;
        return config({ status: 'approved' });
      },
      [`GET ${C}/history`]: [],
      [`GET ${C}/revisions`]: [],
      [`GET ${C}/approvals`]: [],
      [`GET ${TEAM}/configurations`]: [],
      [`GET ${TEAM}/vehicles/v-ember/axle-designs`]: [],
    });
    harness.detectChanges();
    expect(body).toEqual({ revision: 2, acknowledgements: [{ axle: 'rear', code: 'rear-roll-oversteer', reason: 'Wanted: the rear is set to loosen mid-corner on the tight autocross' }] });
    expect(root.querySelector('rw-status-chip')!.textContent).toContain('Signed off');
  });

  it('an approved configuration shows its frozen figures beside a recompute with the current engine', async () => {
    const frozen = structuredClone(RESULTS) as ConfigurationResults & { balance: { understeerBudget: { total: number } } };
    frozen.balance.understeerBudget.total += 0.05;
    const { root } = await open(config({ status: 'approved' }), ['team:read'], {
      [`GET ${C}/approvals`]: [{ id: 'a1', revision: 2, engineVersion: '0.9.0', message: 'good', approvedByName: 'Ravi Osei', approvedAt: '2026-12-01T12:00:00.000Z' }],
      [`GET ${C}/approvals/a1`]: {
        id: 'a1', revision: 2, engineVersion: '0.9.0', message: 'good', approvedByName: 'Ravi Osei', approvedAt: '2026-12-01T12:00:00.000Z',
        inputs: {}, results: frozen,
        recompute: { engineVersion: '1.4.0', differences: [{ path: 'balance.understeerBudget.total', a: frozen.balance.understeerBudget.total, b: RESULTS.balance.understeerBudget.total, change: -0.05 }] },
      },
    });
    const section = root.querySelector('[data-testid="approval"]')!;
    expect(root.querySelector('[data-testid="no-approval"]')).toBeNull();
    expect(section.textContent).toContain('signed off by Ravi Osei');
    expect(section.textContent).toContain('gives 1 different figure(s)');
    const rows = [...section.querySelectorAll('[data-testid="frozen-figures"] tbody tr')];
    const k = rows.find((r) => r.querySelector('th')!.textContent.trim() === 'Understeer gradient K')!;
    const cells = [...k.querySelectorAll('td')].map((td) => td.textContent.trim());
    expect(cells[0]).toBe(frozen.balance.understeerBudget.total.toFixed(3));
    expect(cells[1]).toBe(RESULTS.balance.understeerBudget.total.toFixed(3));
    expect(cells[2]).toContain('-0.05');
    expect(cells[2]).toContain('(differs)');
    const same = rows.find((r) => r.querySelector('th')!.textContent.trim() === 'Roll steer ε, rear')!;
    expect(same.querySelectorAll('td')[2]!.textContent.trim()).toBe('none');
  });

  it('“Comment on the budget” points the new comment at the budget and posts it in the server’s reference format', async () => {
    const { harness, root } = await open(config({ status: 'in_review' }), ['team:read', 'review:decide', 'review:comment']);
    [...root.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent.trim() === 'Comment on the budget')!.click();
    harness.detectChanges();
    await new Promise((r) => setTimeout(r, 0));
    const select = root.querySelector('rw-review-comments mat-select[name="resultRef"]') as HTMLElement;
    expect(select.textContent.trim()).toBe('Understeer budget');
    expect(document.activeElement).toBe(root.querySelector('rw-review-comments textarea[name="body"]'));
    // The rear caution is one of the things a comment can point at.
    (select.querySelector('.mat-mdc-select-trigger') as HTMLElement).click();
    harness.detectChanges();
    const options = [...document.querySelectorAll('mat-option')].map((o) => o.textContent.trim());
    expect(options).toContain('Understeer budget');
    expect(options).toContain(`Caution: ${BUMP_CAUTION.message}`);
    (document.querySelector('mat-option') as HTMLElement).click(); // "The configuration as a whole" closes the list…
    harness.detectChanges();
    (select.querySelector('.mat-mdc-select-trigger') as HTMLElement).click();
    harness.detectChanges();
    [...document.querySelectorAll<HTMLElement>('mat-option')].find((o) => o.textContent.trim() === 'Understeer budget')!.click(); // …and back to the budget.
    harness.detectChanges();
    const box = root.querySelector('rw-review-comments textarea[name="body"]') as HTMLTextAreaElement;
    box.value = 'Rear roll-steer term looks small';
    box.dispatchEvent(new Event('input'));
    (root.querySelector('rw-review-comments form button[type="submit"]') as HTMLButtonElement).click();
    let posted: unknown;
    await serve(backend, {
      [`POST ${C}/comments`]: (req: TestRequest) => {
        posted = req.request.body;
        return { id: 'k1' };
      },
      [`GET ${C}/comments`]: [
        { id: 'k1', revision: 2, parentId: null, resultRef: 'budget', body: 'Rear roll-steer term looks small', authorName: 'Ravi Osei', createdAt: '2026-12-01T12:00:00.000Z', resolvedAt: null, resolved: false, replies: [] },
      ],
    });
    harness.detectChanges();
    expect(posted).toEqual({ body: 'Rear roll-steer term looks small', resultRef: 'budget' });
    const thread = root.querySelector('.rw-thread')!;
    expect(thread.textContent).toContain('On: Understeer budget');
    expect(thread.textContent).toContain('Open');
    // Resolve the thread.
    [...thread.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent.trim() === 'Close remark')!.click();
    await serve(backend, {
      [`POST ${C}/comments/k1/resolve`]: { id: 'k1', resolved: true },
      [`GET ${C}/comments`]: [
        { id: 'k1', revision: 2, parentId: null, resultRef: 'budget', body: 'Rear roll-steer term looks small', authorName: 'Ravi Osei', createdAt: '2026-12-01T12:00:00.000Z', resolvedAt: '2026-12-01T12:05:00.000Z', resolved: true, replies: [] },
      ],
    });
    harness.detectChanges();
    expect(root.querySelector('.rw-thread .rw-thread-state')!.textContent).toBe('Closed');
    expect([...root.querySelectorAll('.rw-thread button')].map((b) => b.textContent.trim())).toContain('Reopen remark');
  });

  it('compares an older revision with the current one: changed inputs and results side by side', async () => {
    const { harness, root } = await open(config(), ['team:read']);
    [...root.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.getAttribute('aria-label') === 'Compare revision 1 with the current one')!.click();
    let url = '';
    await serve(backend, {
      [`GET ${TEAM}/configurations/compare`]: (req: TestRequest) => {
        url = req.request.urlWithParams;
        return {
          engineVersion: '1.4.0',
          a: { configurationId: 'c1', revision: 1, refs: {} },
          b: { configurationId: 'c1', revision: 2, refs: {} },
          inputs: [{ path: 'rearCorner.points.tieRodInner[2]', a: 180, b: 186, change: 6 }],
          results: [
            { path: 'balance.understeerBudget.rollSteer', a: 0.1, b: 0.16, change: 0.06 },
            { path: 'balance.rollMomentBalance.relativeError', a: 1e-9, b: 2e-9, change: 1e-9 },
            { path: 'balance.kinematicsLink.rear.kinematics.rollCentreHeightMm', a: 25.3823676069206, b: 24.466010853944123, change: -0.916356752976477 },
            { path: 'bumpSteer.rear.bumpSteerDegPerM', a: 2.152274613638189, b: -13.082313992117802, change: -15.234588605755991 },
          ],
        };
      },
    });
    harness.detectChanges();
    expect(url).toBe(`${TEAM}/configurations/compare?a=c1&b=c1&aRevision=1`);
    const grid = root.querySelector('[data-testid="comparison"]')!;
    const rowsOf = (id: string) => [...grid.querySelectorAll(`[data-testid="${id}"] tbody tr`)].map((tr) => [...tr.children].map((x) => x.textContent.trim()));
    // Labelled, grouped by kind, rounded per quantity, with units: never a raw path.
    expect(rowsOf('compare-inputs')).toEqual([['Rear corner'], ['Rear corner · tie rod inner · z', '180', '186', '+6', 'mm']]);
    expect(rowsOf('compare-results')).toEqual([
      ['Understeer budget'],
      ['Understeer-gradient change from roll steer', '0.1', '0.16', '+0.06', 'deg/g'],
      ['Roll'],
      ['Roll moment balance, relative error', '1e-9', '2e-9', '+1e-9', ''],
      ['Kinematics used by the balance'],
      ['Roll centre height, rear, from the kinematics', '25.38', '24.47', '−0.9164', 'mm'],
      ['Bump steer and camber over the profile'],
      ['Bump steer, rear', '2.15', '−13.1', '−15.2', 'deg/m'],
    ]);
    expect(grid.textContent).not.toMatch(/[a-z]+\.[a-z]+[A-Z]|\[\d\]|relativeError/);
    // The same comparison in inch/pound: lengths in inches, bump steer per inch (1 in = 25.4 mm exactly).
    units.set('imperial');
    harness.detectChanges();
    expect(rowsOf('compare-inputs')[1]).toEqual(['Rear corner · tie rod inner · z', '7.087', '7.323', '+0.2362', 'in']);
    expect(rowsOf('compare-results')[7]).toEqual(['Bump steer, rear', '0.0547', '−0.332', '−0.387', 'deg/in']);
  });

  it('archives (never deletes) and restores for those who manage the team’s designs', async () => {
    const { harness, root } = await open(config(), ['team:read', 'vehicle:manage']);
    const press = (label: string) => [...root.querySelectorAll<HTMLButtonElement>('.rw-review button')].find((b) => b.textContent.trim() === label)!.click();
    press('Archive configuration');
    let body: unknown;
    await serve(backend, {
      [`PATCH ${C}`]: (req: TestRequest) => {
        body = req.request.body;
        return config({ archived: true });
      },
    });
    harness.detectChanges();
    expect(body).toEqual({ archived: true });
    expect(root.textContent).toContain('· archived');
    expect([...root.querySelectorAll('.rw-review button')].map((b) => b.textContent.trim())).toEqual(['Restore configuration']);
  });

  it('says why the configuration could not be loaded', async () => {
    const harness = await RouterTestingHarness.create();
    await harness.navigateByUrl('/teams/t-tal/configurations/c1', ConfigurationPage);
    await serve(backend, {
      [`GET ${TEAM}`]: { id: 't-tal', name: 'T', slug: 'tallowmere', roles: [], permissions: ['team:read'] },
      [`GET ${C}`]: refuse(404, 'not_found', 'Configuration not found'),
    });
    harness.detectChanges();
    expect((harness.routeNativeElement as HTMLElement).querySelector('[role="alert"]')!.textContent).toContain('Configuration not found');
  });
});
