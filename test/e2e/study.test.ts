/**
 * Browser test of tolerance studies (issue 16, "How it is checked": start a
 * study, watch progress, see the histograms and the tornado chart, export
 * CSV). The demo designer opens the front baseline design of TUR-26 Ember,
 * starts a tolerance study of two tolerances from its link, watches the study
 * page until the queue's worker (in the test server's process) has run every
 * chunk, reads the histogram with P5 / P50 / P95 and the tornado, and exports
 * the CSV. The page carries the safety caution, ends without console errors
 * or requests leaving 127.0.0.1, and passes the accessibility check. Needs
 * `npx ng build` first.
 */
import { describe, expect, it } from 'vitest';
import { chooseOption, consoleErrors, downloadedText, offsiteRequests, saveScreenshot, seriousA11yViolations, signIn, useE2eApp } from '../support/e2e.js';

describe('Tolerance study in Chromium', () => {
  const env = useE2eApp();

  it('designer starts a study of a design, watches it finish, reads histogram and tornado, exports CSV', { timeout: 240_000 }, async () => {
    const page = await env.browser.newPage();
    await signIn(page, env.app.baseUrl, 'designer@tallowmere.example');
    await page.goto(env.app.baseUrl + '/teams');
    await page.getByRole('link', { name: /Tallowmere/ }).first().click();
    await page.getByRole('link', { name: 'TUR-26 Ember' }).click();
    await page.getByRole('heading', { name: 'TUR-26 Ember' }).waitFor();
    await page.getByRole('link', { name: 'Front baseline' }).click();
    await page.getByRole('heading', { name: /Front baseline/ }).waitFor();
    await page.getByRole('link', { name: 'Tolerance study or design sweep' }).click();
    await page.getByRole('heading', { name: 'New study of this axle design' }).waitFor();

    // Two tolerances: the tie-rod inner height (normal ±0.5 mm) and the upper ball joint anywhere in a 0.5 mm ball (uniform).
    await page.getByLabel('Label', { exact: true }).fill('Front pickups in the jig');
    await page.getByLabel('Samples').fill('600');
    await page.getByLabel('Camber shim thickness').fill('0.5');
    await page.getByLabel('Toe adjuster step').fill('0.375');
    await page.getByRole('button', { name: 'Add a tolerance' }).click();
    await chooseOption(page, 'Point of tolerance 2', 'Upper ball joint');
    await chooseOption(page, 'Coordinate of tolerance 2', 'anywhere in a ball');
    await chooseOption(page, 'Distribution of tolerance 2', 'Uniform');
    // A second rack position typed with a decimal comma: one chip of 2.5 mm, never two positions 2 and 5.
    const racks = page.locator('input[name="racks"]');
    await racks.fill('2,5');
    await racks.press('Enter');
    await page.locator('mat-chip-row', { hasText: '2.5 mm' }).waitFor();
    expect(await page.locator('mat-chip-row').allInnerTexts()).toEqual([expect.stringContaining('0 mm'), expect.stringContaining('2.5 mm')]);
    expect(await seriousA11yViolations(page)).toEqual([]);
    await page.getByRole('button', { name: 'Start the study' }).click();
    // The study page, or the form's error in the user's words (reported as the failure).
    const refused = page.locator('.rw-study-form [role="alert"]');
    await Promise.race([
      page.waitForURL((url) => /\/studies\/[0-9a-f-]{36}$/.test(url.pathname)),
      refused.waitFor().then(async () => expect.fail(`the study was refused: ${await refused.innerText()}`)),
    ]);
    await page.getByRole('heading', { name: /Front pickups in the jig/ }).waitFor();

    // Progress: the page polls until every chunk is in (600 samples in two chunks of 500 and 100).
    const status = page.getByTestId('study-status');
    const stopped = page.getByRole('region', { name: 'Progress' }).getByRole('alert');
    await Promise.race([
      status.getByText('Completed').waitFor({ timeout: 180_000 }),
      // (Its own timeout, or the page closing after the test, only ends the wait: the line below reports.)
      stopped.waitFor({ timeout: 180_000 }).then(
        async () => expect.fail(`the study stopped: ${await stopped.innerText()}`),
        () => undefined,
      ),
    ]);
    expect(await status.innerText()).toContain('600 of 600 samples (2 of 2 chunks)');

    // Results: the safety caution, the output summary, the histogram with its percentiles and the tornado.
    await page.getByRole('note').filter({ hasText: 'Verify on a kinematics rig' }).waitFor();
    const summary = page.getByRole('table', { name: 'Output summary' });
    await summary.getByRole('rowheader', { name: 'Roll steer ε' }).waitFor();
    const histogram = page.getByTestId('study-histogram');
    expect(await histogram.locator('rect').count()).toBeGreaterThan(5);
    const percentiles = await histogram.locator('p').innerText();
    expect(percentiles).toMatch(/P5 -?[\d.]+ · P50 -?[\d.]+ · P95 -?[\d.]+ deg\/deg/);
    const tornado = page.getByTestId('study-tornado');
    await tornado.getByText('Which tolerances matter: Roll steer ε').first().waitFor();
    // Each bar names its point as the hardpoint table does (the chart's text alternative carries the whole label).
    expect(await tornado.textContent()).toContain('z left: Tie rod, inner end (rack)');
    expect(await tornado.textContent()).not.toContain('tieRodInner');
    await chooseOption(page, 'Output shown in the charts', 'Bump-steer gradient');
    await page.getByTestId('study-histogram').getByText('Distribution: Bump-steer gradient').first().waitFor();
    await page.getByRole('table', { name: 'Caution thresholds reached' }).waitFor();

    // CSV export: a download with the outputs, the tornado and the caution.
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Export CSV' }).click()]);
    expect(download.suggestedFilename()).toBe('front-pickups-in-the-jig.csv');
    const csv = await downloadedText(download);
    expect(csv).toContain('rollSteerCoefficient');
    expect(csv).toContain('standardized regression coefficient');
    // In the user's units (the demo engineer's account is SI), with the unit in every bin row.
    expect(csv).toContain('output,unit,bin from,bin to,count (samples)');
    expect(csv).toContain('Verify on a kinematics rig');

    // The team's list shows it completed.
    await page.getByRole('link', { name: 'All studies' }).click();
    await page.getByRole('table', { name: 'Studies' }).getByRole('link', { name: 'Front pickups in the jig' }).waitFor();
    await page.goBack();
    await status.getByText('Completed').waitFor();
    await saveScreenshot(page, 'study-results');
    expect(await seriousA11yViolations(page)).toEqual([]);
    expect(offsiteRequests(page)).toEqual([]);
    expect(consoleErrors(page)).toEqual([]);
  });
});
