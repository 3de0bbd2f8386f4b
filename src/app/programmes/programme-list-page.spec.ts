import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Router } from '@angular/router';
import { fakeNotifier, FakeNotifier, shellTestProviders } from '../../testing/shell-testing';
import { Me } from '../core/api-types';
import { AuthService } from '../core/auth/auth-service';
import { ProgrammeListPage } from './programme-list-page';
import { settle } from '../../testing/settle';

const IRIS: Me = {
  user: { id: 'u-iris', email: 'instructor@programme.example', displayName: 'Iris Calder', displayUnits: 'si', instructor: true },
  memberships: [],
};
const ANA: Me = {
  user: { id: 'u-ana', email: 'owner@tallowmere.example', displayName: 'Ana Ferreira', displayUnits: 'si', instructor: false },
  memberships: [{ teamId: 't-tal', teamName: 'Tallowmere University Racing', teamSlug: 'tallowmere', roles: ['owner'] }],
};

describe('ProgrammeListPage', () => {
  let backend: HttpTestingController;
  let notifier: FakeNotifier;

  async function render(me: Me) {
    notifier = fakeNotifier();
    await TestBed.configureTestingModule({ imports: [ProgrammeListPage], providers: shellTestProviders(notifier) }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
    TestBed.inject(AuthService).refresh().subscribe();
    backend.expectOne('/api/auth/me').flush(me);
    const fixture = TestBed.createComponent(ProgrammeListPage);
    await settle();
    return { fixture, root: fixture.nativeElement as HTMLElement };
  }

  afterEach(() => backend.verify());

  it('lists the instructor’s programmes with their track profile', async () => {
    const { root } = await render(IRIS);
    expect(root.textContent).toContain('Loading programmes…');
    backend.expectOne('/api/programmes').flush([
      { id: 'p1', name: 'Autumn roll-steer study', trackProfile: 'bumpy-circuit', instructorId: 'u-iris', createdAt: '2026-10-01T09:00:00.000Z' },
    ]);
    await settle();
    const link = root.querySelector<HTMLAnchorElement>('.programme-list a')!;
    expect(link.textContent?.trim()).toBe('Autumn roll-steer study');
    expect(link.getAttribute('href')).toBe('/programmes/p1');
    expect(root.querySelector('.programme-list')?.textContent).toContain('Bumpy circuit');
  });

  it('says so when there is none, and when loading fails', async () => {
    const { root } = await render(IRIS);
    backend.expectOne('/api/programmes').flush({ error: { code: 'internal', message: 'Database unreachable' } }, { status: 500, statusText: 'Error' });
    await settle();
    expect(root.querySelector('[role="alert"]')?.textContent).toContain('Database unreachable');
    root.querySelector<HTMLButtonElement>('.rw-state-error button')!.click();
    await settle();
    backend.expectOne('/api/programmes').flush([]);
    await settle();
    expect(root.textContent).toContain('You have no programmes yet.');
  });

  it('creates a programme with a trimmed name and opens it', async () => {
    const { root } = await render(IRIS);
    backend.expectOne('/api/programmes').flush([]);
    await settle();
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    const name = root.querySelector<HTMLInputElement>('input[formcontrolname="name"]')!;
    name.value = '  Winter study ';
    name.dispatchEvent(new Event('input'));
    root.querySelector<HTMLButtonElement>('.create-form button[type="submit"]')!.click();
    await settle();
    const post = backend.expectOne({ method: 'POST', url: '/api/programmes' });
    expect(post.request.body).toEqual({ name: 'Winter study', trackProfile: 'smooth-circuit' });
    post.flush({ id: 'p9', name: 'Winter study', trackProfile: 'smooth-circuit', instructorId: 'u-iris', createdAt: '2026-12-02T10:00:00.000Z' });
    await settle();
    expect(navigate).toHaveBeenCalledWith(['/programmes', 'p9']);
    expect(notifier.info).toHaveBeenCalled();
  });

  it('refuses an empty name without asking the server', async () => {
    const { root } = await render(IRIS);
    backend.expectOne('/api/programmes').flush([]);
    await settle();
    const name = root.querySelector<HTMLInputElement>('input[formcontrolname="name"]')!;
    name.value = '   ';
    name.dispatchEvent(new Event('input'));
    root.querySelector<HTMLButtonElement>('.create-form button[type="submit"]')!.click();
    await settle();
    expect(root.querySelector('mat-error')?.textContent?.trim()).toBe('Give the programme a name.');
    backend.expectNone({ method: 'POST', url: '/api/programmes' });
  });

  it('tells someone who is not an instructor what programmes are, with no form', async () => {
    const { root } = await render(ANA);
    backend.expectNone('/api/programmes');
    expect(root.textContent).toContain('Programmes are run by instructors.');
    expect(root.querySelector('form')).toBeNull();
  });
});
