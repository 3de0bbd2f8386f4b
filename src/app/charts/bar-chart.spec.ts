import { TestBed } from '@angular/core/testing';
import { BarChart } from './bar-chart';

describe('BarChart', () => {
  function setUp() {
    const fixture = TestBed.createComponent(BarChart);
    fixture.componentRef.setInput('chartTitle', 'Understeer budget');
    fixture.componentRef.setInput('seriesNames', ['Baseline', 'Variant']);
    fixture.componentRef.setInput('valueLabel', 'Understeer gradient');
    fixture.componentRef.setInput('unit', 'deg/g');
    fixture.componentRef.setInput('groups', [
      { label: 'Tyres', values: [1.2, 1.2] },
      { label: 'Roll steer', values: [0, -0.3] },
      { label: 'Total', values: [1.5, 1.2] },
    ]);
    fixture.detectChanges();
    return { fixture, el: fixture.nativeElement as HTMLElement };
  }

  it('draws baseline and variant side by side per term, variant hatched', () => {
    const { el } = setUp();
    const bars = Array.from(el.querySelectorAll('svg.rw-chart-svg rect.rw-bar'));
    expect(bars.length).toBe(6);
    const tyres = el.querySelectorAll('svg.rw-chart-svg [data-group="Tyres"] rect');
    const [base, variant] = Array.from(tyres);
    expect(base!.getAttribute('data-fill')).toBe('solid');
    expect(variant!.getAttribute('data-fill')).toBe('hatch');
    expect(Number(variant!.getAttribute('x'))).toBeGreaterThan(Number(base!.getAttribute('x')));
    expect(Number(base!.getAttribute('height'))).toBeCloseTo(Number(variant!.getAttribute('height')), 6);
  });

  it('draws a negative term below the zero line', () => {
    const { el } = setUp();
    const zeroY = Number(el.querySelector('.rw-zero-line')!.getAttribute('y1'));
    const rollSteerVariant = el.querySelector('[data-group="Roll steer"][data-series="Variant"] rect')!;
    expect(Number(rollSteerVariant.getAttribute('y'))).toBeCloseTo(zeroY, 6);
    expect(Number(rollSteerVariant.getAttribute('height'))).toBeGreaterThan(0);
    const tyresBase = el.querySelector('[data-group="Tyres"][data-series="Baseline"] rect')!;
    expect(Number(tyresBase.getAttribute('y')) + Number(tyresBase.getAttribute('height'))).toBeCloseTo(zeroY, 6);
  });

  it('labels the value axis with its unit and each group by name', () => {
    const { el } = setUp();
    expect(el.querySelector('.rw-axis-label-y')!.textContent!.trim()).toBe('Understeer gradient (deg/g)');
    const groups = Array.from(el.querySelectorAll('.rw-group-label')).map((t) => t.textContent!.trim());
    expect(groups).toEqual(['Tyres', 'Roll steer', 'Total']);
    expect(el.querySelector('svg desc')!.textContent).toContain('Roll steer: Baseline 0 deg/g, Variant -0.3 deg/g');
  });

  it('gives a table and CSV with the change between baseline and variant', () => {
    const { fixture, el } = setUp();
    Array.from(el.querySelectorAll('button')).find((b) => b.textContent!.includes('Show as table'))!.click();
    fixture.detectChanges();
    const header = Array.from(el.querySelectorAll('thead th')).map((th) => th.textContent!.trim());
    expect(header).toEqual(['Term', 'Baseline (deg/g)', 'Variant (deg/g)', 'Change (deg/g)']);
    const lines = fixture.componentInstance.csv().split('\r\n');
    expect(lines).toContain('Total,1.5,1.2,-0.3');
  });
});
