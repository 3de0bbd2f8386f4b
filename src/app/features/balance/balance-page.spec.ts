import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { computeBalance } from '../../../../shared/balance/api';
import { exampleVehicles } from '../../../../shared/balance/examples';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { BalancePage } from './balance-page';

const settle = () => new Promise((resolve) => setTimeout(resolve, 0));
const T = '/api/teams/t-tal';
const raised = structuredClone(exampleCorners.fsRearWishbone);
raised.points.tieRodInner[2] += 6;
const CORNERS: Record<string, typeof exampleCorners.fsFrontWishbone> = {
  'd-front': exampleCorners.fsFrontWishbone,
  'd-rear': exampleCorners.fsRearWishbone,
  'd-rear6': raised,
};

describe('BalancePage', () => {
  let backend: HttpTestingController;

  beforeEach(async () => {
    await TestBed.configureTestingModule({
      providers: [provideRouter([{ path: 'teams/:teamId/vehicles/:vehicleId/balance', component: BalancePage }]), provideHttpClient(), provideHttpClientTesting()],
    }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  it('evaluates baseline and variant designs and shows the budget side by side with changes highlighted', async () => {
    const harness = await RouterTestingHarness.create();
    await harness.navigateByUrl('/teams/t-tal/vehicles/v-ember/balance', BalancePage);
    backend.expectOne(`${T}/vehicles/v-ember`).flush({ id: 'v-ember', name: 'TUR-26 Ember', archived: false, revision: 1, data: exampleVehicles.tur26Ember, updatedAt: '', updatedByName: null });
    backend.expectOne(`${T}/vehicles/v-ember/axle-designs`).flush([
      { id: 'd-front', axle: 'front', name: 'Front baseline', revision: 1, status: 'draft', updatedAt: '' },
      { id: 'd-rear', axle: 'rear', name: 'Rear baseline', revision: 1, status: 'draft', updatedAt: '' },
      { id: 'd-rear6', axle: 'rear', name: 'Rear +6', revision: 1, status: 'draft', updatedAt: '' },
    ]);
    await settle();
    harness.detectChanges();
    const root = harness.routeNativeElement as HTMLElement;
    [...root.querySelectorAll('button')].find((b) => b.textContent?.trim() === 'Evaluate')!.click();
    await settle();
    for (const id of ['d-front', 'd-rear', 'd-front', 'd-rear6']) {
      const reqs = backend.match(`${T}/axle-designs/${id}`);
      reqs.forEach((r) => r.flush({ id, vehicleId: 'v-ember', axle: id === 'd-front' ? 'front' : 'rear', name: id, revision: 1, status: 'draft', corner: CORNERS[id], updatedAt: '', updatedByName: null }));
    }
    await settle();
    const req = backend.expectOne('/api/compute/balance');
    expect(req.request.body.rearCorner).toEqual(exampleCorners.fsRearWishbone);
    expect(req.request.body.variant.rearCorner.points.tieRodInner[2]).toBe(exampleCorners.fsRearWishbone.points.tieRodInner[2] + 6);
    // The real balance engine answers, as the server's worker would.
    const result = computeBalance(req.request.body);
    req.flush({ engineVersion: 'test', result });
    await settle();
    harness.detectChanges();

    const rollSteerBars = root.querySelectorAll('rw-bar-chart [data-group="Roll steer"] rect');
    expect(rollSteerBars.length).toBe(2);
    const row = [...root.querySelectorAll('[data-testid="key-figures"] tr')].find((tr) => tr.textContent?.includes('Roll steer term'))!;
    const cells = [...row.querySelectorAll('td')].map((td) => td.textContent!.trim());
    expect(Number(cells[0])).toBeCloseTo(result.understeerBudget.rollSteer, 3);
    expect(Number(cells[1])).toBeCloseTo(result.comparison!.variant.understeerBudget.rollSteer, 3);
    expect(row.classList.contains('rw-differs')).toBe(true);
    // The on-centre K (speeds, gains, step steer) is shown beside K at the budget's lateral acceleration, and the tyre law is named.
    const k0 = [...root.querySelectorAll('[data-testid="key-figures"] tr')].find((tr) => tr.textContent?.includes('on-centre'))!;
    expect(Number(k0.querySelectorAll('td')[0]!.textContent)).toBeCloseTo(result.onCentreUndersteerGradientDegPerG, 3);
    expect(root.textContent).toContain('Tyre stiffness at other loads');
    expect(root.querySelectorAll('rw-line-chart').length).toBe(3);
    expect(root.querySelector('rw-safety-caution')).not.toBeNull();
  });
});
