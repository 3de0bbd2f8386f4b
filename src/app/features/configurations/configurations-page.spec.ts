import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter, Router, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { ConfigurationsPage } from './configurations-page';
import type { Configuration } from './configurations-api';
import { formatLocalTime } from '../../core/time/local-time';
import { refuse, serve, settle } from './spec-backend';
import { chooseOption, clickToggle, matSelect, optionTexts, typeInto } from '../../../testing/material';

const TEAM = '/api/teams/t-tal';

function config(over: Partial<Configuration>): Configuration {
  return {
    id: 'c1',
    name: 'Ember baseline',
    status: 'approved',
    revision: 2,
    archived: false,
    vehicle: { id: 'v-ember', name: 'TUR-26 Ember', revision: 1 },
    front: { designId: 'd-f', name: 'Front baseline', revision: 1 },
    rear: { designId: 'd-r', name: 'Rear baseline', revision: 3 },
    trackProfile: 'smooth-circuit',
    updatedAt: '2026-12-01T23:30:00.000Z',
    updatedByName: 'Ravi Osei',
    createdAt: '2026-12-01T10:00:00.000Z',
    ...over,
  };
}

const LIST = [
  config({}),
  config({ id: 'c2', name: 'Cinder carry-over', status: 'draft', revision: 1, vehicle: { id: 'v-cinder', name: 'TUR-25 Cinder', revision: 1 } }),
];
const VEHICLES = [
  { id: 'v-ember', name: 'TUR-26 Ember', archived: false, revision: 1, updatedAt: '2026-12-01T10:00:00.000Z', updatedByName: null },
  { id: 'v-cinder', name: 'TUR-25 Cinder', archived: false, revision: 1, updatedAt: '2026-12-01T10:00:00.000Z', updatedByName: null },
];

describe('ConfigurationsPage', () => {
  let backend: HttpTestingController;

  beforeEach(async () => {
    await TestBed.configureTestingModule({
      providers: [
        provideRouter([
          { path: 'teams/:teamId/configurations', component: ConfigurationsPage },
          { path: 'teams/:teamId/configurations/:configurationId', children: [] },
        ], withComponentInputBinding()),
        provideHttpClient(),
        provideHttpClientTesting(),
      ],
    }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });
  afterEach(() => backend.verify());

  async function open(url: string, permissions: string[], list: unknown = LIST) {
    const harness = await RouterTestingHarness.create();
    await harness.navigateByUrl(url, ConfigurationsPage);
    await serve(backend, {
      [`GET ${TEAM}`]: { id: 't-tal', name: 'Tallowmere University Racing', slug: 'tallowmere', roles: [], permissions },
      [`GET ${TEAM}/configurations`]: list,
      [`GET ${TEAM}/vehicles`]: VEHICLES,
    });
    harness.detectChanges();
    return { harness, root: harness.routeNativeElement as HTMLElement };
  }

  it('lists configurations with their status in words, revisions and the last change in local time', async () => {
    const { root } = await open('/teams/t-tal/configurations', ['team:read']);
    const rows = [...root.querySelectorAll('tbody tr')];
    expect(rows).toHaveLength(2);
    expect(rows[0]!.querySelector('rw-status-chip')!.textContent).toContain('Signed off');
    expect(rows[1]!.querySelector('rw-status-chip')!.textContent).toContain('Draft');
    expect(rows[0]!.textContent).toContain('Rear baseline rev 3');
    expect(rows[0]!.textContent).toContain('Smooth circuit');
    expect(rows[0]!.textContent).toContain(`${formatLocalTime('2026-12-01T23:30:00.000Z')} · Ravi Osei`);
    expect(rows[0]!.querySelector('a')!.getAttribute('href')).toBe('/teams/t-tal/configurations/c1');
    // A viewer cannot make configurations: no button.
    expect([...root.querySelectorAll('button')].some((b) => b.textContent?.includes('New configuration'))).toBe(false);
  });

  it('shows one vehicle’s configurations when opened from the vehicle page', async () => {
    const { root } = await open('/teams/t-tal/configurations?vehicle=v-cinder', ['team:read']);
    const rows = [...root.querySelectorAll('tbody tr')];
    expect(rows.map((r) => r.querySelector('th')!.textContent.trim())).toEqual(['Cinder carry-over']);
    expect(root.querySelector('caption')!.textContent).toContain('of TUR-25 Cinder');
  });

  it('says so when there are none', async () => {
    const { root } = await open('/teams/t-tal/configurations', ['team:read', 'vehicle:manage'], []);
    expect(root.querySelector('[role="status"]')!.textContent).toContain('This team has no configurations yet.');
    expect(root.querySelector('[role="status"]')!.textContent).toContain('Make one with “New configuration”.');
  });

  it('says why when the list cannot be loaded', async () => {
    const failed = await RouterTestingHarness.create();
    await failed.navigateByUrl('/teams/t-tal/configurations', ConfigurationsPage);
    await serve(backend, {
      [`GET ${TEAM}`]: { id: 't-tal', name: 'T', slug: 'tallowmere', roles: [], permissions: ['team:read'] },
      [`GET ${TEAM}/configurations`]: refuse(503, 'database_unavailable', 'The database cannot be reached'),
      [`GET ${TEAM}/vehicles`]: VEHICLES,
    });
    failed.detectChanges();
    const alert = (failed.routeNativeElement as HTMLElement).querySelector('[role="alert"]')!;
    expect(alert.textContent).toContain('The configurations could not be loaded: The database cannot be reached');
  });

  it('creates a configuration from a vehicle revision, both designs and a track profile, and opens it', async () => {
    const { harness, root } = await open('/teams/t-tal/configurations', ['team:read', 'vehicle:manage']);
    const newButton = [...root.querySelectorAll('button')].find((b) => b.textContent?.includes('New configuration'))!;
    newButton.click();
    await serve(backend, {
      [`GET ${TEAM}/vehicles/v-ember/axle-designs`]: [
        { id: 'd-f', axle: 'front', name: 'Front baseline', revision: 1, status: 'draft', updatedAt: '' },
        { id: 'd-r', axle: 'rear', name: 'Rear baseline', revision: 3, status: 'draft', updatedAt: '' },
        { id: 'd-r6', axle: 'rear', name: 'Rear, toe link inner +6 mm', revision: 1, status: 'draft', updatedAt: '' },
      ],
      [`GET ${TEAM}/vehicles/v-ember/revisions`]: [{ revision: 1, message: 'Demo data', authorName: 'Ana', createdAt: '' }],
      [`GET ${TEAM}/axle-designs/d-f/revisions`]: [{ revision: 1, message: null, authorName: 'Ana', createdAt: '' }],
      [`GET ${TEAM}/axle-designs/d-r/revisions`]: [{ revision: 3, message: null, authorName: 'Ana', createdAt: '' }],
      [`GET ${TEAM}/axle-designs/d-r6/revisions`]: [
        { revision: 2, message: 'moved', authorName: 'Dana', createdAt: '' },
        { revision: 1, message: null, authorName: 'Dana', createdAt: '' },
      ],
    });
    harness.detectChanges();
    const form = root.querySelector('form')!;
    const select = (name: string, label: string | RegExp) => chooseOption(matSelect(form, `mat-select[name="${name}"]`), label);
    // Without a name nothing is sent.
    (form.querySelector('button[type="submit"]') as HTMLButtonElement).click();
    harness.detectChanges();
    expect(form.querySelector('[role="alert"]')!.textContent).toContain('Choose a name');
    typeInto(form, 'input[name="name"]', 'Ember +6');
    select('rear', 'Rear, toe link inner +6 mm');
    await serve(backend, {
      [`GET ${TEAM}/axle-designs/d-r6/revisions`]: [
        { revision: 2, message: 'moved', authorName: 'Dana', createdAt: '' },
        { revision: 1, message: null, authorName: 'Dana', createdAt: '' },
      ],
    });
    harness.detectChanges();
    expect(optionTexts(matSelect(form, 'mat-select[name="rearRevision"]'))).toEqual(['Current', '2 · moved', '1']);
    select('rearRevision', '1');
    select('trackProfile', /^Bumpy circuit/);
    harness.detectChanges();
    (form.querySelector('button[type="submit"]') as HTMLButtonElement).click();
    let sent: unknown;
    await serve(backend, {
      [`POST ${TEAM}/configurations`]: (req: { request: { body: unknown } }) => {
        sent = req.request.body;
        return config({ id: 'c-new', name: 'Ember +6', status: 'draft', revision: 1 });
      },
    });
    expect(sent).toEqual({ name: 'Ember +6', vehicleId: 'v-ember', frontDesignId: 'd-f', rearDesignId: 'd-r6', rearDesignRevision: 1, trackProfile: 'bumpy-circuit' });
    await settle();
    expect(TestBed.inject(Router).url).toBe('/teams/t-tal/configurations/c-new');
  });

  it('shows the server’s refusal inline and keeps what was entered', async () => {
    const { harness, root } = await open('/teams/t-tal/configurations?vehicle=v-ember', ['team:read', 'vehicle:manage']);
    [...root.querySelectorAll('button')].find((b) => b.textContent?.includes('New configuration'))!.click();
    await serve(backend, {
      [`GET ${TEAM}/vehicles/v-ember/axle-designs`]: [
        { id: 'd-f', axle: 'front', name: 'Front baseline', revision: 1, status: 'draft', updatedAt: '' },
        { id: 'd-r', axle: 'rear', name: 'Rear baseline', revision: 3, status: 'draft', updatedAt: '' },
      ],
      [`GET ${TEAM}/vehicles/v-ember/revisions`]: [],
      [`GET ${TEAM}/axle-designs/d-f/revisions`]: [],
      [`GET ${TEAM}/axle-designs/d-r/revisions`]: [],
    });
    harness.detectChanges();
    typeInto(root, 'input[name="name"]', 'No data');
    (root.querySelector('form button[type="submit"]') as HTMLButtonElement).click();
    await serve(backend, {
      [`POST ${TEAM}/configurations`]: refuse(409, 'incomplete_configuration', 'Vehicle revision 1 has no vehicle data yet; enter the balance model data first'),
    });
    harness.detectChanges();
    expect(root.querySelector('form [role="alert"]')!.textContent).toContain('has no vehicle data yet');
    expect((root.querySelector('input[name="name"]') as HTMLInputElement).value).toBe('No data');
    expect(TestBed.inject(Router).url).toBe('/teams/t-tal/configurations?vehicle=v-ember');
  });

  it('“Show archived” (a Material checkbox) asks for the archived ones too, and the vehicle filter narrows the list', async () => {
    const { harness, root } = await open('/teams/t-tal/configurations', ['team:read']);
    clickToggle(root, 'Show archived');
    let asked: string | null = null;
    await serve(backend, {
      [`GET ${TEAM}/configurations`]: (req: { request: { params: { get(k: string): string | null } } }) => {
        asked = req.request.params.get('archived');
        return [...LIST, config({ id: 'c3', name: 'Old Ember', archived: true })];
      },
    });
    harness.detectChanges();
    expect(asked).toBe('true');
    expect(root.querySelectorAll('tbody tr')).toHaveLength(3);
    expect(root.querySelector('tbody')!.textContent).toContain('Old Ember (archived)');
    chooseOption(matSelect(root, 'mat-select[name="filter"]'), 'TUR-25 Cinder');
    await settle();
    harness.detectChanges();
    expect([...root.querySelectorAll('tbody tr th')].map((th) => th.textContent.trim())).toEqual(['Cinder carry-over']);
    expect(TestBed.inject(Router).url).toBe('/teams/t-tal/configurations?vehicle=v-cinder');
  });
});
