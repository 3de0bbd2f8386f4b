import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { fakeNotifier, FakeNotifier, shellTestProviders } from '../../testing/shell-testing';
import { CapturedMail, DevMailApi } from './dev-mail-api';
import { DevMailPage } from './dev-mail-page';
import { settle } from '../../testing/settle';

const RESET: CapturedMail = {
  id: 'm2',
  messageId: '<o2@outbox.rollwise>',
  from: 'Rollwise <no-reply@rollwise.local>',
  to: ['designer@tallowmere.example'],
  subject: 'Reset your Rollwise password',
  text: 'Hello Dana Quist,\n\nto choose a new one, open:\nhttp://127.0.0.1:4200/reset-password/Tok_en-1\n\nThe link works once.',
  receivedAt: '2026-12-02T07:40:12.000Z',
};
const INVITE: CapturedMail = {
  id: 'm1',
  messageId: '<o1@outbox.rollwise>',
  from: 'Rollwise <no-reply@rollwise.local>',
  to: ['noor@tallowmere.example'],
  subject: 'Invitation to Tallowmere University Racing on Rollwise',
  text: 'Ana Ferreira invites you.\n\nOpen this link:\nhttp://127.0.0.1:4200/invitations/abc.def',
  receivedAt: '2026-12-02T07:30:00.000Z',
};

describe('DevMailPage', () => {
  let backend: HttpTestingController;
  let notifier: FakeNotifier;

  beforeEach(async () => {
    notifier = fakeNotifier();
    await TestBed.configureTestingModule({
      imports: [DevMailPage],
      providers: shellTestProviders(notifier),
    }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  async function render() {
    const fixture = TestBed.createComponent(DevMailPage);
    await settle();
    return { fixture, root: fixture.nativeElement as HTMLElement };
  }

  it('lists the captured mail newest first with time, recipients, subject and body, links clickable', async () => {
    const { root } = await render();
    backend.expectOne({ method: 'GET', url: '/api/dev/mail' }).flush([RESET, INVITE]);
    await settle();
    const items = [...root.querySelectorAll('li.mail')];
    expect(items.map((i) => i.querySelector('h2')?.textContent?.trim())).toEqual([
      'Reset your Rollwise password',
      'Invitation to Tallowmere University Racing on Rollwise',
    ]);
    const first = items[0]!;
    expect(first.querySelector('time')?.getAttribute('datetime')).toBe(RESET.receivedAt);
    expect(first.textContent).toContain('designer@tallowmere.example');
    const body = first.querySelector('pre')!;
    expect(body.textContent).toBe(RESET.text);
    const links = [...body.querySelectorAll('a')];
    expect(links.map((a) => a.getAttribute('href'))).toEqual(['http://127.0.0.1:4200/reset-password/Tok_en-1']);
    expect(links[0]!.getAttribute('rel')).toContain('noopener');
  });

  it('says when nothing was captured, and fetches again on Refresh', async () => {
    const { root } = await render();
    backend.expectOne('/api/dev/mail').flush([]);
    await settle();
    expect(root.querySelector('[role="status"]')?.textContent?.trim()).toBe('No mail captured yet.');
    [...root.querySelectorAll('button')].find((b) => b.textContent?.includes('Refresh'))!.click();
    await settle();
    backend.expectOne('/api/dev/mail').flush([INVITE]);
    await settle();
    expect(root.querySelectorAll('li.mail').length).toBe(1);
  });

  it('shows a refusal on the page, not in a snackbar', async () => {
    const { root } = await render();
    backend.expectOne('/api/dev/mail').flush(
      { error: { code: 'not_found', message: 'No such route: GET /api/dev/mail' } },
      { status: 404, statusText: 'Not Found' },
    );
    await settle();
    expect(root.querySelector('[role="alert"]')?.textContent?.trim()).toBe('No such route: GET /api/dev/mail');
    expect(notifier.error).not.toHaveBeenCalled();
  });
});

describe('DevMailApi.probe', () => {
  let backend: HttpTestingController;
  let api: DevMailApi;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: shellTestProviders(fakeNotifier()) });
    backend = TestBed.inject(HttpTestingController);
    api = TestBed.inject(DevMailApi);
  });

  afterEach(() => backend.verify());

  it('asks once with HEAD and hides the page on a server without the route (404)', () => {
    api.probe();
    api.probe();
    const head = backend.expectOne({ method: 'HEAD', url: '/api/dev/mail' });
    head.flush(null, { status: 404, statusText: 'Not Found' });
    expect(api.available()).toBe(false);
    api.probe();
    backend.expectNone('/api/dev/mail');
  });

  it('shows the page when the route answers', () => {
    api.probe();
    backend.expectOne({ method: 'HEAD', url: '/api/dev/mail' }).flush(null);
    expect(api.available()).toBe(true);
  });

  it('does not decide on other failures and asks again later', () => {
    api.probe();
    backend.expectOne('/api/dev/mail').flush(null, { status: 503, statusText: 'Service Unavailable' });
    expect(api.available()).toBeNull();
    api.probe();
    backend.expectOne('/api/dev/mail').flush(null);
    expect(api.available()).toBe(true);
  });
});
