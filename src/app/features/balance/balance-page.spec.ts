import { RouterTestingHarness } from '@angular/router/testing';
import { computeBalance } from '../../../../shared/balance/api';
import { exampleVehicles } from '../../../../shared/balance/examples';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { BalancePage } from './balance-page';
import { settle } from '../../../testing/settle';
import { formatNum } from '../../core/format/num';
import { useRoutedPage } from '../../../testing/routed-page';

const T = '/api/teams/t-tal';
const raised = structuredClone(exampleCorners.fsRearWishbone);
raised.points.tieRodInner[2] += 6;
const CORNERS: Record<string, typeof exampleCorners.fsFrontWishbone> = {
  'd-front': exampleCorners.fsFrontWishbone,
  'd-rear': exampleCorners.fsRearWishbone,
  'd-rear6': raised,
};

describe('BalancePage', () => {
  const bed = useRoutedPage('teams/:teamId/vehicles/:vehicleId/balance', BalancePage);
  const units = bed.units;

  const DESIGNS = [
    { id: 'd-front', axle: 'front', name: 'Front baseline', revision: 1, status: 'draft', updatedAt: '' },
    { id: 'd-rear', axle: 'rear', name: 'Rear baseline', revision: 1, status: 'draft', updatedAt: '' },
    { id: 'd-rear6', axle: 'rear', name: 'Rear +6', revision: 1, status: 'draft', updatedAt: '' },
  ];

  /** Opens the page and answers its loads; the evaluation starts by itself (no button). */
  async function open() {
    const harness = await RouterTestingHarness.create();
    await harness.navigateByUrl('/teams/t-tal/vehicles/v-ember/balance', BalancePage);
    bed.backend.expectOne(`${T}/vehicles/v-ember`).flush({ id: 'v-ember', name: 'TUR-26 Ember', archived: false, revision: 1, data: exampleVehicles.tur26Ember, updatedAt: '', updatedByName: null });
    bed.backend.expectOne(`${T}/vehicles/v-ember/axle-designs`).flush(DESIGNS);
    await settle();
    return { harness, root: harness.routeNativeElement as HTMLElement };
  }

  /** Answers the corner reads still open, then the balance request with the real engine (as the server's worker would). */
  async function answerEvaluation() {
    for (const id of Object.keys(CORNERS)) {
      bed.backend.match(`${T}/axle-designs/${id}`).forEach((r) => r.flush({ id, vehicleId: 'v-ember', axle: id === 'd-front' ? 'front' : 'rear', name: id, revision: 1, status: 'draft', corner: CORNERS[id], updatedAt: '', updatedByName: null }));
    }
    await settle();
    const req = bed.backend.expectOne('/api/compute/balance');
    const result = computeBalance(req.request.body);
    req.flush({ engineVersion: 'test', result });
    await settle();
    return { body: req.request.body, result };
  }

  /** Picks an option of the Material select labelled `label` in the fieldset `legend`, as a user does (open, click). */
  function choose(root: HTMLElement, legend: string, label: string, optionText: string) {
    const fieldset = [...root.querySelectorAll('fieldset')].find((f) => f.querySelector('legend')?.textContent?.trim() === legend)!;
    const field = [...fieldset.querySelectorAll('mat-form-field')].find((l) => l.querySelector('mat-label')?.textContent?.includes(label))!;
    (field.querySelector('.mat-mdc-select-trigger') as HTMLElement).click();
    [...document.querySelectorAll<HTMLElement>('mat-option')].find((o) => o.textContent?.trim() === optionText)!.click();
  }

  it('evaluates on open, without a button, baseline and variant side by side with changes highlighted', async () => {
    const { harness, root } = await open();
    expect([...root.querySelectorAll('button')].some((b) => b.textContent?.trim() === 'Evaluate')).toBe(false);
    // One component family: Material selects and form fields, no native controls beside them.
    expect(root.querySelectorAll('select, input:not(.mat-mdc-input-element)').length).toBe(0);
    expect(root.querySelectorAll('mat-select').length).toBe(4);
    const { body, result } = await answerEvaluation();
    expect(body.rearCorner).toEqual(exampleCorners.fsRearWishbone);
    expect(body.variant.rearCorner.points.tieRodInner[2]).toBe(exampleCorners.fsRearWishbone.points.tieRodInner[2] + 6);
    harness.detectChanges();

    const rollSteerBars = root.querySelectorAll('rw-bar-chart [data-group="Roll steer"] rect');
    expect(rollSteerBars.length).toBe(2);
    const row = [...root.querySelectorAll('[data-testid="key-figures"] tr')].find((tr) => tr.textContent?.includes('Roll steer term'))!;
    const cells = [...row.querySelectorAll('td')].map((td) => td.textContent.trim());
    expect(Number(cells[0])).toBeCloseTo(result.understeerBudget.rollSteer, 3);
    expect(Number(cells[1])).toBeCloseTo(result.comparison!.variant.understeerBudget.rollSteer, 3);
    expect(row.classList.contains('rw-differs')).toBe(true);
    // The on-centre K (speeds, gains, step steer) is shown beside K at the budget's lateral acceleration, and the tyre law is named.
    const k0 = [...root.querySelectorAll('[data-testid="key-figures"] tr')].find((tr) => tr.textContent?.includes('on-centre'))!;
    expect(Number(k0.querySelectorAll('td')[0]!.textContent)).toBeCloseTo(result.onCentreUndersteerGradientDegPerG, 3);
    expect(root.textContent).toContain('Tyre stiffness at other loads');
    expect(root.querySelectorAll('rw-line-chart').length).toBe(3);
    expect(root.querySelector('rw-safety-caution')).not.toBeNull();
    expect(root.querySelector('[data-testid="out-of-date"]')).toBeNull();
    // Where each linked value came from, in words rather than the model's source codes.
    const used = root.querySelector('.rw-link-notes')!.textContent;
    expect(used).toContain("(from the axle design's kinematics)");
    expect(used).not.toMatch(/\((kinematics|vehicle|not-applicable)\)/);
  });

  it('names in its legend the designs actually compared: only the rear differs, so only the rear is named', async () => {
    const { harness, root } = await open();
    await answerEvaluation();
    harness.detectChanges();
    const table = root.querySelector('rw-bar-chart table') ?? root.querySelector('rw-bar-chart');
    expect(table!.textContent).toContain('Baseline: rear Rear baseline');
    expect(table!.textContent).toContain('Variant: rear Rear +6');
    expect(root.querySelector('[data-testid="evaluated-inputs"]')!.textContent).toContain('Variant: rear Rear +6.');
  });

  it('says the step is a road-wheel angle, with its handwheel angle, and ends the time axis once the transient has settled', async () => {
    const { harness, root } = await open();
    const { result } = await answerEvaluation();
    harness.detectChanges();
    const chart = [...root.querySelectorAll('rw-line-chart')].find((c) => c.querySelector('figcaption')?.textContent?.includes('Yaw rate after a step'))!;
    const title = chart.querySelector('figcaption')!.textContent;
    const ratio = exampleVehicles.tur26Ember.steeringRatio!;
    expect(title).toContain('1 deg road-wheel angle');
    expect(title).toContain(`${Number((ratio * 1).toPrecision(3))} deg at the handwheel`);
    // The time axis covers the slower case's settling (2 % band, ISO 7401 style) but not the whole 3 s simulated.
    const settled = Math.max(result.stepSteer.settlingTimeS!, result.comparison!.variant.stepSteer.settlingTimeS!);
    const ticks = [...chart.querySelectorAll('.rw-axis-x text')].map((t) => Number(t.textContent.replace('−', '-')));
    expect(result.stepSteer.durationS).toBe(3);
    expect(settled).toBeLessThan(1);
    expect(Math.max(...ticks)).toBeGreaterThanOrEqual(settled);
    expect(Math.max(...ticks)).toBeLessThan(result.stepSteer.durationS);
  });

  it('marks the result out of date under new choices until their evaluation arrives, then shows the new one', async () => {
    const { harness, root } = await open();
    await answerEvaluation();
    harness.detectChanges();
    choose(root, 'Variant', 'Rear axle design', 'Rear baseline');
    await settle();
    harness.detectChanges();
    // The comparison on screen is no longer the one chosen: said in words, while the new evaluation runs.
    expect(root.querySelector('[data-testid="out-of-date"]')!.textContent).toContain('A new evaluation is running');
    expect(root.querySelector('[data-testid="no-variant"]')).not.toBeNull();
    const { body } = await answerEvaluation();
    expect(body.variant).toBeUndefined();
    harness.detectChanges();
    expect(root.querySelector('[data-testid="out-of-date"]')).toBeNull();
    expect(root.querySelectorAll('rw-bar-chart [data-group="Roll steer"] rect').length).toBe(1);
    expect(root.querySelector('[data-testid="evaluated-inputs"]')!.textContent).toContain('Baseline: front Front baseline, rear Rear baseline.');
  });

  it('says beside the field what is wrong with a condition, sends nothing and marks the result out of date', async () => {
    const { harness, root } = await open();
    await answerEvaluation();
    harness.detectChanges();
    const [speed, radius] = [...root.querySelectorAll('fieldset input')] as HTMLInputElement[];
    speed!.value = '500';
    speed!.dispatchEvent(new Event('change'));
    radius!.value = 'wide';
    radius!.dispatchEvent(new Event('change'));
    await settle();
    harness.detectChanges();
    // Both at once, each in the user's words (the request's limits: shared/balance/api.ts).
    expect(root.querySelector('[data-testid="speed-error"]')!.textContent).toBe('500 is outside 1 to 400 km/h.');
    expect(root.querySelector('[data-testid="radius-error"]')!.textContent).toBe('"wide" is not a number.');
    expect(speed!.getAttribute('aria-invalid')).toBe('true');
    bed.backend.expectNone('/api/compute/balance');
    expect(root.querySelector('[data-testid="out-of-date"]')!.textContent).toContain('Correct the entries above');
  });

  it('writes speeds, radii, roll stiffness and load transfer in inch/pound units when the user reads inch/pound, and names inputs in words', async () => {
    units.set('imperial');
    const { harness, root } = await open();
    harness.detectChanges();
    const [speed, radius] = [...root.querySelectorAll('fieldset input')] as HTMLInputElement[];
    // 80 km/h and 40 m in mph and ft (1 mi = 1609.344 m, 1 ft = 0.3048 m exactly).
    expect(speed!.value).toBe('49.71');
    expect(radius!.value).toBe('131.2');
    expect(speed!.closest('mat-form-field')!.querySelector('mat-label')!.textContent).toContain('(mph)');
    const { body, result } = await answerEvaluation();
    expect(body.speedKph).toBeCloseTo((49.71 * 1609.344) / 1000, 9);
    // The field shows 131.2 ft (4 significant figures of 131.23 ft), which is 39.99 m: what is typed is what is sent.
    expect(body.cornerRadiusM).toBeCloseTo(131.2 * 0.3048, 9);
    harness.detectChanges();
    const figure = (label: string) => [...root.querySelectorAll('[data-testid="key-figures"] tr')].find((tr) => tr.querySelector('th')?.textContent?.trim() === label)!;
    const stiffness = figure('Roll stiffness, front');
    expect(stiffness.lastElementChild!.textContent.trim()).toBe('lbf·ft/deg');
    // 1 lbf·ft = 4.4482216152605 N × 0.3048 m.
    expect(Number(stiffness.querySelector('td')!.textContent)).toBeCloseTo(result.rollStiffnessNmPerDeg.front / (4.4482216152605 * 0.3048), 0);
    expect(figure('Lateral load transfer, front').lastElementChild!.textContent.trim()).toBe('lbf/g');
    expect(root.querySelector('[data-testid="evaluated-inputs"]')!.textContent).toContain('49.71 mph');
    // The sensitivity ranking names each input by its label, never by its document key.
    const inputs = [...root.querySelectorAll('table')].find((t) => t.querySelector('caption')?.textContent?.includes('ranked'))!;
    expect(inputs.querySelectorAll('tbody tr').length).toBeGreaterThan(0);
    expect(inputs.textContent).not.toMatch(/\b(front|rear)\.[a-z]/);
    // Tyre load sensitivity b per lbf, NIST SP 811 (2008), Appendix B: 1 lbf = 4.4482216152605 N, so 0.00022 per N
    // is 0.0009786 per lbf (4 significant figures); never the SI figure under an inch/pound heading.
    const bPerLbf = formatNum(exampleVehicles.tur26Ember.front.tyre.loadSensitivity!.b * 4.4482216152605, { sig: 4 });
    expect(bPerLbf).toBe('0.0009786');
    const bRow = [...inputs.querySelectorAll('tbody tr')].find((tr) => tr.querySelector('th')?.textContent?.trim() === 'Front axle, load sensitivity b')!;
    expect(bRow.querySelector('td')!.textContent.trim()).toBe(`${bPerLbf} 1/(deg·lbf)`);
    expect(root.querySelector('[data-testid="evaluated-inputs"]')!.textContent).toContain(`b = ${bPerLbf} 1/(deg·lbf)`);
    expect(root.querySelector('[data-testid="evaluated-inputs"]')!.textContent).not.toContain('1/(deg·N)');
    // No SI unit left in the ranked inputs (their first 12), whatever input ranks there.
    expect(inputs.textContent).not.toMatch(/N·s\/mm|N·m·s\/deg|1\/\(deg·N\)|N\/deg\b|N·m\/deg|\d mm\b|\d kg\b/);
  });
});
