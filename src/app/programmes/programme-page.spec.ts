import { HttpTestingController } from '@angular/common/http/testing';
import { settle } from '../../testing/settle';
import { DeferBlockBehavior, DeferBlockState, TestBed } from '@angular/core/testing';
import { fakeNotifier, FakeNotifier, shellTestProviders } from '../../testing/shell-testing';
import { SAFETY_CAUTION_TEXT } from '../features/safety-caution';
import { ProgrammePage } from './programme-page';
import { Board, KeyFigures, ProgrammeDetail } from './programmes-api';

const DETAIL: ProgrammeDetail = {
  id: 'p1',
  name: 'Autumn roll-steer study',
  trackProfile: 'bumpy-circuit',
  instructorId: 'u-iris',
  createdAt: '2026-10-01T09:00:00.000Z',
  teams: [
    { teamId: 't-br', teamName: 'Brackenfield Road Programme', teamSlug: 'brackenfield', status: 'invited', invitedAt: '2026-10-01T09:05:00.000Z', decidedAt: null },
    { teamId: 't-tal', teamName: 'Tallowmere University Racing', teamSlug: 'tallowmere', status: 'accepted', invitedAt: '2026-10-01T09:05:00.000Z', decidedAt: '2026-10-02T08:00:00.000Z' },
  ],
};
const figures = (over: Partial<KeyFigures>): KeyFigures => ({
  rollSteerFront: 0.05,
  rollSteerRear: 0.1,
  rollSteerUndersteerDegPerG: 0.2,
  understeerGradientDegPerG: 1.1,
  bumpSteerFrontDegPerM: 3.5,
  bumpSteerRearDegPerM: -2.25,
  ...over,
});
const BOARD: Board = {
  programmeId: 'p1',
  trackProfile: 'bumpy-circuit',
  engineVersion: '1.0.0',
  rows: [
    {
      teamId: 't-tal',
      teamName: 'Tallowmere University Racing',
      configurationId: 'c1',
      configurationName: 'Ember for the study',
      status: 'approved',
      latest: { revision: 2, trackProfile: 'bumpy-circuit', figures: figures({ rollSteerRear: 0.125 }) },
      approved: { revision: 1, approvedAt: '2026-10-03T12:00:00.000Z', engineVersion: '1.0.0', trackProfile: 'smooth-circuit', figures: figures({}) },
    },
    {
      teamId: 't-tal',
      teamName: 'Tallowmere University Racing',
      configurationId: 'c2',
      configurationName: 'Broken one',
      status: 'draft',
      latest: { revision: 1, error: 'Tie rod cannot reach at −40 mm' },
      approved: null,
    },
  ],
};

describe('ProgrammePage', () => {
  let backend: HttpTestingController;
  let notifier: FakeNotifier;

  beforeEach(async () => {
    notifier = fakeNotifier();
    await TestBed.configureTestingModule({ imports: [ProgrammePage], providers: shellTestProviders(notifier), deferBlockBehavior: DeferBlockBehavior.Manual }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });
  afterEach(() => backend.verify());

  async function render(board: Board = BOARD) {
    const fixture = TestBed.createComponent(ProgrammePage);
    fixture.componentRef.setInput('programmeId', 'p1');
    await settle();
    backend.expectOne('/api/programmes/p1').flush(DETAIL);
    backend.expectOne('/api/programmes/p1/board').flush(board);
    backend.expectOne('/api/programmes/p1/snapshots').flush([{ id: 's1', label: 'Deadline week 6', takenAt: '2026-10-10T17:00:00.000Z' }]);
    await settle();
    // The attached-studies section (features/studies/programme-studies.ts, loaded when the page is idle) asks for its own rows.
    const [studies] = await fixture.getDeferBlocks();
    await studies!.render(DeferBlockState.Complete);
    await settle();
    for (const r of backend.match('/api/programmes/p1/studies')) r.flush({ programmeId: 'p1', teams: [] });
    await settle();
    const root = fixture.nativeElement as HTMLElement;
    const group = (name: string) => [...root.querySelectorAll<HTMLElement>('tbody.config')].find((g) => g.textContent?.includes(name))!;
    const cells = (tr: Element | null) => [...(tr?.querySelectorAll('td') ?? [])].map((td) => td.textContent?.trim());
    return { fixture, root, group, cells };
  }

  it('lists the teams and their answers', async () => {
    const { root } = await render();
    const rows = [...root.querySelectorAll('table.teams tbody tr')].map((tr) => [tr.querySelector('th')?.textContent?.trim(), tr.querySelectorAll('td')[1]?.textContent?.trim()]);
    expect(rows).toEqual([
      ['Brackenfield Road Programme', 'Invited, waiting for the owner'],
      ['Tallowmere University Racing', 'Accepted'],
    ]);
  });

  it('shows latest, approved and the change as signed numbers, with the safety caution', async () => {
    const { root, group, cells } = await render();
    expect(root.querySelector('rw-safety-caution')?.textContent).toContain(SAFETY_CAUTION_TEXT);
    const ember = group('Ember for the study');
    expect(ember.querySelector('.status')?.textContent?.trim()).toBe('Signed off');
    // The name opens the configuration in its team (read only for the instructor).
    expect(ember.querySelector('a.config-link')?.getAttribute('href')).toBe('/teams/t-tal/configurations/c1');
    expect(ember.querySelector('tr.latest th.kind')?.textContent).toContain('Latest · rev 2');
    expect(cells(ember.querySelector('tr.latest')).slice(1)).toEqual(['0.050', '0.125', '0.200', '1.100', '3.50', '−2.25']);
    expect(cells(ember.querySelector('tr.approved'))).toEqual(['0.050', '0.100', '0.200', '1.100', '3.50', '−2.25']);
    expect(cells(ember.querySelector('tr.change'))).toEqual(['no change', '+0.025', 'no change', 'no change', 'no change', 'no change']);
    // The approval ran on another profile than the board's: said in words.
    expect(ember.querySelector('tr.change')?.textContent).toContain('approved on another track profile');
    expect(ember.querySelector('tr.approved')?.textContent).toContain('Smooth circuit');
  });

  it('says why a configuration could not be computed, and that it has no approval', async () => {
    const { group } = await render();
    const broken = group('Broken one');
    expect(broken.querySelector('tr.latest .problem')?.textContent).toContain('Tie rod cannot reach at −40 mm');
    expect(broken.querySelector('tr.approved')?.textContent).toContain('No approval yet');
  });

  it('has no edit controls for the teams’ data: only invite, refresh and snapshot', async () => {
    const { root } = await render();
    const buttons = [...root.querySelectorAll('button')].filter((b) => !b.closest('rw-section-nav')).map((b) => b.textContent?.trim());
    expect(buttons).toEqual(['group_add Invite team', 'refresh Refresh board', 'photo_camera Take snapshot']);
    // The long page has its list of sections (buttons that only move within the page).
    expect([...root.querySelectorAll('rw-section-nav button')].map((b) => b.textContent?.trim())).toEqual(['Teams', 'Board', 'Attached studies', 'Snapshots']);
    expect(root.querySelectorAll('rw-board-table input, rw-board-table button, rw-board-table select')).toHaveLength(0);
    expect([...root.querySelectorAll('rw-board-table a')].every((a) => /^\/teams\/[^/]+\/configurations\/[^/]+$/.test(a.getAttribute('href')!))).toBe(true);
  });

  it('explains an empty board', async () => {
    const { root } = await render({ ...BOARD, rows: [] });
    expect(root.textContent).toContain('The accepted teams have no configurations yet.');
    expect(root.textContent).toContain('Accepted, no configurations yet: Tallowmere University Racing.');
  });

  it('invites a team by its address and shows a refusal beside the form', async () => {
    const { root } = await render();
    const slug = root.querySelector<HTMLInputElement>('input[formcontrolname="teamSlug"]')!;
    slug.value = 'no-such-team';
    slug.dispatchEvent(new Event('input'));
    root.querySelector<HTMLButtonElement>('.invite-form button[type="submit"]')!.click();
    await settle();
    const post = backend.expectOne({ method: 'POST', url: '/api/programmes/p1/teams' });
    expect(post.request.body).toEqual({ teamSlug: 'no-such-team' });
    post.flush({ error: { code: 'not_found', message: 'No team has the address "no-such-team"' } }, { status: 404, statusText: 'Not Found' });
    await settle();
    expect(root.querySelector('.panel [role="alert"]')?.textContent?.trim()).toBe('No team has the address "no-such-team"');
    expect(notifier.error).not.toHaveBeenCalled();

    slug.value = 'brackenfield';
    slug.dispatchEvent(new Event('input'));
    root.querySelector<HTMLButtonElement>('.invite-form button[type="submit"]')!.click();
    await settle();
    backend.expectOne({ method: 'POST', url: '/api/programmes/p1/teams' }).flush(DETAIL.teams[0]!);
    await settle();
    backend.expectOne('/api/programmes/p1').flush(DETAIL);
    await settle();
    // The emptied field is not shown as an error after a successful invitation.
    expect(slug.value).toBe('');
    expect(root.querySelector('.invite-form mat-error')).toBeNull();
    expect(notifier.info).toHaveBeenCalledWith(expect.stringContaining('Brackenfield Road Programme invited.'));
  });

  it('takes a labelled snapshot, lists snapshots and offers each as a CSV download', async () => {
    const { root } = await render();
    const csv = root.querySelector<HTMLAnchorElement>('.snapshots a[download]')!;
    expect(csv.getAttribute('href')).toBe('/api/programmes/p1/snapshots/s1?format=csv');
    expect(root.querySelector('.snapshots a')?.getAttribute('href')).toBe('/programmes/p1/snapshots/s1');
    const label = root.querySelector<HTMLInputElement>('input[formcontrolname="label"]')!;
    label.value = ' Final ';
    label.dispatchEvent(new Event('input'));
    root.querySelector<HTMLButtonElement>('.snapshot-form button[type="submit"]')!.click();
    await settle();
    const post = backend.expectOne({ method: 'POST', url: '/api/programmes/p1/snapshots' });
    expect(post.request.body).toEqual({ label: 'Final' });
    post.flush({ id: 's2', label: 'Final', takenAt: '2026-12-01T10:00:00.000Z', programmeId: 'p1', board: BOARD });
    await settle();
    backend.expectOne('/api/programmes/p1/snapshots').flush([
      { id: 's2', label: 'Final', takenAt: '2026-12-01T10:00:00.000Z' },
      { id: 's1', label: 'Deadline week 6', takenAt: '2026-10-10T17:00:00.000Z' },
    ]);
    await settle();
    expect([...root.querySelectorAll('.snapshots li > a:first-child')].map((a) => a.textContent?.trim())).toEqual(['Final', 'Deadline week 6']);
  });
});
