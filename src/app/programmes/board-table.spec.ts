import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { DisplayUnits } from '../core/api-types';
import { DISPLAY_UNITS } from '../core/format/num-pipe';
import { BoardTable } from './board-table';
import type { Board } from './programmes-api';

const FIGURES = {
  rollSteerFront: 0.05,
  rollSteerRear: 0.1,
  rollSteerUndersteerDegPerG: 0.2,
  understeerGradientDegPerG: 1.1,
  bumpSteerFrontDegPerM: 3.5,
  bumpSteerRearDegPerM: -1.0,
};

const BOARD: Board = {
  programmeId: 'p1',
  trackProfile: 'bumpy-circuit',
  engineVersion: '1.0.0',
  rows: [
    {
      teamId: 't1',
      teamName: 'Harrow Vale Racing',
      configurationId: 'c1',
      configurationName: 'Kestrel baseline',
      status: 'approved',
      latest: { revision: 2, trackProfile: 'bumpy-circuit', figures: { ...FIGURES, bumpSteerFrontDegPerM: 4.5 } },
      approved: { revision: 1, approvedAt: '2026-10-03T12:00:00.000Z', engineVersion: '1.0.0', trackProfile: 'bumpy-circuit', figures: FIGURES },
    },
  ],
};

describe('BoardTable units', () => {
  function render(units: DisplayUnits) {
    TestBed.configureTestingModule({ providers: [provideRouter([]), { provide: DISPLAY_UNITS, useValue: signal(units) }] });
    const fixture = TestBed.createComponent(BoardTable);
    fixture.componentRef.setInput('board', BOARD);
    fixture.componentRef.setInput('timeZone', 'UTC');
    fixture.detectChanges();
    const root = fixture.nativeElement as HTMLElement;
    const header = [...root.querySelectorAll('thead th')].map((th) => [...th.childNodes].map((n) => n.textContent!.trim()).filter(Boolean).join(' '));
    const row = (cls: string) => [...root.querySelectorAll(`tr.${cls} td.num`)].map((td) => td.textContent.trim());
    return { header, row };
  }

  it('shows bump steer in deg/m for SI users', () => {
    const { header, row } = render('si');
    expect(header).toContain('Bump steer front deg/m');
    expect(row('latest')[4]).toBe('4.50');
    expect(row('change')[4]).toBe('+1.00');
  });

  it('shows bump steer in deg/in for inch-pound users, to the same resolution (1 in = 25.4 mm exactly, by definition)', () => {
    const { header, row } = render('imperial');
    expect(header).toContain('Bump steer front deg/in');
    // 4.5 deg/m × 0.0254 m/in = 0.1143 deg/in; 3.5 deg/m = 0.0889 deg/in; −1 deg/m = −0.0254 deg/in.
    expect(row('latest')[4]).toBe('0.1143');
    expect(row('approved')[4]).toBe('0.0889');
    expect(row('approved')[5]).toBe('−0.0254');
    expect(row('change')[4]).toBe('+0.0254');
    // Angles per angle and per g do not change with the unit system.
    expect(header).toContain('ε rear deg/deg');
    expect(row('latest')[1]).toBe('0.100');
  });
});
