/**
 * Browser test of every page's look (issue 15, "How it is checked"): each
 * page is opened as the person who uses it, waits until it has settled, is
 * saved as a screenshot under test-results/ (look-page-*.png), and has no
 * serious or critical accessibility finding (axe, WCAG 2.2 AA rules), no
 * console error and no request leaving 127.0.0.1. Needs `npx ng build` first.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { apiJson as api, consoleErrors, named, offsiteRequests, saveScreenshot, seriousA11yViolations, signIn, useE2eApp } from '../support/e2e.js';


/**
 * Opens `path`, waits for `ready` (and `frameReady` inside the page's frame, when it shows one) and for no
 * loading bar, then screenshots and checks the page, the frame's document included.
 */
async function visit(page: Page, base: string, name: string, path: string, ready: string, frameReady?: string): Promise<void> {
  await page.goto(base + path);
  await page.locator(ready).first().waitFor({ timeout: 60_000 });
  if (frameReady) await page.frameLocator(ready).locator(frameReady).first().waitFor({ timeout: 120_000 });
  // Settled: no loading bar left (the shell's and a section's may show at once).
  await expect
    .poll(() => page.locator('mat-progress-bar[mode="indeterminate"], .rw-busy-bar').count(), { timeout: 60_000, message: `the ${name} page settles` })
    .toBe(0);
  const findings = await seriousA11yViolations(page);
  await saveScreenshot(page, `look-page-${name}`);
  expect(findings, `serious or critical accessibility findings on the ${name} page`).toEqual([]);
}

describe('Every page in Chromium', () => {
  const env = useE2eApp();

  it('signed-out pages', async () => {
    const page = await env.browser.newPage();
    const base = env.app.baseUrl;
    await visit(page, base, 'sign-in', '/sign-in', 'h1');
    await visit(page, base, 'register', '/register', 'h1');
    await visit(page, base, 'forgot-password', '/forgot-password', 'h1');
    // The check can fail: a button with no name put on the page, and one in a same-origin frame, are both found.
    await page.evaluate(() => {
      const button = document.createElement('button');
      button.id = 'rw-probe-nameless';
      document.body.append(button);
      const frame = document.createElement('iframe');
      frame.id = 'rw-probe-frame';
      frame.title = 'Probe';
      frame.srcdoc = '<!doctype html><html lang="en"><head><title>Probe</title></head><body><main><button id="in-frame"></button></main></body></html>';
      document.body.append(frame);
    });
    await page.frameLocator('#rw-probe-frame').locator('#in-frame').waitFor({ state: 'attached' });
    const planted = await seriousA11yViolations(page);
    expect(planted.filter((f) => f.startsWith('button-name:')).join(' ')).toMatch(/#rw-probe-nameless.*#rw-probe-frame #in-frame|#rw-probe-frame #in-frame.*#rw-probe-nameless/);
    expect(offsiteRequests(page)).toEqual([]);
    expect(consoleErrors(page)).toEqual([]);
  });

  it('team pages, as the team owner', async () => {
    const page = await env.browser.newPage();
    const base = env.app.baseUrl;
    await signIn(page, base, 'owner@tallowmere.example');
    const team = named(await api<{ id: string; name: string }[]>(page, `${base}/api/teams`), 'Tallowmere University Racing');
    const t = `/teams/${team.id}`;
    const configuration = named(await api<{ id: string; name: string }[]>(page, `${base}/api/teams/${team.id}/configurations`), 'Ember baseline');
    await visit(page, base, 'teams', '/teams', 'h1');
    await visit(page, base, 'team-dashboard', t, 'a.vehicle-link');
    await visit(page, base, 'members', `${t}/members`, 'h1');
    await visit(page, base, 'activity', `${t}/activity`, 'h1');
    await visit(page, base, 'configurations', `${t}/configurations`, 'h1');
    await visit(page, base, 'configuration', `${t}/configurations/${configuration.id}`, '.rw-axle-cautions[data-axle="rear"]');
    // The review record: the server's document in a frame (its key results table once it has loaded).
    await visit(page, base, 'review-record', `${t}/configurations/${configuration.id}/record`, 'iframe[data-testid="record-frame"]', 'table');
    await visit(page, base, 'studies', `${t}/studies`, 'h1');
    await visit(page, base, 'team-programmes', `${t}/programmes`, 'h1');
    await visit(page, base, 'account', '/account', 'h1');
    await visit(page, base, 'dev-mail', '/dev-mail', 'h1');
    expect(offsiteRequests(page)).toEqual([]);
    expect(consoleErrors(page)).toEqual([]);
  });

  it('programme pages, as the instructor', async () => {
    const page = await env.browser.newPage();
    const base = env.app.baseUrl;
    await signIn(page, base, 'instructor@programme.example');
    const programmes = await api<{ id: string; name: string }[]>(page, `${base}/api/programmes`);
    await visit(page, base, 'programmes', '/programmes', 'h1');
    await visit(page, base, 'programme', `/programmes/${named(programmes, 'Winter roll-steer comparison').id}`, 'h2#board-heading');
    expect(offsiteRequests(page)).toEqual([]);
    expect(consoleErrors(page)).toEqual([]);
  });
});
