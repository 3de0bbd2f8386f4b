/**
 * Browser test of rig measurements (issue 7, "How it is checked": a rig file
 * is uploaded and its overlay is shown). The demo designer opens the approved
 * demo configuration, uploads a file with a bad line (refused, naming the
 * line, nothing stored), then a good one written the way a European
 * spreadsheet saves it (semicolons, decimal commas), maps its columns, stores
 * it and sees the measured points overlaid on the prediction with the RMS and
 * largest difference the API reports, and the tolerance caution when the
 * API gives one. Needs `npx ng build` first.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { consoleErrors, offsiteRequests, openBrowser, saveScreenshot, seriousA11yViolations, signIn, useE2eApp } from '../support/e2e.js';

type Browser = Awaited<ReturnType<typeof openBrowser>>;

/**
 * An invented rig sweep of the rear corner: toe rising 0.006° per mm of
 * bump, camber falling 0.02° per mm (plausible magnitudes, not a real car).
 */
function rigFile(badLine = false): string {
  const rows = ['travel (mm);toe (deg);camber (deg)'];
  for (let t = -40; t <= 40; t += 10) {
    const toe = (0.006 * t).toFixed(3).replace('.', ',');
    const camber = (-0.02 * t).toFixed(3).replace('.', ',');
    rows.push(`${t};${badLine && t === 0 ? 'n/a' : toe};${camber}`);
  }
  return rows.join('\r\n') + '\r\n';
}

async function upload(page: Page, name: string, text: string): Promise<void> {
  await page.locator('rw-rig-measurements input[type="file"]').setInputFiles({ name, mimeType: 'text/csv', buffer: Buffer.from(text, 'utf8') });
}

/** Parses a number as the panel prints it (a minus sign may be U+2212). */
function shown(text: string): number {
  return Number(text.trim().replace('\u2212', '-'));
}

/** Picks the rear axle in the panel's Material select, as a user does (open the list, click the option). */
async function chooseRearAxle(page: Page): Promise<void> {
  await page.locator('rw-rig-measurements mat-select[name="axle"]').click();
  await page.getByRole('option', { name: 'Rear', exact: true }).click();
}

describe('Rig measurements in Chromium', () => {
  const env = useE2eApp();

  it('refuses a file with a bad line, stores a good one and overlays it on the prediction with the API figures', async () => {
    const page = await env.browser.newPage();
    await signIn(page, env.app.baseUrl, 'designer@tallowmere.example');
    await page.goto(env.app.baseUrl + '/teams');
    await page.getByRole('link', { name: /Tallowmere/ }).first().click();
    await page.getByRole('link', { name: 'Configurations and review' }).click();
    await page.getByRole('link', { name: 'Ember baseline' }).click();
    const panel = page.locator('rw-rig-measurements');
    await panel.getByText('No rig measurements stored here yet.').waitFor({ timeout: 60_000 });
    const teamId = new URL(page.url()).pathname.split('/')[2]!;

    // A bad line: the mapping step shows the reader's message naming it, and nothing can be stored.
    await upload(page, 'ember-rear-bad.csv', rigFile(true));
    await panel.getByRole('heading', { name: 'Map the columns of ember-rear-bad.csv' }).waitFor();
    await chooseRearAxle(page);
    const problems = panel.locator('.rw-rig-local-errors');
    await problems.waitFor();
    expect(await problems.innerText()).toMatch(/line 6/i);
    expect(await panel.getByRole('button', { name: 'Store measurement' }).isDisabled()).toBe(true);
    await panel.getByRole('button', { name: 'Cancel' }).click();
    const none = await page.evaluate(async (t) => (await (await fetch(`/api/teams/${t}/rig-measurements`)).json()) as unknown[], teamId);
    expect(none).toEqual([]);

    // The good file, mapped to the rear axle, stored and compared.
    await upload(page, 'ember-rear-rig.csv', rigFile());
    await panel.getByRole('heading', { name: 'Map the columns of ember-rear-rig.csv' }).waitFor();
    await chooseRearAxle(page);
    await panel.locator('.rw-rig-converted').waitFor();
    await panel.getByRole('button', { name: 'Store measurement' }).click();
    const figures = panel.locator('table.rw-rig-figures');
    await figures.waitFor({ timeout: 60_000 });
    await panel.locator('[data-testid="rig-toe-chart"] svg path').first().waitFor();
    await panel.locator('[data-testid="rig-camber-chart"] svg path').first().waitFor();

    // The figures on screen are the server's recomputed comparison.
    type Detail = { id: string; comparison: { toe: { rmsDeg: number; largestDeg: number }; camber: { rmsDeg: number } | null; cautions: { code: string }[] } };
    const stored = await page.evaluate(async (t) => (await (await fetch(`/api/teams/${t}/rig-measurements`)).json()) as { id: string }[], teamId);
    expect(stored).toHaveLength(1);
    const detail = await page.evaluate(
      async ([t, id]) => (await (await fetch(`/api/teams/${t}/rig-measurements/${id}`)).json()) as Detail,
      [teamId, stored[0]!.id] as const,
    );
    const toeRow = figures.locator('tr[data-quantity="Toe"]');
    const rel = (a: number, b: number) => Math.abs(a - b) <= 5e-4 * Math.max(Math.abs(b), 1e-6);
    expect(rel(shown(await toeRow.locator('.rw-rig-rms').innerText()), detail.comparison.toe.rmsDeg)).toBe(true);
    expect(rel(shown(await toeRow.locator('.rw-rig-largest').innerText()), detail.comparison.toe.largestDeg)).toBe(true);
    const camberRow = figures.locator('tr[data-quantity="Camber"]');
    expect(rel(shown(await camberRow.locator('.rw-rig-rms').innerText()), detail.comparison.camber!.rmsDeg)).toBe(true);
    for (const c of detail.comparison.cautions) {
      await panel.locator(`rw-caution-list [data-code="${c.code}"]`).waitFor();
    }
    if (detail.comparison.cautions.length === 0) await panel.locator('.rw-rig-within').waitFor();

    expect(await seriousA11yViolations(page)).toEqual([]);
    await saveScreenshot(page, 'rig-overlay');
    expect(offsiteRequests(page)).toEqual([]);
    expect(consoleErrors(page)).toEqual([]);
  });
});
