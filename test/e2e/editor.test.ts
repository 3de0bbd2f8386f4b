/**
 * Browser test of the axle design editor (issue 6, "How it is checked"):
 * as the demo designer open an axle design, change the tie-rod inner
 * height, see the toe chart and the fitted gradient change (solved in the
 * page's Web Worker, no server round trip), save, see the new revision; as
 * the demo viewer see the same design with no edit controls; the scaled
 * drawings' labels never overlap as Chromium lays them out. Real server,
 * fresh seeded database, Debian's Chromium. Needs `npx ng build` first.
 * Each test stands alone: the first works on the demo's Front baseline, the
 * others that save work on their own copy of it (made through the API), so
 * any test runs alone or in any order.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { chooseOption, consoleErrors, overlappingTexts, copyOfDemoDesign, offsiteRequests, openBrowser, saveScreenshot, seriousA11yViolations, signIn, useE2eApp } from '../support/e2e.js';

type Browser = Awaited<ReturnType<typeof openBrowser>>;

const TIE_ROD_INNER_Z = 'Tie rod, inner end (rack), z in mm';
const FRONT_BASELINE = { team: 'Tallowmere University Racing', vehicle: 'TUR-26 Ember', design: 'Front baseline' };
/** Bound of a wait on what the page shows (playwright's own default for its waits): it only turns a hang into a failure. */
const SHOWN = { timeout: 30_000 };

/** From the team dashboard to the front baseline design of TUR-26 Ember, through the vehicle page. */
async function openFrontBaseline(page: Page): Promise<string> {
  await page.getByRole('link', { name: 'TUR-26 Ember' }).click();
  await page.getByRole('heading', { name: 'TUR-26 Ember' }).waitFor();
  await page.getByRole('link', { name: 'Front baseline' }).click();
  await page.getByRole('heading', { name: /Front baseline/ }).waitFor();
  await page.locator('[data-testid="toe-chart"] path.rw-series-line').first().waitFor();
  return new URL(page.url()).pathname;
}

function rackZeroBumpSteer(page: Page): Promise<string> {
  return page.locator('[data-testid="fit-table"] tr[data-rack="0"] [data-testid="bump-steer"]').innerText();
}

/** The rack-0 bump steer as shown, for `expect.poll`: a wait on what the user reads, not on the DOM by hand. */
function shownBumpSteer(page: Page): () => Promise<string> {
  return async () => (await rackZeroBumpSteer(page)).trim();
}

function toePath(page: Page): Promise<string | null> {
  return page.locator('[data-testid="toe-chart"] svg.rw-chart-svg path.rw-series-line').first().getAttribute('d');
}

describe('Axle design editor in Chromium', () => {
  const env = useE2eApp();

  it('lets the designer change the tie-rod inner height, see toe and gradient change, and save a new revision', async () => {
    const page = await env.browser.newPage();
    await signIn(page, env.app.baseUrl, 'designer@tallowmere.example');
    const designPath = await openFrontBaseline(page);
    expect(designPath).toMatch(/^\/teams\/[^/]+\/vehicles\/[^/]+\/axle-designs\/[^/]+$/);
    await expect(page.getByTestId('revision').innerText()).resolves.toMatch(/^Revision 1\b/);

    const gradientBefore = await rackZeroBumpSteer(page);
    const pathBefore = await toePath(page);
    const epsilonBefore = await page.getByTestId('epsilon').innerText();
    expect(Number(gradientBefore)).not.toBeNaN();
    await expect(page.getByTestId('roll-steer').innerText()).resolves.toMatch(/roll (under|over)steer|practically no roll steer/);

    // Raise the tie-rod inner point by 8 mm: the tie rod tilts, so the toe curve must move.
    const zInput = page.getByLabel(TIE_ROD_INNER_Z);
    const zBefore = Number(await zInput.inputValue());
    const computeRequests: string[] = [];
    page.on('request', (r) => {
      if (r.url().includes('/api/compute/')) computeRequests.push(r.url());
    });
    await zInput.fill(String(zBefore + 8));
    await zInput.press('Enter');
    await expect.poll(shownBumpSteer(page), SHOWN).not.toBe(gradientBefore.trim());
    const gradientAfter = await rackZeroBumpSteer(page);
    expect(gradientAfter).not.toBe(gradientBefore);
    expect(await toePath(page)).not.toBe(pathBefore);
    expect(await page.getByTestId('epsilon').innerText()).not.toBe(epsilonBefore);
    // Solved in the browser's worker: no request to the compute API.
    expect(computeRequests).toEqual([]);
    await expect(page.getByText('1 point(s) changed since revision 1').isVisible()).resolves.toBe(true);

    // Undo and redo move between the two versions.
    await page.getByRole('button', { name: 'Undo' }).click();
    await expect.poll(shownBumpSteer(page), SHOWN).toBe(gradientBefore.trim());
    await page.getByRole('button', { name: 'Redo' }).click();
    await expect.poll(shownBumpSteer(page), SHOWN).toBe(gradientAfter.trim());

    await page.getByLabel('Revision note').fill('Tie-rod inner point up 8 mm');
    await page.getByRole('button', { name: 'Save revision' }).click();
    await page.getByText('Saved as revision 2.').waitFor();
    await expect(page.getByTestId('revision').innerText()).resolves.toMatch(/^Revision 2\b/);
    await page.locator('.rw-revision-list li[data-revision="2"]').getByText(/Tie-rod inner point up 8 mm/).waitFor();

    // The stored corner holds the new height after a reload.
    await page.reload();
    await page.locator('[data-testid="toe-chart"] path.rw-series-line').first().waitFor();
    expect(Number(await page.getByLabel(TIE_ROD_INNER_Z).inputValue())).toBe(zBefore + 8);
    await expect(page.getByTestId('revision').innerText()).resolves.toMatch(/^Revision 2\b/);
    await expect.poll(shownBumpSteer(page), SHOWN).toBe(gradientAfter.trim());

    // The scaled drawings, as Chromium lays their text out: no two labels (point numbers, dimensions, scale) overlap.
    await page.locator('rw-linkage-views [data-testid="scale-bar"]').first().waitFor();
    const drawingOverlaps = await overlappingTexts(page, 'rw-linkage-views svg');
    expect(drawingOverlaps).toEqual([]);
    await expect(page.locator('rw-linkage-views svg text').count()).resolves.toBeGreaterThan(30);

    expect(await seriousA11yViolations(page)).toEqual([]);
    await saveScreenshot(page, 'editor-designer');
    expect(offsiteRequests(page)).toEqual([]);
    expect(consoleErrors(page)).toEqual([]);
    await page.close();
  });

  it('keeps both versions when a save is stale', async () => {
    const mine = await env.browser.newPage();
    await signIn(mine, env.app.baseUrl, 'designer@tallowmere.example');
    const designPath = await copyOfDemoDesign(mine, env.app.baseUrl, FRONT_BASELINE, 'Front, stale-save check');
    await mine.goto(env.app.baseUrl + designPath);
    await mine.locator('[data-testid="toe-chart"] path.rw-series-line').first().waitFor();
    const revision = Number(/Revision (\d+)/.exec(await mine.getByTestId('revision').innerText())![1]);

    // Someone else saves first, from another session.
    const theirs = await env.browser.newPage();
    await signIn(theirs, env.app.baseUrl, 'designer@tallowmere.example');
    await theirs.goto(env.app.baseUrl + designPath);
    const theirX = theirs.getByLabel('Lower ball joint, x in mm');
    await theirX.fill(String(Number(await theirX.inputValue()) + 1));
    await theirX.press('Enter');
    await theirs.getByRole('button', { name: 'Save revision' }).click();
    await theirs.getByText(`Saved as revision ${revision + 1}.`).waitFor();

    const myZ = mine.getByLabel(TIE_ROD_INNER_Z);
    await myZ.fill(String(Number(await myZ.inputValue()) - 3));
    await myZ.press('Enter');
    await mine.getByRole('button', { name: 'Save revision' }).click();
    await mine.getByRole('heading', { name: 'Someone else saved first' }).waitFor();
    const conflict = mine.locator('.rw-conflict');
    await conflict.getByText('Lower ball joint').waitFor();
    await conflict.getByText('Tie rod, inner end (rack)').waitFor();
    await saveScreenshot(mine, 'editor-stale-save');

    await mine.getByRole('button', { name: `Save mine as revision ${revision + 2}` }).click();
    await mine.getByText(`Saved as revision ${revision + 2}.`).waitFor();
    // The refused save is the one expected error the browser logs (a 409 response).
    expect(consoleErrors(mine).filter((e) => !/status of 409/.test(e))).toEqual([]);
    expect(consoleErrors(theirs)).toEqual([]);
    await mine.close();
    await theirs.close();
  });

  it('imports hardpoints: a good CSV, one with a bad row, and one from another CAD frame', async () => {
    const page = await env.browser.newPage();
    await signIn(page, env.app.baseUrl, 'designer@tallowmere.example');
    const designPath = await copyOfDemoDesign(page, env.app.baseUrl, FRONT_BASELINE, 'Front, import check');
    await page.goto(env.app.baseUrl + designPath);
    await page.locator('[data-testid="toe-chart"] path.rw-series-line').first().waitFor();
    const z = Number(await page.getByLabel(TIE_ROD_INNER_Z).inputValue());
    const [x, y] = [
      Number(await page.getByLabel('Tie rod, inner end (rack), x in mm').inputValue()),
      Number(await page.getByLabel('Tie rod, inner end (rack), y in mm').inputValue()),
    ];
    const before = await rackZeroBumpSteer(page);
    const importAnswers: { status: number }[] = [];
    page.on('response', (r) => {
      if (r.url().endsWith('/import') && r.request().method() === 'POST') importAnswers.push({ status: r.status() });
    });
    const upload = (name: string, text: string) =>
      page.locator('rw-hardpoint-import input[type="file"]').setInputFiles({ name, mimeType: 'text/csv', buffer: Buffer.from(text, 'utf8') });
    const decimalComma = (v: number) => String(v).replace('.', ',');

    // A bad row is named, and nothing can be applied.
    await page.getByRole('button', { name: 'Import…' }).click();
    await upload('bad.csv', `point,x (mm),y (mm),z (mm)\ntieRodInner,${x},${y},${z + 4}\nlowerOuter,2,five,130\n`);
    await page.getByText('Line 3 (lowerOuter): y "five" is not a number.').waitFor();
    // The server read it (the browser no longer parses files itself): the refusal came back from the upload.
    expect(importAnswers.some((a) => a.status === 400)).toBe(true);
    await expect(page.getByRole('button', { name: 'Apply import' }).isDisabled()).resolves.toBe(true);

    // A good file from a spreadsheet in a decimal-comma locale: semicolons and a byte-order mark.
    await upload('good.csv', `\uFEFFpoint;x (mm);y (mm);z (mm)\r\nTie rod, inner end (rack);${decimalComma(x)};${decimalComma(y)};${decimalComma(z + 4.5)}\r\n`);
    await page.locator('.rw-preview-table tbody tr').first().waitFor();
    await page.getByRole('button', { name: 'Apply import' }).click();
    await page.getByText('Imported 1 point(s).', { exact: false }).waitFor();
    expect(Number(await page.getByLabel(TIE_ROD_INNER_Z).inputValue())).toBe(z + 4.5);
    await expect.poll(shownBumpSteer(page), SHOWN).not.toBe(before.trim());

    // A file from a CAD model with y to the right, z down, in metres: mapped before it is applied.
    await page.getByRole('button', { name: 'Import…' }).click();
    await upload('cad.csv', `point,x,y,z\ntieRodInner,${x / 1000},${-y / 1000},${-(z + 2) / 1000}\n`);
    await chooseOption(page, 'Axis convention', 'x forward, y right, z down');
    await chooseOption(page, 'CAD length unit', 'metre');
    await page.locator('rw-hardpoint-import .rw-overlay').first().waitFor();
    await saveScreenshot(page, 'editor-import-cad-preview');
    await page.getByRole('button', { name: 'Apply import' }).click();
    // The first import's "Imported 1 point(s)." is still on the page: wait for the table to show the new value.
    const innerZ = page.getByLabel(TIE_ROD_INNER_Z);
    await expect.poll(async () => Number(await innerZ.inputValue()), SHOWN).toBeCloseTo(z + 2, 6);
    await page.getByText('Imported 1 point(s).', { exact: false }).waitFor();
    expect(Number(await page.getByLabel('Tie rod, inner end (rack), y in mm').inputValue())).toBeCloseTo(y, 6);

    // Each import is one undo step.
    await page.getByRole('button', { name: 'Undo' }).click();
    await expect.poll(async () => Number(await innerZ.inputValue()), SHOWN).toBe(z + 4.5);
    // The server refuses the bad file with 400 (the browser logs every 4xx response); nothing else may be logged.
    expect(consoleErrors(page).filter((e) => !/status of 400/.test(e))).toEqual([]);
    await page.close();
  });

  it('can be worked by keyboard alone: reach a coordinate, change it, undo, redo and save', async () => {
    const page = await env.browser.newPage();
    await signIn(page, env.app.baseUrl, 'designer@tallowmere.example');
    const designPath = await copyOfDemoDesign(page, env.app.baseUrl, FRONT_BASELINE, 'Front, keyboard check');
    await page.goto(env.app.baseUrl + designPath);
    await page.locator('[data-testid="toe-chart"] path.rw-series-line').first().waitFor();
    const revision = Number(/Revision (\d+)/.exec(await page.getByTestId('revision').innerText())![1]);
    const focusedLabel = () => page.evaluate(() => document.activeElement?.getAttribute('aria-label') ?? document.activeElement?.textContent?.trim() ?? '');

    // Tab from the top of the page to the tie-rod inner z cell.
    await page.locator('body').focus();
    let steps = 0;
    while ((await focusedLabel()) !== TIE_ROD_INNER_Z) {
      await page.keyboard.press('Tab');
      if (++steps > 120) throw new Error('the tie-rod inner z cell is not reachable by Tab');
    }
    const before = await rackZeroBumpSteer(page);
    const z = Number(await page.getByLabel(TIE_ROD_INNER_Z).inputValue());
    await page.keyboard.press('Control+A');
    await page.keyboard.type(String(z + 5));
    await page.keyboard.press('Enter');
    await expect.poll(shownBumpSteer(page), SHOWN).not.toBe(before.trim());

    // Back up to the toolbar: Undo, then Redo, then Save revision, by keyboard.
    const reach = async (name: string) => {
      let n = 0;
      while ((await focusedLabel()) !== name) {
        await page.keyboard.press('Shift+Tab');
        if (++n > 120) throw new Error(`"${name}" is not reachable by Shift+Tab`);
      }
    };
    await reach('Save revision');
    await reach('Undo');
    await page.keyboard.press('Enter');
    await expect.poll(shownBumpSteer(page), SHOWN).toBe(before.trim());
    await page.keyboard.press('Tab'); // Redo
    await page.keyboard.press('Enter');
    await page.getByText('1 point(s) changed since revision').waitFor();
    let n = 0;
    while ((await focusedLabel()) !== 'Save revision') {
      await page.keyboard.press('Tab');
      if (++n > 20) throw new Error('"Save revision" is not reachable by Tab from Redo');
    }
    await page.keyboard.press('Enter');
    await page.getByText(`Saved as revision ${revision + 1}.`).waitFor();
    await saveScreenshot(page, 'editor-keyboard');
    expect(consoleErrors(page)).toEqual([]);
    await page.close();
  });

  it('shows the viewer the design with no edit controls', async () => {
    const page = await env.browser.newPage();
    await signIn(page, env.app.baseUrl, 'viewer@tallowmere.example');
    await openFrontBaseline(page);
    await page.getByText('Read only: your roles in this team do not include editing axle designs.').waitFor();
    await expect(page.locator('input.rw-coordinate').count()).resolves.toBe(0);
    await expect(page.getByRole('button', { name: 'Save revision' }).count()).resolves.toBe(0);
    await expect(page.getByRole('button', { name: 'Undo' }).count()).resolves.toBe(0);
    await expect(page.getByRole('button', { name: /^Import/ }).count()).resolves.toBe(0);
    // The kinematics are still there to read.
    expect(Number(await rackZeroBumpSteer(page))).not.toBeNaN();
    await page.getByRole('button', { name: 'Export CSV' }).waitFor();
    expect(await seriousA11yViolations(page)).toEqual([]);
    await saveScreenshot(page, 'editor-viewer');
    expect(offsiteRequests(page)).toEqual([]);
    expect(consoleErrors(page)).toEqual([]);
    await page.close();
  });
});
