import { RouterTestingHarness } from '@angular/router/testing';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { analyseCorner } from '../../workers/corner-analysis';
import { settle } from '../../../testing/settle';
import { ComparePage } from './compare-page';
import { useRoutedPage } from '../../../testing/routed-page';
import { clickToggle } from '../../../testing/material';
import { Router } from '@angular/router';
import { TestBed } from '@angular/core/testing';

const T = '/api/teams/t-tal';
const raised = structuredClone(exampleCorners.fsRearWishbone);
raised.points.tieRodInner[2] += 6;
const DESIGNS = {
  'd-rear': { name: 'Rear baseline', corner: exampleCorners.fsRearWishbone },
  'd-rear6': { name: 'Rear +6', corner: raised },
} as const;
const TRAVEL = { from: -25, to: 25, step: 2.5 };

describe('ComparePage', () => {
  const bed = useRoutedPage('teams/:teamId/vehicles/:vehicleId/compare', ComparePage);
  const units = bed.units;

  /** Opens a shared comparison address; the page compares by itself once the designs are listed. */
  async function openComparison(designs: Readonly<Record<string, { name: string; corner: typeof raised }>> = DESIGNS, ready = '[data-testid="compare-figures"]') {
    const harness = await RouterTestingHarness.create();
    await harness.navigateByUrl(`/teams/t-tal/vehicles/v-ember/compare?designs=${Object.keys(designs).join(',')}`, ComparePage);
    await settle();
    bed.backend.expectOne(`${T}/vehicles/v-ember/axle-designs`).flush(
      Object.entries(designs).map(([id, d]) => ({ id, axle: 'rear', name: d.name, revision: 3, status: 'draft', updatedAt: '' })),
    );
    // Each design is read, then solved (by the same engine the Worker runs, here on the main thread).
    for (const [id, d] of Object.entries(designs)) {
      await vi.waitFor(() => bed.backend.expectOne(`${T}/axle-designs/${id}`), { timeout: 20_000, interval: 20 }).then((r) =>
        r.flush({ id, vehicleId: 'v-ember', axle: 'rear', name: d.name, revision: 3, status: 'draft', corner: d.corner, updatedAt: '', updatedByName: null }),
      );
    }
    const root = harness.routeNativeElement as HTMLElement;
    await vi.waitFor(
      () => {
        harness.detectChanges();
        if (!root.querySelector(ready)) throw new Error('not compared yet');
      },
      { timeout: 20_000, interval: 50 },
    );
    return { harness, root };
  }

  function row(root: HTMLElement, label: string): string[] {
    const tr = [...root.querySelectorAll('[data-testid="compare-figures"] tbody tr')].find((r) => r.querySelector('th')?.textContent?.trim() === label)!;
    return [...tr.querySelectorAll('td')].map((td) => td.textContent.replace('(differs)', '').trim());
  }

  it('shows labelled key figures grouped by kind, rounded, with their units, never raw result keys', async () => {
    const { root } = await openComparison();
    const table = root.querySelector('[data-testid="compare-figures"]')!;
    const groups = [...table.querySelectorAll('.rw-group-row th')].map((th) => th.textContent.trim());
    expect(groups).toEqual(['In roll', 'Toe over one-wheel bump (rack centred)', 'Camber over bump (rack centred)']);
    // No dotted result path anywhere in the table.
    expect(table.textContent).not.toMatch(/[a-z]+\.[a-z]+[A-Z]/);
    const expected = analyseCorner({ corner: raised, travel: TRAVEL, rackMm: [0], roll: { from: -3, to: 3, step: 0.25 }, pose: { travelMm: 0, rackMm: 0 } });
    const bump = row(root, 'Bump steer (toe-in per bump travel)');
    // Rounded to the quantity's 3 significant figures (core/format/quantities.ts), unit in its own column.
    expect(bump[1]).toBe(String(Number(expected.curves[0]!.bumpSteerDegPerM.toPrecision(3))));
    expect(bump[2]).toBe('deg/m');
    expect(row(root, 'Toe curvature')[2]).toBe('deg/m²');
    expect(row(root, 'Roll steer coefficient ε')[1]).toContain(String(Number(expected.rollSteerCoefficient.toPrecision(3))));
    // The raised toe link changes the bump steer: the variant's cell is marked as differing from the reference.
    const cells = [...table.querySelectorAll('tbody tr')].find((r) => r.textContent?.includes('Bump steer'))!.querySelectorAll('td');
    expect(cells[1]!.classList.contains('rw-differs')).toBe(true);
    expect(cells[0]!.classList.contains('rw-differs')).toBe(false);
  });

  it("says why a design could not be solved in the user's words and units, never the engine's point keys", async () => {
    // A toe link too short to follow the wheel: the engine cannot close it partway into bump.
    const short = structuredClone(exampleCorners.fsRearWishbone);
    const outer = short.points.tieRodOuter;
    short.points.tieRodInner = [outer[0], outer[1] - 30, outer[2] - 25];
    const { harness, root } = await openComparison({ 'd-rear': DESIGNS['d-rear'], 'd-short': { name: 'Short link', corner: short } }, '[role="alert"]');
    const alert = () => [...root.querySelectorAll('[role="alert"]')].map((a) => a.textContent.trim()).find((t) => t.startsWith('Short link'))!;
    expect(alert()).toMatch(/^Short link could not be solved: The linkage cannot reach [\d.]+ mm of bump: the toe link cannot reach\./);
    expect(alert()).not.toContain('tieRodInner');
    const mm = Number(/reach ([\d.]+) mm/.exec(alert())![1]);
    units.set('imperial');
    harness.detectChanges();
    // 1 in = 25.4 mm exactly.
    expect(Number(/reach ([\d.]+) in of bump/.exec(alert())![1])).toBeCloseTo(mm / 25.4, 2);
  });

  it('writes the figures in inch/pound units when the user reads inch/pound', async () => {
    const { harness, root } = await openComparison();
    const reference = analyseCorner({ corner: exampleCorners.fsRearWishbone, travel: TRAVEL, rackMm: [0], roll: { from: -3, to: 3, step: 0.25 }, pose: { travelMm: 0, rackMm: 0 } });
    units.set('imperial');
    harness.detectChanges();
    const bump = row(root, 'Bump steer (toe-in per bump travel)');
    expect(bump[2]).toBe('deg/in');
    // 1 in = 25.4 mm exactly: deg/in = deg/m × 0.0254.
    expect(bump[0]).toBe(String(Number((reference.curves[0]!.bumpSteerDegPerM * 0.0254).toPrecision(3))));
    expect(row(root, 'Toe curvature')[2]).toBe('deg/in²');
    // The travel range and the curves' travel axis follow too: ±25 mm is ±0.9843 in.
    expect(root.querySelector('[data-testid="compare-travel"]')!.textContent).toContain('Travel -0.9843 to 0.9843 in');
    const toeChart = [...root.querySelectorAll('rw-line-chart')].find((c) => c.textContent?.includes('Toe change against wheel travel'))!;
    const ticks = [...toeChart.querySelectorAll('.rw-axis-x text')].map((t) => Math.abs(Number(t.textContent.replace('−', '-'))));
    expect(Math.max(...ticks)).toBeLessThan(1.5);
  });

  it('compares the designs ticked in the Material checkboxes, and keeps them in the address', async () => {
    const harness = await RouterTestingHarness.create();
    await harness.navigateByUrl('/teams/t-tal/vehicles/v-ember/compare', ComparePage);
    await settle();
    bed.backend.expectOne(`${T}/vehicles/v-ember/axle-designs`).flush(
      Object.entries(DESIGNS).map(([id, d]) => ({ id, axle: 'rear', name: d.name, revision: 3, status: 'draft', updatedAt: '' })),
    );
    await settle();
    harness.detectChanges();
    const root = harness.routeNativeElement as HTMLElement;
    const compareButton = () => [...root.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent.trim() === 'Compare')!;
    clickToggle(root, 'Rear baseline');
    harness.detectChanges();
    expect(root.querySelector('[role="status"]')!.textContent).toContain('Choose at least two designs.');
    expect(compareButton().disabled).toBe(true);
    clickToggle(root, 'Rear +6');
    harness.detectChanges();
    expect(compareButton().disabled).toBe(false);
    compareButton().click();
    for (const [id, d] of Object.entries(DESIGNS)) {
      await vi.waitFor(() => bed.backend.expectOne(`${T}/axle-designs/${id}`), { timeout: 20_000, interval: 20 }).then((r) =>
        r.flush({ id, vehicleId: 'v-ember', axle: 'rear', name: d.name, revision: 3, status: 'draft', corner: d.corner, updatedAt: '', updatedByName: null }),
      );
    }
    await vi.waitFor(
      () => {
        harness.detectChanges();
        if (!root.querySelector('[data-testid="compare-figures"]')) throw new Error('not compared yet');
      },
      { timeout: 20_000, interval: 50 },
    );
    expect(TestBed.inject(Router).url).toBe('/teams/t-tal/vehicles/v-ember/compare?designs=d-rear,d-rear6');
  });
});
