import { RouterTestingHarness } from '@angular/router/testing';
import { useRoutedPage } from '../../../testing/routed-page';
import { settle } from '../../../testing/settle';
import { chooseOption, matSelect } from '../../../testing/material';
import { StudyPage } from './study-page';
import type { StudyView } from './studies-api';

const T = '/api/teams/t-tal';

/** One output of a completed study, as the server stores it (shared/study/run.ts). */
function output(key: string, label: string, unit: string, p: [number, number, number], breaches: unknown[] = []) {
  return {
    key, label, unit, nominal: p[1], p5: p[0], p50: p[1], p95: p[2], mean: p[1], sd: (p[2] - p[0]) / 3.29, min: p[0], max: p[2], n: 600, r2: 0.97,
    histogram: { from: p[0], width: (p[2] - p[0]) / 4, counts: [10, 200, 250, 130] },
    breaches,
    // Named as the server names them (shared/study/engine.ts factorLabel: the hardpoint table's point name, coordinate, side).
    tornado: [{ factor: 'left.tieRodInner.z', label: 'Tie rod, inner end (rack), z (left)', src: 0.9 }, { factor: 'right.upperOuter.x', label: 'Upper ball joint, x (right)', src: -0.2 }],
  };
}

const STUDY = {
  id: 's1', kind: 'tolerance', label: 'Front pickups in the jig', status: 'completed',
  progress: { doneChunks: 2, totalChunks: 2, doneSamples: 600, totalSamples: 600 }, etaSeconds: null, error: null,
  target: {}, seed: 7, createdAt: '2026-12-02T10:00:00.000Z', startedAt: null, finishedAt: null, createdBy: null,
  result: {
    kind: 'tolerance', axle: 'front', validSamples: 600, totalSamples: 600, failedSamples: 0, failures: [], seed: 7,
    trackProfile: { id: 'bumpy-circuit', label: 'Bumpy circuit', bumpHeightMm: 25.4 },
    percentileMethod: 'type 7', sensitivityMethod: 'standardized regression coefficients',
    bumpCost: { output: null, why: 'no vehicle data', roadInWords: '' },
    factors: [], sweep: null, engineVersion: '1.4.0',
    outputs: [
      output('rollSteerCoefficient', 'Roll steer ε', 'deg/deg', [0.0211, 0.0252, 0.0297]),
      output('bumpSteerDegPerM', 'Bump-steer gradient', 'deg/m', [-3.12, -2.5, -1.85], [{ code: 'bump-steer', level: 'warning', absolute: true, threshold: 3, probability: 0.04, interval: [0.03, 0.06] }]),
      output('bumpScrubMm', 'Contact-patch scrub over that bump', 'mm', [2.54, 5.08, 7.62]),
      output('bumpToeChangeDeg', 'Toe change over a 25.4 mm single-wheel bump (bumpy circuit)', 'deg', [0.01, 0.02, 0.03]),
    ],
  },
} as unknown as StudyView;

describe('StudyPage', () => {
  const bed = useRoutedPage('teams/:teamId/studies/:studyId', StudyPage);
  const units = bed.units;

  async function open() {
    const harness = await RouterTestingHarness.create();
    await harness.navigateByUrl('/teams/t-tal/studies/s1', StudyPage);
    await settle();
    bed.backend.expectOne(T).flush({ id: 't-tal', name: 'Tallowmere University Racing', slug: 'tallowmere', roles: [], permissions: ['team:read'] });
    bed.backend.expectOne(`${T}/studies/s1`).flush({ study: STUDY });
    await settle();
    harness.detectChanges();
    const root = harness.routeNativeElement as HTMLElement;
    const summary = (label: string) =>
      [...root.querySelector('table[aria-label="Output summary"]')!.querySelectorAll('tbody tr')]
        .find((tr) => tr.querySelector('th')!.textContent.trim() === label)!
        .querySelectorAll('td');
    const percentiles = () => root.querySelector('[data-testid="study-percentiles"]')!.textContent.replace(/\s+/g, ' ').trim();
    return { harness, root, summary, percentiles };
  }

  it('switches the figures, the histogram and the thresholds to inch/pound when the user does', async () => {
    const { harness, root, summary, percentiles } = await open();
    chooseOption(matSelect(root, 'mat-select[name="output"]'), 'Bump-steer gradient');
    harness.detectChanges();
    // SI: deg/m to the quantity's 3 significant figures (core/format/quantities.ts).
    expect(percentiles()).toBe('P5 -3.12 · P50 -2.5 · P95 -1.85 deg/m (nominal -2.5)');
    expect(summary('Contact-patch scrub over that bump')[0]!.textContent.trim()).toBe('mm');
    expect(summary('Contact-patch scrub over that bump')[2]!.textContent.trim()).toBe('2.54');
    expect(root.querySelector('table[aria-label="Caution thresholds reached"]')!.textContent).toContain('|value| ≥ 3 deg/m');
    expect(root.querySelector('[data-testid="study-histogram"]')!.textContent).toContain('Distribution: Bump-steer gradient (deg/m)');

    units.set('imperial');
    harness.detectChanges();
    // 1 in = 25.4 mm exactly: deg/m × 0.0254 = deg/in; 2.54 mm = 0.1 in.
    expect(percentiles()).toBe(`P5 ${Number((-3.12 * 0.0254).toPrecision(3))} · P50 -0.0635 · P95 ${Number((-1.85 * 0.0254).toPrecision(3))} deg/in (nominal -0.0635)`);
    expect(summary('Contact-patch scrub over that bump')[0]!.textContent.trim()).toBe('in');
    expect(summary('Contact-patch scrub over that bump')[2]!.textContent.trim()).toBe('0.1');
    expect(root.querySelector('table[aria-label="Caution thresholds reached"]')!.textContent).toContain('|value| ≥ 0.0762 deg/in');
    expect(root.querySelector('[data-testid="study-histogram"]')!.textContent).toContain('Distribution: Bump-steer gradient (deg/in)');
    expect(root.textContent).toContain('(1 in single-wheel bump)');
    // A label's own figure follows too: 25.4 mm is 1 in.
    expect(summary('Toe change over a 1 in single-wheel bump (bumpy circuit)')[0]!.textContent.trim()).toBe('deg');
    expect(root.textContent).not.toContain('25.4 mm');
    // ε has no inch/pound form: it stays in deg/deg.
    expect(summary('Roll steer ε')[0]!.textContent.trim()).toBe('deg/deg');
    expect(summary('Roll steer ε')[2]!.textContent.trim()).toBe('0.0211');
  });

  it('names each tornado bar by its point as the hardpoint table does, with the coordinate and side, never the point key', async () => {
    const { root } = await open();
    const tornado = root.querySelector('[data-testid="study-tornado"]')!.textContent;
    // The coordinate and side first, so a name the chart cuts short still tells the bars apart.
    expect(tornado).toContain('z left: Tie rod, inner end (rack)');
    expect(tornado).toContain('x right: Upper ball joint');
    expect(tornado).not.toMatch(/tieRodInner|upperOuter/);
  });

  it("asks the server for the CSV in the user's units", async () => {
    const created = vi.fn(() => 'blob:study');
    const original = { create: URL.createObjectURL, revoke: URL.revokeObjectURL };
    URL.createObjectURL = created;
    URL.revokeObjectURL = vi.fn();
    try {
      const { harness, root } = await open();
      const exportButton = () => [...root.querySelectorAll('button')].find((b) => b.textContent.includes('Export CSV'))!;
      exportButton().click();
      await settle();
      bed.backend.expectOne((r) => r.url === `${T}/studies/s1/csv` && r.params.get('units') === 'si').flush('output,unit\r\n');
      await settle();
      units.set('imperial');
      harness.detectChanges();
      exportButton().click();
      await settle();
      bed.backend.expectOne((r) => r.url === `${T}/studies/s1/csv` && r.params.get('units') === 'imperial').flush('output,unit\r\n');
      await settle();
      expect(created).toHaveBeenCalledTimes(2);
    } finally {
      URL.createObjectURL = original.create;
      URL.revokeObjectURL = original.revoke;
    }
  });
});
