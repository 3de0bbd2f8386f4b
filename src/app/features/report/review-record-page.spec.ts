import { TestBed } from '@angular/core/testing';
import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { provideRouter, withComponentInputBinding, withRouterConfig } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { signal } from '@angular/core';
import type { DisplayUnits } from '../../core/api-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { ReviewRecordPage } from './review-record-page';

describe('ReviewRecordPage', () => {
  const units = signal<DisplayUnits>('si');
  beforeEach(() => {
    units.set('si');
    TestBed.configureTestingModule({
      providers: [
        { provide: DISPLAY_UNITS, useValue: units },
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([{ path: 'teams/:teamId', children: [{ path: 'configurations/:configurationId/record', component: ReviewRecordPage }] }], withComponentInputBinding(), withRouterConfig({ paramsInheritanceStrategy: 'always' })),
      ],
    });
  });

  it('shows the server’s record document, offers its PDF and carries the safety caution', async () => {
    const harness = await RouterTestingHarness.create();
    await harness.navigateByUrl('/teams/t-tal/configurations/c1/record', ReviewRecordPage);
    harness.detectChanges();
    const root = harness.routeNativeElement as HTMLElement;
    expect(root.querySelector('h1')!.textContent).toContain('Review record');
    const frame = root.querySelector('iframe[data-testid="record-frame"]') as HTMLIFrameElement;
    expect(frame.getAttribute('src')).toBe('/api/teams/t-tal/configurations/c1/record.html?units=si');
    expect(frame.title).toBe('Configuration review record');
    const pdf = root.querySelector('a[data-testid="record-pdf"]') as HTMLAnchorElement;
    expect(pdf.getAttribute('href')).toBe('/api/teams/t-tal/configurations/c1/record.pdf?units=si');
    expect(pdf.hasAttribute('download')).toBe(true);
    expect(root.querySelector('rw-safety-caution')!.textContent).toContain('Verify on a kinematics rig');
    // The record is written in the reader's display units, and the page says which.
    expect(root.querySelector('[data-testid="record-units"]')!.textContent).toContain('in SI units');
    units.set('imperial');
    harness.detectChanges();
    expect(root.querySelector('[data-testid="record-units"]')!.textContent).toContain('in inch/pound units');
    expect(frame.getAttribute('src')).toBe('/api/teams/t-tal/configurations/c1/record.html?units=imperial');
    expect(pdf.getAttribute('href')).toBe('/api/teams/t-tal/configurations/c1/record.pdf?units=imperial');
    units.set('si');
    harness.detectChanges();
    // Printing is offered once the document is there.
    const print = [...root.querySelectorAll('button')].find((b) => b.textContent.includes('Print'))!;
    frame.dispatchEvent(new Event('load'));
    harness.detectChanges();
    expect(print.disabled).toBe(false);
  });
});
