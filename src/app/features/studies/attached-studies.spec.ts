import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { fakeNotifier, shellTestProviders } from '../../../testing/shell-testing';
import { ProgrammeStudies } from './programme-studies';
import { ConfigurationStudies } from './configuration-studies';
import type { AttachedStudy } from './studies-api';

const ATTACHED: AttachedStudy = {
  studyId: 's1',
  configurationId: 'c1',
  label: 'Tolerance study of Front baseline r3',
  kind: 'tolerance',
  totalSamples: 10000,
  note: 'rig week',
  attachedAt: '2026-12-02T10:00:00.000Z',
  attachedBy: { id: 'u1', displayName: 'Dana Quist' },
  keyFigures: [
    { key: 'understeerGradientChangeDegPerG', label: 'Understeer-gradient change with the vehicle', unit: 'deg/g', p5: -0.0125, p50: 0.001, p95: 0.0143 },
    { key: 'rollSteerCoefficient', label: 'Roll steer ε', unit: 'deg/deg', p5: 0.021, p50: 0.025, p95: null },
  ],
};

/** Lets the component's awaited request resolve, then renders. */
async function settle(fixture: { whenStable(): Promise<unknown>; detectChanges(): void }): Promise<void> {
  await new Promise((r) => setTimeout(r, 0));
  fixture.detectChanges();
  await fixture.whenStable();
}

describe('attached studies', () => {
  let backend: HttpTestingController;

  beforeEach(async () => {
    await TestBed.configureTestingModule({ imports: [ProgrammeStudies, ConfigurationStudies], providers: shellTestProviders(fakeNotifier()) }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });
  afterEach(() => backend.verify());

  it('the programme board shows each team’s latest attached study with its headline P5 / P50 / P95', async () => {
    const fixture = TestBed.createComponent(ProgrammeStudies);
    fixture.componentRef.setInput('programmeId', 'p1');
    await fixture.whenStable();
    backend.expectOne('/api/programmes/p1/studies').flush({
      programmeId: 'p1',
      teams: [
        { teamId: 't1', teamName: 'Tallowmere University Racing', configurationName: 'Ember for the study', study: ATTACHED },
        { teamId: 't2', teamName: 'Brackenfield Road Programme', configurationName: null, study: null },
      ],
    });
    await settle(fixture);
    const rows = [...(fixture.nativeElement as HTMLElement).querySelectorAll('tbody tr')].map((tr) => tr.textContent!.replace(/\s+/g, ' ').trim());
    expect(rows[0]).toContain('Ember for the study');
    expect(rows[0]).toContain('Understeer-gradient change with the vehicle (deg/g)');
    expect(rows[0]).toContain('-0.0125');
    expect(rows[1]).toContain('No study attached yet');
  });

  it('a configuration lists its attached studies with a link and every key figure (a missing one as —)', async () => {
    const fixture = TestBed.createComponent(ConfigurationStudies);
    fixture.componentRef.setInput('teamId', 't1');
    fixture.componentRef.setInput('configurationId', 'c1');
    await fixture.whenStable();
    const req = backend.expectOne((r) => r.url === '/api/teams/t1/studies');
    expect(req.request.params.get('attachedTo')).toBe('c1');
    req.flush({ attachments: [ATTACHED] });
    await settle(fixture);
    const root = fixture.nativeElement as HTMLElement;
    expect(root.querySelector('a')!.getAttribute('href')).toBe('/teams/t1/studies/s1');
    const cells = [...root.querySelectorAll('tbody tr')].map((tr) => [...tr.children].map((c) => c.textContent!.trim()));
    expect(cells[1]).toEqual(['Roll steer ε (deg/deg)', '0.021', '0.025', '—']);
    expect(root.textContent).toContain('rig week');
  });
});
