import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { fakeNotifier, FakeNotifier, shellTestProviders } from '../../testing/shell-testing';
import { TeamProgrammesPage } from './team-programmes-page';
import { TeamProgramme } from './programmes-api';
import { settle } from '../../testing/settle';

const LIST: TeamProgramme[] = [
  { programmeId: 'p1', name: 'Autumn roll-steer study', instructorName: 'Iris Calder', trackProfile: 'bumpy-circuit', status: 'invited', invitedAt: '2026-10-01T09:05:00.000Z' },
  { programmeId: 'p0', name: 'Spring study', instructorName: 'Iris Calder', trackProfile: 'smooth-circuit', status: 'accepted', invitedAt: '2026-03-01T09:05:00.000Z' },
];

describe('TeamProgrammesPage', () => {
  let backend: HttpTestingController;
  let notifier: FakeNotifier;

  beforeEach(async () => {
    notifier = fakeNotifier();
    await TestBed.configureTestingModule({ imports: [TeamProgrammesPage], providers: [...shellTestProviders(notifier), { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } }] }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });
  afterEach(() => {
    backend.verify();
    document.querySelectorAll('.cdk-overlay-container').forEach((e) => (e.innerHTML = ''));
  });

  async function render(list: TeamProgramme[] = LIST) {
    const fixture = TestBed.createComponent(TeamProgrammesPage);
    fixture.componentRef.setInput('teamId', 't-tal');
    await settle();
    backend.expectOne('/api/teams/t-tal/programmes').flush(list);
    await settle();
    return { fixture, root: fixture.nativeElement as HTMLElement };
  }

  function dialogButton(label: string): HTMLButtonElement {
    return [...document.querySelectorAll<HTMLButtonElement>('mat-dialog-actions button')].find((b) => b.textContent?.trim() === label)!;
  }

  it('separates invitations from programmes the team takes part in', async () => {
    const { root } = await render();
    const section = (id: string) => root.querySelector(`section[aria-labelledby="${id}"]`)!;
    expect(section('invitations-heading').textContent).toContain('Autumn roll-steer study');
    expect(section('invitations-heading').textContent).toContain('by Iris Calder');
    expect(section('taking-heading').textContent).toContain('Spring study');
    expect(section('taking-heading').textContent).not.toContain('Autumn');
  });

  it('accepts after the owner confirms what the instructor will see', async () => {
    const { root } = await render();
    root.querySelector<HTMLButtonElement>('[aria-label="Accept Autumn roll-steer study"]')!.click();
    await settle();
    expect(document.querySelector('mat-dialog-content')?.textContent).toContain('Iris Calder will be able to read');
    dialogButton('Accept').click();
    await settle();
    backend.expectOne({ method: 'POST', url: '/api/teams/t-tal/programmes/p1/accept' }).flush({ status: 'accepted' });
    await settle();
    expect(notifier.info).toHaveBeenCalledWith(expect.stringContaining('takes part in "Autumn roll-steer study"'));
    backend.expectOne('/api/teams/t-tal/programmes').flush(LIST.map((p) => ({ ...p, status: 'accepted' as const })));
    await settle();
    expect(root.textContent).toContain('No invitation is waiting for an answer.');
  });

  it('sends nothing when the owner cancels a decline', async () => {
    const { root } = await render();
    root.querySelector<HTMLButtonElement>('[aria-label="Decline Autumn roll-steer study"]')!.click();
    await settle();
    dialogButton('Cancel').click();
    await settle();
    backend.expectNone({ method: 'POST' });
  });

  it('shows empty states', async () => {
    const { root } = await render([]);
    expect(root.textContent).toContain('No invitation is waiting for an answer.');
    expect(root.textContent).toContain('The team takes part in no programme.');
  });
});
