import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { fakeNotifier, shellTestProviders } from '../../testing/shell-testing';
import { ActivityEntry } from './activity-api';
import { ActivityPage } from './activity-page';
import { browserTimeZone, formatLocalTime } from '../core/time/local-time';
import { settle } from '../../testing/settle';

const entry = (n: number, over: Partial<ActivityEntry> = {}): ActivityEntry => ({
  id: `a${n}`,
  at: new Date(Date.UTC(2026, 11, 2, 12, 0, 0) - n * 60_000).toISOString(),
  actorName: 'Dana Quist',
  action: 'design.corner',
  subjectType: 'axle_design',
  subjectId: 'd1',
  designId: 'd1',
  summary: `Axle design "Front baseline" revision ${n + 1}`,
  ...over,
});
const ENTRIES: ActivityEntry[] = [
  entry(0, { actorName: 'Eli Marsh', action: 'vehicle.data', subjectType: 'vehicle', designId: null, summary: 'Vehicle "TUR-26 Ember" revision 2: data changed' }),
  entry(1),
  entry(2, { actorName: null, action: 'member.add', subjectType: 'member', designId: null, summary: 'Added Vera Nyman' }),
];

describe('ActivityPage', () => {
  let backend: HttpTestingController;
  beforeEach(async () => {
    await TestBed.configureTestingModule({ imports: [ActivityPage], providers: shellTestProviders(fakeNotifier()) }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });
  afterEach(() => backend.verify());

  async function render(designId?: string, entries: ActivityEntry[] = ENTRIES) {
    const fixture = TestBed.createComponent(ActivityPage);
    fixture.componentRef.setInput('teamId', 't-tal');
    if (designId) fixture.componentRef.setInput('designId', designId);
    await settle();
    const path = designId ? `/api/teams/t-tal/axle-designs/${designId}/activity` : '/api/teams/t-tal/activity';
    const req = backend.expectOne((r) => r.url === path);
    expect(req.request.params.get('limit')).toBe('100');
    req.flush(entries);
    await settle();
    const root = fixture.nativeElement as HTMLElement;
    const rows = () => [...root.querySelectorAll('table.activity tbody tr')].map((tr) => [...tr.querySelectorAll('td')].map((td) => td.textContent?.trim()));
    return { fixture, root, rows };
  }

  it('shows who, what and when in the browser’s time zone, naming it, with UTC kept on the element', async () => {
    const { root, rows } = await render();
    const tz = browserTimeZone();
    expect(root.querySelector('thead th')?.textContent).toBe(`When (${tz})`);
    expect(rows()[0]![0]).toBe(formatLocalTime(ENTRIES[0]!.at, tz, true));
    expect(root.querySelector('time')?.getAttribute('datetime')).toBe(ENTRIES[0]!.at);
    expect(rows()[0]![1]).toBe('Eli Marsh');
    expect(rows()[0]![2]).toContain('Vehicle');
    expect(rows()[2]![1]).toBe('Removed account');
  });

  it('offers the CSV download with a local-time column in this zone', async () => {
    const { root } = await render();
    const href = root.querySelector('a[download]')!.getAttribute('href')!;
    const url = new URL(href, 'http://x');
    expect(url.pathname).toBe('/api/teams/t-tal/activity');
    expect(url.searchParams.get('format')).toBe('csv');
    expect(url.searchParams.get('timeZone')).toBe(browserTimeZone());
  });

  it('filters the loaded entries by text', async () => {
    const { root, rows } = await render();
    const input = root.querySelector<HTMLInputElement>('.filters input')!;
    input.value = 'vera';
    input.dispatchEvent(new Event('input'));
    await settle();
    expect(rows().map((r) => r[3])).toEqual(['Added Vera Nyman']);
    expect(root.querySelector('.count')?.textContent?.trim()).toBe('1 of 3 loaded entries shown.');
    input.value = 'nothing like this';
    input.dispatchEvent(new Event('input'));
    await settle();
    expect(root.textContent).toContain('No loaded entry matches the filter.');
  });

  it('links an entry to its design’s history, and the design view back to the team', async () => {
    const { root } = await render();
    expect(root.querySelector('a.design-link')?.getAttribute('href')).toBe('/teams/t-tal/activity/axle-designs/d1');
  });

  it('per design: asks for that design’s entries only', async () => {
    const { root } = await render('d1', [entry(1)]);
    expect(root.querySelector('h1')?.textContent).toContain('Axle design activity');
    expect(root.querySelector('a[download]')!.getAttribute('href')).toContain('/api/teams/t-tal/axle-designs/d1/activity?format=csv');
    expect(root.querySelector('a.design-link')).toBeNull();
  });

  it('pages to older entries after the last one shown (its time and id)', async () => {
    const full = Array.from({ length: 100 }, (_, i) => entry(i));
    const { root, rows } = await render(undefined, full);
    root.querySelector<HTMLButtonElement>('.rw-form-actions button')!.click();
    await settle();
    const req = backend.expectOne((r) => r.url === '/api/teams/t-tal/activity' && r.params.has('before'));
    expect(req.request.params.get('before')).toBe(full[99]!.at);
    expect(req.request.params.get('beforeId')).toBe(full[99]!.id);
    req.flush([entry(100)]);
    await settle();
    expect(rows()).toHaveLength(101);
    expect(root.querySelector('.rw-form-actions button')).toBeNull();
  });

  it('shows the empty state', async () => {
    const { root } = await render(undefined, []);
    expect(root.textContent).toContain('Nothing has happened here yet.');
  });

  it('shows the API’s reason when loading fails, and tries again', async () => {
    const fixture = TestBed.createComponent(ActivityPage);
    fixture.componentRef.setInput('teamId', 't-tal');
    await settle();
    backend
      .expectOne((r) => r.url === '/api/teams/t-tal/activity')
      .flush({ error: { code: 'not_found', message: 'Team not found' } }, { status: 404, statusText: 'Not Found' });
    await settle();
    const root = fixture.nativeElement as HTMLElement;
    expect(root.querySelector('[role="alert"]')?.textContent).toContain('Team not found');
    root.querySelector<HTMLButtonElement>('.rw-state-error button')!.click();
    await settle();
    backend.expectOne((r) => r.url === '/api/teams/t-tal/activity').flush([]);
  });
});
