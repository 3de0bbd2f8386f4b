import { TestRequest } from '@angular/common/http/testing';
import { RouterTestingHarness } from '@angular/router/testing';
import { computeBalance } from '../../../../shared/balance/api';
import { exampleVehicles } from '../../../../shared/balance/examples';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { DesignReportPage } from './design-report-page';
import { useRoutedPage } from '../../../testing/routed-page';
import type { AxleName } from '../../../../shared/schema/axle';
import type { Corner } from '../../../../shared/schema/corner';

const T = '/api/teams/t-tal';
const design = (id: string, axle: AxleName, revision: number, updatedByName: string) => ({
  id,
  vehicleId: 'v-ember',
  axle,
  name: axle === 'front' ? 'Front baseline' : 'Rear, raised toe link',
  revision,
  status: 'accepted',
  corner: axle === 'front' ? exampleCorners.fsFrontWishbone : exampleCorners.fsRearWishbone,
  updatedAt: '2026-12-01T10:00:00.000Z',
  updatedByName,
});

/** Answers each request the report makes as the server would (the balance by the real engine). */
function answer(req: TestRequest): void {
  const url = req.request.url;
  if (url === `${T}/axle-designs/d-rear`) req.flush(design('d-rear', 'rear', 2, 'Dana Quist'));
  else if (url === `${T}/axle-designs/d-front`) req.flush(design('d-front', 'front', 1, 'Dana Quist'));
  else if (url === `${T}/vehicles/v-ember`) req.flush({ id: 'v-ember', name: 'TUR-26 Ember', archived: false, revision: 1, data: exampleVehicles.tur26Ember, updatedAt: '', updatedByName: null });
  else if (url === `${T}/vehicles/v-ember/axle-designs`) req.flush([design('d-front', 'front', 1, 'Dana Quist'), design('d-rear', 'rear', 2, 'Dana Quist')]);
  else if (url === `${T}/axle-designs/d-rear/revisions`)
    req.flush([
      { revision: 2, message: 'solve for −0.02', authorName: 'Eli Marsh', createdAt: '2026-12-01T10:00:00.000Z' },
      { revision: 1, message: 'Demo data', authorName: 'Dana Quist', createdAt: '2026-11-01T10:00:00.000Z' },
    ]);
  else if (url === `${T}/axle-designs/d-rear/proposals`)
    req.flush([
      { id: 'p1', designId: 'd-rear', baseRevision: 1, status: 'accepted', message: 'solve for −0.02', origin: null, authorName: 'Eli Marsh', createdAt: '', decidedByName: 'Dana Quist', decidedAt: '', acceptedRevision: 2 },
    ]);
  else if (url === '/api/compute/balance') req.flush({ engineVersion: 'test', result: computeBalance(req.request.body) });
  else throw new Error(`unexpected request ${url}`);
}

describe('DesignReportPage', () => {
  const bed = useRoutedPage('teams/:teamId/vehicles/:vehicleId/axle-designs/:designId/report', DesignReportPage);
  const units = bed.units;

  /** Opens the report and serves its requests (through `serve`, `answer` unless given) until `complete` holds. */
  async function open(
    serve: (req: TestRequest) => void = answer,
    complete = (root: HTMLElement) => !!root.querySelector('[data-testid="report-fit-range"]') && !!root.querySelector('rw-bar-chart') && !!root.textContent?.includes('accepted by'),
  ) {
    const harness = await RouterTestingHarness.create();
    await harness.navigateByUrl('/teams/t-tal/vehicles/v-ember/axle-designs/d-rear/report', DesignReportPage);
    const root = harness.routeNativeElement as HTMLElement;
    await vi.waitFor(
      () => {
        bed.backend.match(() => true).forEach(serve);
        harness.detectChanges();
        if (!complete(root)) throw new Error('report not complete yet');
      },
      { timeout: 30_000, interval: 30 },
    );
    return { harness, root };
  }

  it('names the revision author as its revision list does, with who accepted it, and lists the author\'s own notes', async () => {
    const { root } = await open();
    const revision = root.querySelector('[data-testid="report-revision"]')!.textContent;
    expect(revision).toContain('2 (accepted) by Eli Marsh, accepted by Dana Quist');
    expect(root.textContent).toContain('Revision 2 · Eli Marsh');
    expect(root.textContent).toContain('— solve for −0.02');
    bed.backend.verify();
  });

  it('writes its figures and curves in inch/pound units when the user reads inch/pound, and says which units it uses', async () => {
    units.set('imperial');
    const { root } = await open();
    // ±25 mm of travel is ±0.9843 in (1 in = 25.4 mm exactly).
    expect(root.querySelector('[data-testid="report-fit-range"]')!.textContent).toContain('Fitted over -0.9843 to 0.9843 in of travel');
    const headers = [...root.querySelectorAll('.rw-report-table thead th')].map((th) => th.textContent.trim());
    expect(headers).toContain('Bump steer (deg/in)');
    expect(headers).toContain('Toe curvature (deg/in²)');
    expect(root.querySelector('[data-testid="report-units"]')!.textContent).toContain('Inch/pound');
    expect(root.querySelector('rw-safety-caution')).not.toBeNull();
    bed.backend.verify();
  });

  it('says which part could not be loaded, in the server\'s words, and shows the rest', async () => {
    const refuse = (req: TestRequest) => req.flush({ error: { code: 'unavailable', message: 'The server is busy; try again in a minute.' } }, { status: 503, statusText: 'Service Unavailable' });
    const { root } = await open(
      (req) => (req.request.url.endsWith('/revisions') || req.request.url.endsWith('/proposals') ? refuse(req) : answer(req)),
      (r) => !!r.querySelector('[data-testid="report-fit-range"]') && !!r.querySelector('rw-bar-chart') && r.querySelectorAll('[role="alert"]').length >= 2,
    );
    const alerts = [...root.querySelectorAll('[role="alert"]')].map((a) => a.textContent.trim());
    expect(alerts).toContain('The revision history could not be loaded: The server is busy; try again in a minute.');
    expect(alerts).toContain('The proposals could not be loaded: The server is busy; try again in a minute.');
    // Without the revision list the author is the record's last writer; the kinematics and the budget are there.
    expect(root.querySelector('[data-testid="report-revision"]')!.textContent).toContain('2 (accepted) by Dana Quist');
    expect(root.textContent).toContain('With the front axle design "Front baseline".');
    bed.backend.verify();
  });

  it('says the vehicle could not be loaded and still solves the kinematics without its ride data', async () => {
    const { root } = await open(
      (req) => (req.request.url === `${T}/vehicles/v-ember` ? req.flush({ error: { code: 'not_found', message: 'Vehicle not found' } }, { status: 404, statusText: 'Not Found' }) : answer(req)),
      (r) => !!r.querySelector('[data-testid="report-fit-range"]') && !!r.textContent?.includes('accepted by'),
    );
    expect(root.textContent).toContain('No understeer budget: the vehicle could not be loaded: Vehicle not found');
    expect(root.querySelector('rw-bar-chart')).toBeNull();
    expect(root.querySelector('.rw-report-meta')!.textContent).toContain('could not be loaded: Vehicle not found');
    bed.backend.verify();
  });

  /** Serves the rear design with `corner` in place of the demo's, everything else as `answer` does. */
  const withCorner = (corner: Corner) => (req: TestRequest) =>
    req.request.url === `${T}/axle-designs/d-rear` ? req.flush({ ...design('d-rear', 'rear', 2, 'Dana Quist'), corner }) : answer(req);
  const inputRows = (root: HTMLElement) =>
    Object.fromEntries(
      [...root.querySelectorAll('[data-testid="report-corner-inputs"] tbody tr')]
        .filter((tr) => tr.querySelector('th[scope="row"]'))
        .map((tr) => [tr.querySelector('th')!.textContent.trim(), [...tr.querySelectorAll('td')].map((td) => td.textContent.trim()).join(' | ')]),
    );

  it('lists the steering, what the parts ride on and every compliance rate, "rigid" where none is given', async () => {
    const rear = exampleCorners.fsRearWishbone;
    const { root } = await open(withCorner({ ...rear, bushings: { lowerFront: { radialNPerMm: 2000, axialNPerMm: 500 } }, linkAxialNPerMm: { tieRod: 9000 } }));
    const rows = inputRows(root);
    expect(rows['Steered']).toBe('no: a fixed toe link | ');
    expect(rows['Steered by']).toBeUndefined();
    expect(rows['Bushing, Lower arm, front pivot (radial, axial)']).toBe('2000, 500 | N/mm');
    expect(rows['Bushing, Lower arm, rear pivot (radial, axial)']).toBe('rigid | ');
    expect(rows['Link rate, Toe link, axial']).toBe('9000 | N/mm');
    expect(rows['Spring, suspension end rides on']).toBe('lower arm | ');
    expect(rows['Anti-roll bar drop link, suspension end rides on']).toBe('upper arm | ');
    // A fixed toe link has no steering rate to list.
    expect(Object.keys(rows).filter((k) => k.startsWith('Steering rate'))).toEqual([]);
    const groups = [...root.querySelectorAll('[data-testid="report-corner-inputs"] th[scope="colgroup"]')].map((th) => th.textContent.trim());
    expect(groups).toEqual(['Steering', 'What the parts ride on', 'Compliance']);
  });

  it('lists a steering-box arm and the rates in inch/pound units (1 in = 25.4 mm, 1 lbf = 4.4482216152605 N; NIST SP 811)', async () => {
    units.set('imperial');
    const front = exampleCorners.fsFrontWishbone;
    const arm: Corner = {
      ...front,
      steering: { kind: 'arm', armAxisPoint: [-50.8, 152.4, 139.7], armAxisDirection: [0, 0, 1], angularStrokeDeg: [-30, 30] },
      steeringStiffnessNPerMm: 17.512683524647638,
    };
    const { root } = await open(withCorner(arm));
    const rows = inputRows(root);
    expect(rows['Steered']).toBe('yes | ');
    expect(rows['Steered by']).toBe('steering-box arm | ');
    expect(rows['Arm stroke (one end, other end)']).toBe('−30, 30 | deg');
    // −50.8, 152.4, 139.7 mm are −2, 6, 5.5 in exactly.
    expect(rows['Arm pivot point (x, y, z)']).toBe('−2, 6, 5.5 | in');
    expect(rows['Arm axis direction (x, y, z)']).toBe('0, 0, 1 | ');
    // 17.5127 N/mm is 100 lbf/in.
    expect(rows['Steering rate, steering at the rack, along its travel']).toBe('100 | lbf/in');
    expect(rows['Link rate, Tie rod, axial']).toBe('rigid | ');
  });
});
