import { TestBed } from '@angular/core/testing';
import { LineChart } from './line-chart';
import { LineSeries } from './chart-types';

function setUp(series: LineSeries[]) {
  const fixture = TestBed.createComponent(LineChart);
  fixture.componentRef.setInput('chartTitle', 'Toe against wheel travel');
  fixture.componentRef.setInput('series', series);
  fixture.componentRef.setInput('x', { label: 'Wheel travel', unit: 'mm' });
  fixture.componentRef.setInput('y', { label: 'Toe', unit: 'deg' });
  fixture.detectChanges();
  return { fixture, el: fixture.nativeElement as HTMLElement };
}

const travel = [-20, -10, 0, 10, 20];
const twoSeries: LineSeries[] = [
  { name: 'Rack 0 mm', points: travel.map((x) => ({ x, y: 0.004 * x })) },
  { name: 'Rack 10 mm', points: travel.map((x) => ({ x, y: 0.006 * x + 0.1 })) },
];

describe('LineChart', () => {
  it('draws one path per series, told apart by dash pattern and marker shape', () => {
    const { el } = setUp(twoSeries);
    const lines = el.querySelectorAll('svg.rw-chart-svg path.rw-series-line');
    expect(lines.length).toBe(2);
    expect(lines[0]!.getAttribute('stroke-dasharray')).toBeNull();
    expect(lines[1]!.getAttribute('stroke-dasharray')).toBe('7 4');
    // A path through 5 points: one move and four line segments.
    const d = lines[0]!.getAttribute('d')!;
    expect(d.startsWith('M')).toBe(true);
    expect(d.split('L').length).toBe(5);
    const shapes = Array.from(el.querySelectorAll('svg.rw-chart-svg g[data-series]')).map(
      (g) => g.querySelector('.rw-series-marker')?.getAttribute('data-shape'),
    );
    expect(shapes).toEqual(['circle', 'square']);
    expect(el.querySelectorAll('svg.rw-chart-svg [data-series="Rack 0 mm"] .rw-series-marker').length).toBe(5);
  });

  it('draws a points series as a marker at every point and no line (measured data)', () => {
    const measured = Array.from({ length: 17 }, (_, k) => ({ x: -40 + 5 * k, y: 0.005 * (-40 + 5 * k) }));
    const { el } = setUp([
      { name: 'Predicted toe', points: travel.map((x) => ({ x, y: 0.004 * x })) },
      { name: 'Measured toe', points: measured, style: 'points' },
    ]);
    const group = el.querySelector('svg.rw-chart-svg [data-series="Measured toe"]')!;
    expect(group.querySelector('.rw-series-line')).toBeNull();
    // Every one of the 17 points is marked (a line series shows at most seven markers).
    expect(group.querySelectorAll('.rw-series-marker').length).toBe(17);
    expect(el.querySelectorAll('svg.rw-chart-svg [data-series="Predicted toe"] .rw-series-line').length).toBe(1);
    // Its legend entry is the marker alone.
    const legend = Array.from(el.querySelectorAll('.rw-legend li')).find((li) => li.textContent?.includes('Measured toe'))!;
    expect(legend.querySelector('.rw-series-line')).toBeNull();
    expect(legend.querySelector('.rw-series-marker')).not.toBeNull();
  });

  it('maps values to positions: increasing y is drawn higher up', () => {
    const { el } = setUp([twoSeries[0]!]);
    const d = el.querySelector('path.rw-series-line')!.getAttribute('d')!;
    const coords = d
      .replace(/^M/, '')
      .split('L')
      .map((pair) => pair.split(',').map(Number));
    const ys = coords.map((c) => c[1]!);
    const xs = coords.map((c) => c[0]!);
    expect(xs[0]).toBeCloseTo(0, 6); // first x at the left edge of the plot
    for (let i = 1; i < ys.length; i++) {
      expect(ys[i]!).toBeLessThan(ys[i - 1]!);
      expect(xs[i]!).toBeGreaterThan(xs[i - 1]!);
    }
  });

  it('labels both axes with their units and describes the data in words', () => {
    const { el } = setUp(twoSeries);
    expect(el.querySelector('.rw-axis-label-x')!.textContent.trim()).toBe('Wheel travel (mm)');
    expect(el.querySelector('.rw-axis-label-y')!.textContent.trim()).toBe('Toe (deg)');
    const desc = el.querySelector('svg desc')!.textContent;
    expect(desc).toContain('Rack 0 mm: Toe from -0.08 to 0.08 deg');
    const svg = el.querySelector('svg.rw-chart-svg')!;
    expect(svg.getAttribute('role')).toBe('img');
    expect(svg.getAttribute('aria-labelledby')).toContain('-desc');
    const tickLabels = Array.from(el.querySelectorAll('.rw-axis-x .rw-tick text')).map((t) => t.textContent.trim());
    expect(tickLabels).toContain('0');
    expect(tickLabels).toContain('−20');
  });

  it('shows the numbers as a table on request and offers the same numbers as CSV', () => {
    const { fixture, el } = setUp(twoSeries);
    expect(el.querySelector('table')).toBeNull();
    const toggle = Array.from(el.querySelectorAll('button')).find((b) => b.textContent.includes('Show as table'))!;
    toggle.click();
    fixture.detectChanges();
    const headers = Array.from(el.querySelectorAll('thead th')).map((th) => th.textContent.trim());
    expect(headers).toEqual(['Wheel travel (mm)', 'Rack 0 mm: Toe (deg)', 'Rack 10 mm: Toe (deg)']);
    const firstRow = Array.from(el.querySelectorAll('tbody tr')[0]!.querySelectorAll('td')).map((td) => td.textContent.trim());
    expect(firstRow).toEqual(['-20', '-0.08', '-0.02']);
    const csv = fixture.componentInstance.csv().split('\r\n');
    expect(csv[0]).toBe('# Toe against wheel travel');
    expect(csv[1]).toBe('Wheel travel (mm),Rack 0 mm: Toe (deg),Rack 10 mm: Toe (deg)');
    expect(csv[2]).toBe('-20,-0.08,-0.02');
  });

  it('draws a marked point and names it in the text alternative', () => {
    const { fixture, el } = setUp(twoSeries);
    fixture.componentRef.setInput('marks', [{ x: 0, y: 0, label: 'Chosen' }]);
    fixture.detectChanges();
    expect(el.querySelectorAll('.rw-mark circle').length).toBe(1);
    expect(el.querySelector('svg desc')!.textContent).toContain('Chosen at 0 mm, 0 deg');
  });
});
