/**
 * Browser test of the intent panel (issue 6, "How it is checked"): as the
 * demo engineer set a rear roll-steer target on TUR-26 Ember's rear
 * baseline, solve in the page's worker with a progress indicator, see the
 * verified ε, the cautions and the workshop numbers, propose the geometry as
 * a draft; as the demo designer accept it in the editor and see the new
 * revision with the proposed ε. Sign convention of shared/docs/domain.md:
 * "rear roll understeer of 0.06" means ε_r = −0.06.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { consoleErrors, offsiteRequests, openBrowser, saveScreenshot, seriousA11yViolations, signIn, useE2eApp } from '../support/e2e.js';

type Browser = Awaited<ReturnType<typeof openBrowser>>;

const TARGET_EPSILON = -0.06;
/** Target tolerance of the back-solver (issue 5: within 0.002 deg/deg); the screen prints 4 decimals. */
const TARGET_TOL = 0.002;

async function openRearBaseline(page: Page): Promise<void> {
  await page.getByRole('link', { name: 'TUR-26 Ember' }).click();
  await page.getByRole('heading', { name: 'TUR-26 Ember' }).waitFor();
  await page.getByRole('link', { name: 'Rear baseline' }).click();
  await page.getByRole('heading', { name: /Rear baseline/ }).waitFor();
  await page.locator('[data-testid="toe-chart"] path.rw-series-line').first().waitFor();
}

describe('Intent panel in Chromium', () => {
  const env = useE2eApp();

  it('solves a rear roll-steer target, proposes it, and the designer accepts it', async () => {
    const engineer = await env.browser.newPage();
    await signIn(engineer, env.app.baseUrl, 'engineer@tallowmere.example');
    await engineer.goto(env.app.baseUrl + '/teams');
    await engineer.getByRole('link', { name: /Tallowmere/ }).first().click();
    await openRearBaseline(engineer);
    const editorPath = new URL(engineer.url()).pathname;
    const epsilonBefore = Number(await engineer.getByTestId('epsilon').innerText());

    await engineer.getByRole('link', { name: 'Handling intent' }).click();
    await engineer.getByRole('heading', { name: /Handling intent/ }).waitFor();
    await engineer.getByLabel('Roll steer coefficient ε (deg/deg)').check();
    await engineer.getByLabel('Target value').fill(String(TARGET_EPSILON));
    await engineer.getByText('roll understeer', { exact: true }).waitFor();
    await engineer.getByRole('button', { name: 'Solve' }).click();
    await engineer.getByTestId('intent-result').waitFor({ timeout: 60_000 });

    const achieved = Number((await engineer.getByTestId('achieved-epsilon').innerText()).split(' ')[0]);
    expect(Math.abs(achieved - TARGET_EPSILON)).toBeLessThanOrEqual(TARGET_TOL);
    expect(Math.abs(achieved - epsilonBefore)).toBeGreaterThan(TARGET_TOL);
    await expect(engineer.getByTestId('achieved-epsilon').innerText()).resolves.toContain('roll understeer');
    // TUR-26 Ember has full vehicle data, so the understeer change is a number of deg/g.
    await expect(engineer.getByTestId('understeer-change').innerText()).resolves.toMatch(/^-?\d+\.\d{3} deg\/g$/);
    await engineer.getByTestId('workshop').getByText('Length of the toe link').waitFor();
    await engineer.locator('rw-caution-list li').first().waitFor();
    await engineer.getByText('Design estimates from an idealised rigid-link model.', { exact: false }).waitFor();
    expect(await seriousA11yViolations(engineer)).toEqual([]);
    await saveScreenshot(engineer, 'intent-engineer-result');

    await engineer.getByRole('button', { name: 'Propose as draft revision' }).click();
    await engineer.getByText(/Proposed as a draft on revision 1/).waitFor();
    expect(offsiteRequests(engineer)).toEqual([]);
    expect(consoleErrors(engineer)).toEqual([]);
    await engineer.close();

    const designer = await env.browser.newPage();
    await signIn(designer, env.app.baseUrl, 'designer@tallowmere.example');
    await designer.goto(env.app.baseUrl + editorPath);
    await designer.getByRole('heading', { name: 'Proposed geometry waiting for a designer' }).waitFor();
    await designer.getByRole('button', { name: 'Accept as new revision' }).click();
    await designer.getByText(/Accepted the proposal from Eli Marsh: now revision 2\./).waitFor();
    await expect(designer.getByTestId('revision').innerText()).resolves.toMatch(/^Revision 2\b/);
    // The editor shows ε of the accepted geometry once its worker has solved it: wait for what the designer reads.
    await expect
      .poll(async () => Number(await designer.getByTestId('epsilon').textContent()), { timeout: 30_000 })
      .toSatisfy((shown: number) => Math.abs(shown - TARGET_EPSILON) <= TARGET_TOL);
    await saveScreenshot(designer, 'intent-designer-accepted');

    // The balance view evaluates the vehicle with the accepted rear design; its
    // roll-steer term is what the balance API reports for the same request.
    await designer.getByRole('link', { name: 'Vehicle', exact: true }).click();
    await designer.getByRole('link', { name: /^Balance view/ }).click();
    await designer.getByRole('heading', { name: /^Balance/ }).waitFor();
    // It evaluates on open: no button to press.
    await designer.getByTestId('balance-result').waitFor({ timeout: 60_000 });
    const rollSteerRow = designer.getByTestId('key-figures').locator('tr', { hasText: 'Roll steer term' });
    const shownRollSteer = Number(await rollSteerRow.locator('td').first().innerText());
    const teamPath = editorPath.split('/vehicles/')[0]!;
    const vehicleId = editorPath.split('/vehicles/')[1]!.split('/')[0]!;
    const apiRollSteer = await designer.evaluate(
      async ({ teamPath: t, vehicleId: vid }) => {
        const get = async (url: string) => (await fetch(url)).json();
        const api = '/api' + t;
        const vehicle = await get(`${api}/vehicles/${vid}`);
        const designs: { id: string; axle: string }[] = await get(`${api}/vehicles/${vid}/axle-designs`);
        const front = await get(`${api}/axle-designs/${designs.find((d) => d.axle === 'front')!.id}`);
        const rear = await get(`${api}/axle-designs/${designs.find((d) => d.axle === 'rear')!.id}`);
        const res = await fetch('/api/compute/balance', {
          method: 'POST',
          headers: { 'Content-Type': 'application/json', 'X-Rollwise-Request': '1' },
          body: JSON.stringify({ vehicle: vehicle.data, frontCorner: front.corner, rearCorner: rear.corner, speedKph: 80, cornerRadiusM: 40 }),
        });
        return (await res.json()).result.understeerBudget.rollSteer as number;
      },
      { teamPath, vehicleId },
    );
    expect(shownRollSteer).toBeCloseTo(apiRollSteer, 3);
    expect(await seriousA11yViolations(designer)).toEqual([]);
    await saveScreenshot(designer, 'balance-after-accept');

    // Compare the accepted rear design with the seeded +6 mm variant: ε differs and is highlighted.
    await designer.getByRole('link', { name: 'Vehicle', exact: true }).click();
    await designer.getByRole('link', { name: 'Compare axle designs' }).click();
    await designer.getByRole('checkbox', { name: /^Rear baseline/ }).check();
    await designer.getByRole('checkbox', { name: /toe link inner \+6 mm/ }).check();
    await designer.getByRole('button', { name: 'Compare' }).click();
    await designer.getByTestId('compare-result').waitFor({ timeout: 60_000 });
    const epsRow = designer.locator('.rw-compare-table tr', { hasText: 'Roll steer coefficient' });
    const cells = epsRow.locator('td');
    expect(Number((await cells.nth(0).innerText()).split(/\s/)[0])).toBeCloseTo(TARGET_EPSILON, 2);
    await expect(cells.nth(1).getAttribute('class')).resolves.toContain('rw-differs');
    await expect(designer.locator('.rw-compare-charts svg.rw-chart-svg').first().locator('path.rw-series-line').count()).resolves.toBe(2);
    expect(await seriousA11yViolations(designer)).toEqual([]);
    await saveScreenshot(designer, 'compare-rear-designs');

    // The printable report of the accepted revision carries its cautions and the safety caution; print drops the app's header.
    await designer.goto(env.app.baseUrl + editorPath + '/report');
    await designer.getByRole('heading', { name: 'Axle design report: Rear baseline' }).waitFor();
    await designer.getByText(/accepted as this revision/).waitFor();
    await designer.locator('[data-testid="report"] rw-caution-list li').first().waitFor();
    await designer.locator('[data-testid="report"] rw-line-chart path.rw-series-line').first().waitFor();
    await designer.locator('[data-testid="report"] rw-bar-chart rect.rw-bar').first().waitFor();
    await designer.emulateMedia({ media: 'print' });
    await expect(designer.locator('rw-root > header').isVisible()).resolves.toBe(false);
    await expect(designer.getByRole('button', { name: 'Print' }).isVisible()).resolves.toBe(false);
    await expect(designer.locator('rw-safety-caution').isVisible()).resolves.toBe(true);
    await saveScreenshot(designer, 'report-print');
    await designer.emulateMedia({ media: 'screen' });
    expect(await seriousA11yViolations(designer)).toEqual([]);
    expect(offsiteRequests(designer)).toEqual([]);
    expect(consoleErrors(designer)).toEqual([]);
    await designer.close();
  });
});
