/**
 * Browser test of the editor's linkage views (issue 15, section 3): as the
 * demo designer open an axle design, open the 3D view (three.js loads only
 * then), see it draw or, where this Chromium gives no WebGL context, the
 * message saying so; pick a point and see its hardpoint row selected, and
 * the reverse; play and stop the travel sweep; pick output curves and the sweep axis. Real server, fresh
 * seeded database, Debian's Chromium. Needs `npx ng build` first.
 */
import { describe, expect, it } from 'vitest';
import { consoleErrors, overlappingTexts, offsiteRequests, saveScreenshot, seriousA11yViolations, settledBox, signIn, useE2eApp } from '../support/e2e.js';

describe('Linkage views in Chromium', () => {
  const env = useE2eApp();

  it('opens the 3D view on demand, links a picked point to its table row, and draws the chosen output curves', async () => {
    const page = await env.browser.newPage();
    const scripts: string[] = [];
    page.on('request', (r) => {
      if (r.resourceType() === 'script') scripts.push(r.url());
    });
    await signIn(page, env.app.baseUrl, 'designer@tallowmere.example');
    await page.getByRole('link', { name: 'TUR-26 Ember' }).click();
    await page.getByRole('link', { name: 'Front baseline' }).click();
    await page.getByRole('heading', { name: /Front baseline/ }).waitFor();
    await page.locator('[data-testid="toe-chart"] path.rw-series-line').first().waitFor();

    // three.js is not loaded with the editor.
    const beforeOpen = scripts.length;
    await page.getByTestId('open-3d').click();
    await page.locator('[data-testid="no-webgl"], [data-testid="linkage-3d-stage"] canvas').first().waitFor();
    expect(scripts.length).toBeGreaterThan(beforeOpen);
    const drawn = (await page.locator('[data-testid="linkage-3d-stage"] canvas').count()) > 0;

    if (drawn) {
      // Every point is labelled; pick the upper ball joint 16 px below its name's centre (linkage-3d.scss).
      // The stage is brought to the middle of the window (clear of the sticky top bar and the window's
      // bottom edge) and the name read once the view has stopped moving (the canvas is fitted to the
      // stage in the next animation frame, which a loaded machine delays).
      const label = page.locator('.rw-3d-label[data-point="points.upperOuter"]');
      await label.waitFor();
      await page.getByTestId('linkage-3d-stage').evaluate((el) => el.scrollIntoView({ block: 'center' }));
      const box = await settledBox(page, label);
      await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2 + 16);
      await page.locator('tr.rw-selected[data-key="points.upperOuter"]').waitFor();
      await page.getByTestId('picked-point').filter({ hasText: /^Upper ball joint$/ }).waitFor();
    } else {
      await expect(page.getByTestId('no-webgl').innerText()).resolves.toContain('WebGL');
    }
    // The reverse: a row selected in the table is the point shown selected in the view.
    await page.locator('tr[data-key="points.lowerOuter"] th').click();
    // Wait for the redraw (the selection is a signal; reading the text at once would race it).
    await page.getByTestId('picked-point').filter({ hasText: /^Lower ball joint$/ }).waitFor();
    await page.locator('tr.rw-selected[data-key="points.lowerOuter"]').waitFor();
    if (drawn) await page.locator('.rw-3d-label-selected[data-point="points.lowerOuter"]').waitFor();
    await saveScreenshot(page, drawn ? 'editor-3d-view' : 'editor-3d-view-no-webgl');
    if (drawn) {
      // The travel sweep plays: the travel the view says it shows moves through the range, and stops on request.
      const status = page.locator('.rw-3d-toolbar [role="status"]');
      await page.getByTestId('animate-sweep').click();
      await status.filter({ hasText: /Sweep: .* travel/ }).waitFor();
      const first = await status.innerText();
      await expect.poll(() => status.innerText(), { timeout: 30_000, message: 'the sweep moves on' }).not.toBe(first);
      await page.getByTestId('animate-sweep').filter({ hasText: 'Stop the sweep' }).click();
      await status.filter({ hasText: /At .* travel/ }).waitFor();
    }

    // Output curves: load when opened; the picker shows and hides charts.
    await page.getByTestId('open-curves').click();
    await page.getByTestId('curves-grid').waitFor();
    await page.locator('[data-chart="toeDeg"] path.rw-series-line').first().waitFor();
    await page.locator('[data-output="casterDeg"] input').check();
    await page.locator('[data-chart="casterDeg"] path.rw-series-line').first().waitFor();
    await page.locator('[data-output="toeDeg"] input').uncheck();
    await page.locator('[data-chart="toeDeg"]').waitFor({ state: 'detached' });
    await page.locator('[data-testid="curve-axis"] button', { hasText: 'Body roll' }).click();
    await page.locator('[data-chart="casterDeg"] .rw-axis-label-x', { hasText: 'Body roll' }).waitFor();

    // No two text elements of a curve chart overlap (ticks, axis titles).
    const overlaps = await overlappingTexts(page, '[data-testid="curves-grid"] svg.rw-chart-svg');
    expect(overlaps).toEqual([]);
    await saveScreenshot(page, 'editor-output-curves');

    expect(await seriousA11yViolations(page)).toEqual([]);
    expect(offsiteRequests(page)).toEqual([]);
    expect(consoleErrors(page)).toEqual([]);
  });
});
