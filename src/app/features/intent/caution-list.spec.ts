import { ChangeDetectionStrategy, Component, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { Caution } from '../../../../shared/cautions/cautions';
import type { DisplayUnits } from '../../core/api-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { CautionList } from './caution-list';

const SCRUB: Caution = { level: 'warning', code: 'bump-lateral-scrub', message: 'The contact patch moves sideways.', value: 12.7, threshold: 5.08, unit: 'mm', basis: 'common practice' };
const DRIFT: Caution = { level: 'critical', code: 'bump-heading-change', message: 'The car drifts.', value: 0.3048, threshold: 0.25, unit: 'm of drift in 1 s', basis: 'product default' };

@Component({ selector: 'rw-host', imports: [CautionList], template: `<rw-caution-list [cautions]="cautions" />`, changeDetection: ChangeDetectionStrategy.OnPush })
class Host {
  cautions = [SCRUB, DRIFT];
}

describe('CautionList', () => {
  const units = signal<DisplayUnits>('si');

  beforeEach(() => {
    units.set('si');
    TestBed.configureTestingModule({ providers: [{ provide: DISPLAY_UNITS, useValue: units }] });
  });

  const figures = (el: HTMLElement, code: string) => el.querySelector(`[data-code="${code}"] .rw-caution-figures`)!.textContent.replace(/\s+/g, ' ').trim();

  it('writes the measured value and threshold in the user’s unit system (1 in = 25.4 mm, 1 ft = 0.3048 m exactly)', () => {
    const f = TestBed.createComponent(Host);
    f.detectChanges();
    expect(figures(f.nativeElement, 'bump-lateral-scrub')).toBe('Value 12.7 mm; threshold 5.08 mm.');
    expect(figures(f.nativeElement, 'bump-heading-change')).toBe('Value 0.305 m of drift in 1 s; threshold 0.25 m of drift in 1 s.');
    units.set('imperial');
    f.detectChanges();
    expect(figures(f.nativeElement, 'bump-lateral-scrub')).toBe('Value 0.5 in; threshold 0.2 in.');
    expect(figures(f.nativeElement, 'bump-heading-change')).toBe('Value 1 ft of drift in 1 s; threshold 0.82 ft of drift in 1 s.');
  });
});
