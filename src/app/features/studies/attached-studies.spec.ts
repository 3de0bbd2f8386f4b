import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { signal } from '@angular/core';
import type { DisplayUnits } from '../../core/api-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { settle as runTasks } from '../../../testing/settle';
import { fakeNotifier, shellTestProviders } from '../../../testing/shell-testing';
import { ProgrammeStudies } from './programme-studies';
import { ConfigurationStudies } from './configuration-studies';
import type { AttachedStudy } from './studies-api';
import { formatLocalTime } from '../../core/time/local-time';

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
    { key: 'bumpScrubMm', label: 'Contact-patch scrub over that bump', unit: 'mm', p5: 1.27, p50: 2.54, p95: 3.81 },
  ],
};

/** Lets the component's awaited request resolve, then renders. */
async function settle(fixture: { whenStable(): Promise<unknown>; detectChanges(): void }): Promise<void> {
  await runTasks();
  fixture.detectChanges();
  await fixture.whenStable();
}

describe('attached studies', () => {
  let backend: HttpTestingController;
  const units = signal<DisplayUnits>('si');

  beforeEach(async () => {
    units.set('si');
    await TestBed.configureTestingModule({
      imports: [ProgrammeStudies, ConfigurationStudies],
      providers: [...shellTestProviders(fakeNotifier()), { provide: DISPLAY_UNITS, useValue: units }],
    }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });
  afterEach(() => backend.verify());

  it('the programme board shows each team’s latest attached study with its headline P5 / P50 / P95', async () => {
    const fixture = TestBed.createComponent(ProgrammeStudies);
    fixture.componentRef.setInput('programmeId', 'p1');
    await runTasks();
    backend.expectOne('/api/programmes/p1/studies').flush({
      programmeId: 'p1',
      teams: [
        { teamId: 't1', teamName: 'Tallowmere University Racing', configurationName: 'Ember for the study', study: ATTACHED },
        { teamId: 't2', teamName: 'Brackenfield Road Programme', configurationName: null, study: null },
      ],
    });
    await settle(fixture);
    const rows = [...(fixture.nativeElement as HTMLElement).querySelectorAll('tbody tr')].map((tr) => tr.textContent.replace(/\s+/g, ' ').trim());
    expect(rows[0]).toContain('Ember for the study');
    expect(rows[0]).toContain('Understeer-gradient change with the vehicle (deg/g)');
    expect(rows[0]).toContain('-0.0125');
    expect(rows[0]).toContain(formatLocalTime(ATTACHED.attachedAt));
    expect(rows[1]).toContain('No study attached yet');
  });

  it('a configuration lists its attached studies with a link and every key figure (a missing one as —)', async () => {
    const fixture = TestBed.createComponent(ConfigurationStudies);
    fixture.componentRef.setInput('teamId', 't1');
    fixture.componentRef.setInput('configurationId', 'c1');
    await runTasks();
    const req = backend.expectOne((r) => r.url === '/api/teams/t1/studies');
    expect(req.request.params.get('attachedTo')).toBe('c1');
    req.flush({ attachments: [ATTACHED] });
    await settle(fixture);
    const root = fixture.nativeElement as HTMLElement;
    expect(root.querySelector('a')!.getAttribute('href')).toBe('/teams/t1/studies/s1');
    const cells = [...root.querySelectorAll('tbody tr')].map((tr) => [...tr.children].map((c) => c.textContent.trim()));
    expect(cells[1]).toEqual(['Roll steer ε (deg/deg)', '0.021', '0.025', '—']);
    expect(cells[2]).toEqual(['Contact-patch scrub over that bump (mm)', '1.27', '2.54', '3.81']);
    expect(root.textContent).toContain('rig week');
    // In inch/pound the length figure is in inches (1 in = 25.4 mm exactly); ε has no other unit.
    units.set('imperial');
    fixture.detectChanges();
    const imperial = [...root.querySelectorAll('tbody tr')].map((tr) => [...tr.children].map((c) => c.textContent.trim()));
    expect(imperial[2]).toEqual(['Contact-patch scrub over that bump (in)', '0.05', '0.1', '0.15']);
    expect(imperial[1]).toEqual(['Roll steer ε (deg/deg)', '0.021', '0.025', '—']);
  });
});
