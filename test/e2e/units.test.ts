/**
 * Browser test of the unit choice on every screen (issue 15 §2, "How it is
 * checked": the unit choice applied on every screen). A reader switches
 * their account to inch/pound; every screen that shows lengths, masses,
 * forces or gradients then writes them in in, lb, lbf, deg/in…, and no figure
 * is written in a stored SI unit (a number followed by mm, kg, N, N/mm,
 * km/h or deg/m), in its text or in a field beside its unit. The review record is read inside its frame. Each page is
 * checked once it has settled (no loading bar left). Needs `npx ng build` first.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { apiJson, consoleErrors, named, saveScreenshot, signIn, useE2eApp } from '../support/e2e.js';

/** A figure in a stored SI unit: a number, then mm, kg, N, N/mm, N·m, km/h, deg/m, deg/m² or 1/(deg·N) (not part of a longer unit or word). */
const SI_FIGURE = /(?<![\w.])[-−]?\d+(?:\.\d+)?\s?(?:mm|kg|N\/mm|N·m|N|km\/h|deg\/m²|deg\/m|1\/\(deg·N\))(?![\w/²·])/g;
/** A figure in an inch/pound unit. */
const US_FIGURE = /(?<![\w.])[-−]?\d+(?:\.\d+)?\s?(?:in|lb|lbf|lbf\/in|lbf·ft|mph|ft|deg\/in|deg\/in²)(?![\w/²·])/;
/** A column or axis that names a stored SI unit on its own: "(mm)", "[kg]", "deg/m". */
const SI_HEADING = /[([](?:mm|kg|N|N\/mm|km\/h|deg\/m|deg\/m²)[)\]]/g;


/**
 * Opens `path`, waits for `ready` and for no loading bar, and returns the text the reader sees in the page's
 * main area, without the text of links: those are names people gave their work ("rear toe link +6 mm"), not figures.
 */
async function settledText(page: Page, base: string, name: string, path: string, ready: string): Promise<string> {
  await page.goto(base + path);
  await page.locator(ready).first().waitFor({ timeout: 60_000 });
  await expect
    .poll(() => page.locator('mat-progress-bar[mode="indeterminate"], .rw-busy-bar').count(), { timeout: 60_000, message: `the ${name} page settles` })
    .toBe(0);
  await saveScreenshot(page, `units-inch-pound-${name}`);
  return page.locator('main').evaluate((main) => {
    const parts: string[] = [];
    const walker = document.createTreeWalker(main, NodeFilter.SHOW_TEXT);
    for (let n = walker.nextNode(); n; n = walker.nextNode()) if (!n.parentElement?.closest('a, option, mat-option')) parts.push(n.textContent ?? '');
    // A field's figure is its value and the unit beside it (the form field's suffix).
    for (const input of main.querySelectorAll('input')) {
      const suffix = input.closest('mat-form-field')?.querySelector('.mat-mdc-form-field-text-suffix')?.textContent?.trim();
      if (input.value.trim() !== '' && suffix) parts.push(`${input.value.trim()} ${suffix}`);
    }
    return parts.join(' ');
  });
}

/** What a page writes in SI where it should write inch/pound: the offending figures and headings, with some context. */
function siLeft(text: string): string[] {
  const found: string[] = [];
  for (const re of [SI_FIGURE, SI_HEADING]) {
    for (const m of text.matchAll(re)) found.push(text.slice(Math.max(0, m.index - 40), m.index + m[0].length + 10).replace(/\s+/g, ' '));
  }
  return found;
}

describe('The unit choice on every screen', () => {
  const env = useE2eApp();

  it('an inch/pound reader sees inch/pound figures and no SI figure on every screen of a team', async () => {
    const page = await env.browser.newPage();
    const base = env.app.baseUrl;
    await signIn(page, base, 'engineer@tallowmere.example');
    const me = await apiJson<{ user: { displayUnits: string } }>(page, `${base}/api/auth/me`, { displayUnits: 'imperial' });
    expect(me.user.displayUnits).toBe('imperial');

    const team = named(await apiJson<{ id: string; name: string }[]>(page, base + '/api/teams'), 'Tallowmere University Racing');
    const t = `/teams/${team.id}`;
    const vehicles = await apiJson<{ id: string; name: string }[]>(page, base + `/api/teams/${team.id}/vehicles`);
    const vehicle = vehicles[0]!;
    const designs = await apiJson<{ id: string; name: string; axle: string }[]>(page, base + `/api/teams/${team.id}/vehicles/${vehicle.id}/axle-designs`);
    const design = designs.find((d) => d.axle === 'front') ?? designs[0]!;
    const configuration = named(await apiJson<{ id: string; name: string }[]>(page, base + `/api/teams/${team.id}/configurations`), 'Ember baseline');
    const v = `${t}/vehicles/${vehicle.id}`;
    const d = `${v}/axle-designs/${design.id}`;

    const screens: [name: string, path: string, ready: string][] = [
      ['vehicle', v, 'h1'],
      ['editor', d, 'rw-hardpoint-table'],
      ['design-report', `${d}/report`, 'h1'],
      ['balance', `${v}/balance`, 'h1'],
      ['intent', `${d}/intent`, 'h1'],
      ['configuration', `${t}/configurations/${configuration.id}`, '.rw-axle-cautions[data-axle="rear"]'],
      ['studies', `${t}/studies?axleDesignId=${design.id}`, 'mat-select[aria-label="Point of tolerance 1"]'],
    ];
    if (designs.length >= 2) screens.push(['compare', `${v}/compare?designs=${designs.map((x) => x.id).join(',')}`, '[data-testid="compare-figures"]']);

    const problems: Record<string, string[]> = {};
    const unconverted: string[] = [];
    for (const [name, path, ready] of screens) {
      const text = await settledText(page, base, name, path, ready);
      const left = siLeft(text);
      if (left.length > 0) problems[name] = left;
      if (!US_FIGURE.test(text)) unconverted.push(name);
    }
    // The review record is the server's document, shown in a frame: it follows the reader's setting too.
    await settledText(page, base, 'review-record', `${t}/configurations/${configuration.id}/record`, 'iframe[data-testid="record-frame"]');
    const frame = page.frameLocator('iframe[data-testid="record-frame"]');
    // The frame's document is the server's record (its key results table), not the blank page before it.
    await frame.locator('table').first().waitFor({ timeout: 120_000 });
    const record = await frame.locator('body').innerText();
    if (siLeft(record).length > 0) problems['review-record'] = siLeft(record);
    if (!US_FIGURE.test(record)) unconverted.push('review-record');

    expect(problems, 'figures or headings left in SI units for an inch/pound reader').toEqual({});
    expect(unconverted, 'screens without an inch/pound figure').toEqual([]);
    expect(consoleErrors(page)).toEqual([]);
  });

  it('an inch/pound instructor sees the programme board in inch/pound', async () => {
    const page = await env.browser.newPage();
    const base = env.app.baseUrl;
    await signIn(page, base, 'instructor@programme.example');
    await apiJson(page, `${base}/api/auth/me`, { displayUnits: 'imperial' });
    const programme = named(await apiJson<{ id: string; name: string }[]>(page, base + '/api/programmes'), 'Winter roll-steer comparison');
    const text = await settledText(page, base, 'programme', `/programmes/${programme.id}`, 'h2#board-heading');
    expect(siLeft(text), 'figures or headings left in SI units on the programme board').toEqual([]);
    expect(consoleErrors(page)).toEqual([]);
  });
});
