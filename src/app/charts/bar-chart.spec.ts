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
    expect(el.querySelector('.rw-axis-label-y')!.textContent.trim()).toBe('Understeer gradient (deg/g)');
    const groups = Array.from(el.querySelectorAll('.rw-group-label')).map((t) => t.textContent.trim());
    expect(groups).toEqual(['Tyres', 'Roll steer', 'Total']);
    expect(el.querySelector('svg desc')!.textContent).toContain('Roll steer: Baseline 0 deg/g, Variant -0.3 deg/g');
  });

  it('gives a table and CSV with the change between baseline and variant', () => {
    const { fixture, el } = setUp();
    Array.from(el.querySelectorAll('button')).find((b) => b.textContent.includes('Show as table'))!.click();
    fixture.detectChanges();
    const header = Array.from(el.querySelectorAll('thead th')).map((th) => th.textContent.trim());
    expect(header).toEqual(['Term', 'Baseline (deg/g)', 'Variant (deg/g)', 'Change (deg/g)']);
    const lines = fixture.componentInstance.csv().split('\r\n');
    expect(lines).toContain('Total,1.5,1.2,-0.3');
  });

  it('wraps category names that fit their group at spaces, and turns them when a word does not fit', () => {
    const { fixture, el } = setUp();
    fixture.componentRef.setInput('groups', [
      { label: 'Lateral load transfer front', values: [0.5, 0.4] },
      { label: 'Tyres', values: [1.2, 1.2] },
    ]);
    fixture.detectChanges();
    const level = Array.from(el.querySelectorAll('.rw-group-label'));
    expect(level.map((t) => t.textContent.trim())).toEqual(['Lateral load transfer front', 'Tyres']);
    expect(level[0]!.querySelectorAll('tspan').length).toBe(1);
    expect(level[0]!.getAttribute('transform')).toBeNull();

    // Twenty narrow groups: names turned, and thinned so turned names stay a line apart.
    fixture.componentRef.setInput('seriesNames', ['Builds']);
    fixture.componentRef.setInput(
      'groups',
      Array.from({ length: 20 }, (_, i) => ({ label: `${(0.1 * i).toFixed(2)} to ${(0.1 * i + 0.1).toFixed(2)}`, values: [i] })),
    );
    fixture.detectChanges();
    const turned = Array.from(el.querySelectorAll('.rw-group-label'));
    expect(turned.length).toBeGreaterThan(0);
    expect(turned.length).toBeLessThanOrEqual(20);
    expect(turned.every((t) => /rotate\(-45\)/.test(t.getAttribute('transform') ?? ''))).toBe(true);
    // The viewBox grew below the plot for the turned names.
    const viewBoxHeight = Number(el.querySelector('svg.rw-chart-svg')!.getAttribute('viewBox')!.split(' ')[3]);
    expect(viewBoxHeight).toBeGreaterThan(300);
  });

  it('turns the values on narrow bars and keeps room for them inside the plot', () => {
    const { fixture, el } = setUp();
    fixture.componentRef.setInput('width', 320);
    fixture.componentRef.setInput(
      'groups',
      Array.from({ length: 6 }, (_, i) => ({ label: `T${i}`, values: [1.23456 * (i + 1), -0.98765 * (i + 1)] })),
    );
    fixture.detectChanges();
    const values = Array.from(el.querySelectorAll('.rw-bar-value'));
    expect(values.length).toBe(12);
    expect(values.every((t) => /rotate\(-90\)/.test(t.getAttribute('transform') ?? ''))).toBe(true);
    // The tallest bar stops short of the plot's top by the room its turned value needs.
    const tops = Array.from(el.querySelectorAll('svg.rw-chart-svg rect.rw-bar')).map((r) => Number(r.getAttribute('y')));
    expect(Math.min(...tops.filter(Number.isFinite))).toBeGreaterThan(20);
  });

  it('widens the left margin for long tick labels so they stay clear of the axis title', () => {
    const { fixture, el } = setUp();
    fixture.componentRef.setInput('groups', [{ label: 'A', values: [-0.000123, 0.000456] }]);
    fixture.detectChanges();
    const plot = el.querySelector('svg.rw-chart-svg > g')!;
    const left = Number(/translate\(([\d.]+),/.exec(plot.getAttribute('transform')!)![1]);
    const widest = Math.max(...Array.from(el.querySelectorAll('.rw-tick text')).map((t) => t.textContent.trim().length));
    expect(left).toBeGreaterThanOrEqual(widest * 12 * 0.6 + 16 + 15);
  });
});
